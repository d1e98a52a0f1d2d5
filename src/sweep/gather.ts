import { fail } from '../core/fail.js';
import type { SweepResult } from './runner.js';

/**
 * Merge the results of shards of one sweep (`--shard i/N` runs) into the result of the whole sweep.
 * Rows are merged by cell index, so the merged scorecard is byte-identical to an unsharded run.
 * @param parts - shard results (any order)
 * @param options - allowPartial: accept missing cells (default false)
 * @returns the merged result (shard null)
 * @throws BoldsweepError SHARD_SWEEP_MISMATCH when the parts come from different sweeps (sweep keys differ);
 *   INVALID_ARGUMENT when they overlap, or (unless
 *   allowPartial) leave cells missing
 * @example const whole = gatherResults(shardFolders.map((f) => f.result))
 */
export function gatherResults(parts: SweepResult[], options: { allowPartial?: boolean } = {}): SweepResult {
  if (parts.length === 0) fail('INVALID_ARGUMENT', 'nothing to gather: give at least one sweep folder');
  const first = parts[0];
  for (const p of parts) {
    if (p.scorecard.sweepKey !== first.scorecard.sweepKey) fail('SHARD_SWEEP_MISMATCH', `the folders come from different sweeps (sweep keys ${first.scorecard.sweepKey.slice(0, 12)}... and ${p.scorecard.sweepKey.slice(0, 12)}...): same run, spec and masks are needed`);
  }
  const byCell = new Map<number, { part: SweepResult; i: number }>();
  for (const p of parts) {
    p.scorecard.rows.forEach((r, i) => {
      const cell = r.cell as number;
      if (byCell.has(cell)) fail('INVALID_ARGUMENT', `cell ${cell} appears in two folders; gather each shard once`);
      byCell.set(cell, { part: p, i });
    });
  }
  const expected = first.stats.cellsInPlan;
  if (byCell.size < expected && !options.allowPartial) {
    const missing = [];
    for (let c = 0; c < expected && missing.length < 10; c++) if (!byCell.has(c)) missing.push(c);
    fail('INVALID_ARGUMENT', `${expected - byCell.size} of ${expected} cells are missing (first: ${missing.join(', ')}); run the missing shards, or accept a partial sweep with --allow-partial (allowPartial: true from code)`);
  }
  const cells = [...byCell.keys()].sort((a, b) => a - b);
  const rows = cells.map((c) => byCell.get(c)!.part.scorecard.rows[byCell.get(c)!.i]);
  const seconds = cells.map((c) => byCell.get(c)!.part.scorecard.seconds[byCell.get(c)!.i]);
  const curveRows = parts.flatMap((p) => p.curves.rows).sort((a, b) => a.cell - b.cell);
  const notes = new Map<number, SweepResult['notes'][number]>();
  for (const p of parts) for (const n of p.notes) if (!notes.has(n.settingIndex)) notes.set(n.settingIndex, n);
  const nulls = new Map<number, NonNullable<SweepResult['nullCalibration']>[number]>();
  for (const p of parts) for (const c of p.nullCalibration ?? []) if (!nulls.has(c.settingIndex)) nulls.set(c.settingIndex, c);
  const sum = (k: 'cellsRun' | 'cellsComputed' | 'cellsFromCache' | 'estimatesComputed' | 'tasks') => parts.reduce((s, p) => s + (p.stats[k] ?? 0), 0);
  return {
    ...first,
    scorecard: { ...first.scorecard, rows, seconds },
    curves: { fprGrid: first.curves.fprGrid, rows: curveRows },
    notes: [...notes.values()].sort((a, b) => a.settingIndex - b.settingIndex),
    ...(nulls.size ? { nullCalibration: [...nulls.values()].sort((a, b) => a.settingIndex - b.settingIndex) } : {}),
    shard: null,
    stats: {
      cellsInPlan: expected, cellsRun: sum('cellsRun'), cellsComputed: sum('cellsComputed'), cellsFromCache: sum('cellsFromCache'), estimatesComputed: sum('estimatesComputed'), tasks: sum('tasks'),
      workers: Math.max(...parts.map((p) => p.stats.workers)), wallSeconds: Math.max(...parts.map((p) => p.stats.wallSeconds)),
    },
  };
}
