import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { curveTableToTsv, readCurveTableTsv } from '../score/curve-table.js';
import type { MaskSource } from '../sweep/mask-source.js';
import type { SweepResult } from '../sweep/runner.js';
import { readScorecardTsv, scorecardToTsv, timingsToTsv } from '../sweep/scorecard-tsv.js';
import type { RunFacts } from './run-facts.js';

/**
 * A sweep folder: what `boldsweep sweep` writes and `boldsweep report` / `gather` read.
 *
 *   scorecard.tsv   one row per cell (reproducible bytes)
 *   timings.tsv     seconds per cell (not reproducible: a clock)
 *   roc.tsv         true-positive rate at fixed false-positive rates, per cell
 *   sweep.json      spec, plan summary, step notes, input hashes, masks, run facts, statistics
 */
export interface SweepFolder {
  result: SweepResult;
  run: RunFacts;
  masks: { brain: MaskSource; placement: MaskSource; exclude: MaskSource | null };
}

interface SweepJson extends Omit<SweepResult, 'scorecard' | 'curves'> {
  format: 'boldsweep-sweep';
  version: 1;
  run: RunFacts;
  masks: SweepFolder['masks'];
}

/**
 * Write a sweep folder (every file atomically).
 * @param dir - folder (created when missing)
 * @param folder - result, run facts, masks
 * @returns when all files are written
 * @example await writeSweepFolder('out/sweep', { result, run: runFacts(run), masks })
 */
export async function writeSweepFolder(dir: string, folder: SweepFolder): Promise<void> {
  mkdirSync(dir, { recursive: true });
  const { scorecard, curves, ...rest } = folder.result;
  const json: SweepJson = { format: 'boldsweep-sweep', version: 1, ...rest, run: folder.run, masks: folder.masks };
  await writeFileAtomic(join(dir, 'scorecard.tsv'), scorecardToTsv(scorecard));
  await writeFileAtomic(join(dir, 'timings.tsv'), timingsToTsv(scorecard));
  await writeFileAtomic(join(dir, 'roc.tsv'), curveTableToTsv(curves));
  await writeFileAtomic(join(dir, 'sweep.json'), JSON.stringify(json, null, 1) + '\n');
}

/**
 * Read a sweep folder written by {@link writeSweepFolder} (or by `boldsweep gather`).
 * @param dir - the folder
 * @returns the result, run facts and masks
 * @throws BoldsweepError FILE_NOT_FOUND when a file is missing; INVALID_ARGUMENT when it is not a sweep folder
 * @example const { result } = readSweepFolder('out/demo')
 */
export function readSweepFolder(dir: string): SweepFolder {
  for (const f of ['sweep.json', 'scorecard.tsv']) if (!existsSync(join(dir, f))) fail('FILE_NOT_FOUND', `${join(dir, f)} is missing; is ${dir} the output folder of "boldsweep sweep"?`);
  const json = JSON.parse(readFileSync(join(dir, 'sweep.json'), 'utf8')) as SweepJson;
  if (json.format !== 'boldsweep-sweep') fail('INVALID_ARGUMENT', `${join(dir, 'sweep.json')} is not a boldsweep sweep description`);
  const timings = existsSync(join(dir, 'timings.tsv')) ? readFileSync(join(dir, 'timings.tsv'), 'utf8') : undefined;
  const scorecard = readScorecardTsv(readFileSync(join(dir, 'scorecard.tsv'), 'utf8'), timings, join(dir, 'scorecard.tsv'));
  const curves = existsSync(join(dir, 'roc.tsv')) ? readCurveTableTsv(readFileSync(join(dir, 'roc.tsv'), 'utf8')) : { fprGrid: [], rows: [] };
  const { format: _f, version: _v, run, masks, ...rest } = json;
  return { result: { ...rest, scorecard, curves }, run, masks };
}
