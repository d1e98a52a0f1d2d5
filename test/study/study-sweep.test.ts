import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { diagonalAffine } from '../../src/core/affine.js';
import { makeVolume } from '../../src/core/volume.js';
import { runSweep } from '../../src/sweep/runner.js';
import { scorecardToTsv } from '../../src/sweep/scorecard-tsv.js';
import { planSweep } from '../../src/sweep/plan.js';
import { parseSweepSpec } from '../../src/sweep/parse-sweep-spec.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';
import { whiteNoiseRun } from './study-runs.js';

const code = async (f: () => Promise<unknown> | unknown): Promise<string | undefined> => { try { await f(); } catch (e) { return isBoldsweepError(e) ? e.code : String(e); } return undefined; };

function studySpec(over: Partial<SweepSpecInput> = {}): SweepSpecInput {
  return {
    recipe: [{ step: 'smooth', params: { fwhmMm: 0 } }],
    vary: { 'smooth.fwhmMm': [0, 6], 'study.misregistrationMm': [0, 4] },
    plant: { sizesFwhmMm: [6], amplitudesPct: [1.5], count: 2 },
    repeats: 2,
    threshold: { kind: 'fwe-rft', alpha: 0.05 },
    model: { ar1: false, highpassCutoffSec: 128 },
    study: { subjects: 5 },
    seed: 11,
    ...over,
  };
}

describe('study sweep: plan, determinism, bad input', () => {
  const run = whiteNoiseRun({ dims: [16, 16, 12], nt: 50 });
  const input = { volume: run.volume, events: null, sidecar: null };
  it('plans one group per plant condition x level x repeat, each with the cells of its level', () => {
    const plan = planSweep(parseSweepSpec(studySpec()), { runHash: 'r', contextHash: 'c' });
    expect(plan.groups.length).toBe(4);
    expect(plan.cells.length).toBe(8);
    for (const c of plan.cells) expect(c.setting['study.misregistrationMm']).toBe(plan.groups[c.group].study!.misregistrationMm);
    // paired levels: the same planting seeds at every level
    expect(plan.groups[0].plantSeed).toBe(plan.groups[2].plantSeed);
    expect(plan.groups[0].key).not.toBe(plan.groups[2].key);
  });
  it('same seed: byte-identical scorecard in this thread, on 2 workers and as 2 shards; the facts of the study', async () => {
    const a = await runSweep(input, studySpec(), { inThisThread: true, brainMask: run.mask });
    const b = await runSweep(input, studySpec(), { workers: 2, brainMask: run.mask });
    const s1 = await runSweep(input, studySpec(), { workers: 1, brainMask: run.mask, shard: '1/2' });
    const s2 = await runSweep(input, studySpec(), { workers: 1, brainMask: run.mask, shard: '2/2' });
    expect(scorecardToTsv(b.scorecard)).toBe(scorecardToTsv(a.scorecard));
    const rows = [...s1.scorecard.rows, ...s2.scorecard.rows].sort((x, y) => (x.cell as number) - (y.cell as number));
    expect(scorecardToTsv({ ...a.scorecard, rows })).toBe(scorecardToTsv(a.scorecard));
    expect(a.scorecard.rows.length).toBe(8);
    expect(a.scorecard.rows.every((r) => r.dof === 4)).toBe(true);
    expect(a.study!.subjects).toBe(5);
    expect(a.study!.designCorrelation.pairs).toBe(2 * 10);
    // a correlation: within [-1, 1] (on this 100 s run the random designs have 2-3 blocks each, so they
    // can be much alike; the demo run's figure is in DEVELOPERS.md)
    expect(a.study!.designCorrelation.maxAbs).toBeLessThanOrEqual(1);
    expect(a.study!.designCorrelation.meanAbs).toBeGreaterThan(0);
  });
  it('a cache folder: the second run reads every cell back', async () => {
    const { mkdtempSync, rmSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const { join } = await import('node:path');
    const dir = mkdtempSync(join(tmpdir(), 'study-cache-'));
    try {
      const a = await runSweep(input, studySpec(), { inThisThread: true, brainMask: run.mask, cacheDir: join(dir, 'c') });
      const b = await runSweep(input, studySpec(), { inThisThread: true, brainMask: run.mask, cacheDir: join(dir, 'c') });
      expect(b.stats.cellsFromCache).toBe(8);
      expect(scorecardToTsv(b.scorecard)).toBe(scorecardToTsv(a.scorecard));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
  it('bad input: fewer than 3 subjects, runs on another grid, a misregistration larger than the brain, a calibrated rule', async () => {
    expect(await code(() => runSweep(input, studySpec({ study: { subjects: 2 } }), { inThisThread: true }))).toBe('TOO_FEW_SUBJECTS');
    const other = whiteNoiseRun({ dims: [16, 16, 10], nt: 50 });
    expect(await code(() => runSweep(input, studySpec(), { inThisThread: true, studyRuns: [{ volume: other.volume, events: null, sidecar: null }] }))).toBe('STUDY_GRID_MISMATCH');
    const moved = makeVolume({ ...run.volume, affine: diagonalAffine([3.5, 3.5, 3.5]) });
    expect(await code(() => runSweep(input, studySpec(), { inThisThread: true, studyRuns: [{ volume: moved, events: null, sidecar: null }] }))).toBe('STUDY_GRID_MISMATCH');
    expect(await code(() => runSweep(input, studySpec({ vary: { 'smooth.fwhmMm': [0], 'study.misregistrationMm': [0, 40] } }), { inThisThread: true, brainMask: run.mask }))).toBe('MISREGISTRATION_TOO_LARGE');
    expect(await code(() => runSweep(input, studySpec({ threshold: { kind: 'fwe-calibrated', alpha: 0.05 } }), { inThisThread: true }))).toBe('STUDY_RULE_UNSUPPORTED');
    expect(await code(() => runSweep(input, { ...studySpec(), study: undefined }, { inThisThread: true }))).toBe('SPEC_INVALID');
  });
});
