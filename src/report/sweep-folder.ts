import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { curveTableToTsv, readCurveTableTsv } from '../score/curve-table.js';
import type { MaskSource } from '../sweep/mask-source.js';
import type { SweepResult } from '../sweep/runner.js';
import { readScorecardTsv, scorecardMeta, scorecardToTsv, timingsToTsv, type ScorecardMeta } from '../sweep/scorecard-tsv.js';
import { prepareOutputFiles, type ClaimOptions } from '../io/output-folder.js';
import { privateMasks, privateRunFacts, type RunFacts } from './run-facts.js';

/**
 * A sweep folder: what `boldsweep sweep` writes and `boldsweep report` / `gather` read.
 *
 *   scorecard.tsv   header line, then one row per cell (reproducible bytes; identifier column names)
 *   timings.tsv     seconds per cell (not reproducible: a clock)
 *   roc.tsv         true-positive rate at fixed false-positive rates, per cell
 *   sweep.json      spec, scorecard key and varied parameters, plan summary, step notes, input
 *                   file names and hashes, masks, run facts, statistics
 *   .boldsweep-output.json   the marker naming the files boldsweep wrote (see claimOutputFolder)
 */
export interface SweepFolder {
  result: SweepResult;
  run: RunFacts;
  masks: { brain: MaskSource; placement: MaskSource; exclude: MaskSource | null };
}

interface SweepJson extends Omit<SweepResult, 'scorecard' | 'curves'> {
  format: 'boldsweep-sweep';
  version: 1;
  /** Sweep key, varied parameters and column names of scorecard.tsv (the TSV holds only the table). */
  scorecard?: ScorecardMeta & { columns: string[] };
  run: RunFacts;
  masks: SweepFolder['masks'];
}

/** Files of a sweep folder, as named in the folder's marker. */
export const SWEEP_FOLDER_FILES = ['scorecard.tsv', 'timings.tsv', 'roc.tsv', 'sweep.json'] as const;

/**
 * Write a sweep folder (every file atomically). The folder must be new, empty or written by boldsweep
 * (see `claimOutputFolder`); only boldsweep's own files are replaced. Input files are recorded by
 * file name and SHA-256, never by their folder (a local path can name the participant).
 * @param dir - folder (created when missing)
 * @param folder - result, run facts, masks
 * @param write - force (accept a non-empty folder boldsweep did not write), inputs (folders the output may not be)
 * @returns when all files are written
 * @throws BoldsweepError OUTPUT_NOT_OURS, OUTPUT_FILE_NOT_OURS, OUTPUT_IS_INPUT_FOLDER, OUTPUT_IS_CURRENT_FOLDER, WRITE_FAILED
 * @example await writeSweepFolder('out/sweep', { result, run: runFacts(run), masks })
 */
export async function writeSweepFolder(dir: string, folder: SweepFolder, write: ClaimOptions = {}): Promise<void> {
  await prepareOutputFiles(dir, [...SWEEP_FOLDER_FILES], { ...write, inputs: write.inputs ?? Object.values(folder.run.files) });
  const { scorecard, curves, ...rest } = folder.result;
  const run = await privateRunFacts(folder.run);
  const json: SweepJson = { format: 'boldsweep-sweep', version: 1, ...rest, scorecard: scorecardMeta(scorecard), run, masks: privateMasks(folder.masks) };
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
  const scorecard = readScorecardTsv(readFileSync(join(dir, 'scorecard.tsv'), 'utf8'), json.scorecard ?? null, timings, join(dir, 'scorecard.tsv'));
  const curves = existsSync(join(dir, 'roc.tsv')) ? readCurveTableTsv(readFileSync(join(dir, 'roc.tsv'), 'utf8')) : { fprGrid: [], rows: [] };
  const { format: _f, version: _v, scorecard: _s, run, masks, ...rest } = json;
  return { result: { ...rest, scorecard, curves }, run, masks };
}
