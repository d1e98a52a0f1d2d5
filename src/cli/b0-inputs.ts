import { basename } from 'node:path';
import { unwarpPhaseEncodePair } from '../acquire/unwarp-phase-encode-pair.js';
import type { PhaseEncodePair } from '../acquire/phase-encode-pair.js';
import { readFieldMapForRun } from '../acquire/read-field-map-for-run.js';
import { readPhaseEncodePair } from '../acquire/read-phase-encode-pair.js';
import { fail } from '../core/fail.js';
import { findB0Siblings } from '../io/find-b0-siblings.js';
import type { Run } from '../io/run-types.js';

/** A B0 field for a run from the command line's options or the files beside it. */
export interface CliB0 {
  /** Field offset, Hz, on the run's grid. */
  fieldMapHz: Float32Array;
  /** Where it came from, in words with file names (no folders). */
  source: string;
  /** The reversed phase-encode pair, when the field came from one. */
  pair: PhaseEncodePair | null;
  /** The pair before and after unwarping each image with its displacement, when the field came from one. */
  pairUnwarped: { imageA: Float32Array; imageB: Float32Array; unwarpedA: Float32Array; unwarpedB: Float32Array } | null;
  /** Paths read (inputs: an output folder may not be theirs). */
  paths: string[];
}

/**
 * The B0 field of a run for the look and the sweep: `--field-map <file>` (Hz, on the run's grid or
 * carried onto it through both affines), else `--pe-pair <a,b>` (the field from a reversed
 * phase-encode pair), else, when `find` is set, a BIDS `_fieldmap` or a pair of `_dir-<label>_epi`
 * images beside the run (or in its `../fmap/` folder) with opposite directions.
 * @param runPath - the run's path
 * @param run - the opened run
 * @param options - fieldMap, pePair (two paths joined by a comma), find
 * @returns the field, or null when none was given or found
 * @throws BoldsweepError INVALID_ARGUMENT for a --pe-pair that is not two paths; the reading errors
 * @example const b0 = await cliB0(path, run, { find: true })
 */
export async function cliB0(runPath: string, run: Run, options: { fieldMap?: string; pePair?: string; find: boolean }): Promise<CliB0 | null> {
  const dims: [number, number, number] = [run.volume.dims[0], run.volume.dims[1], run.volume.dims[2]];
  if (options.fieldMap) {
    const fieldMapHz = await readFieldMapForRun(options.fieldMap, { volume: run.volume, transformSource: run.info.transformSource });
    return { fieldMapHz, source: `the field map ${basename(options.fieldMap)}`, pair: null, pairUnwarped: null, paths: [options.fieldMap] };
  }
  let pairPaths: [string, string] | null = null;
  if (options.pePair) {
    const parts = options.pePair.split(',').map((p) => p.trim()).filter(Boolean);
    if (parts.length !== 2) fail('INVALID_ARGUMENT', `--pe-pair takes two image paths joined by a comma (opposite phase-encode directions), got '${options.pePair}'`);
    pairPaths = [parts[0], parts[1]];
  } else if (options.find) {
    const found = await findB0Siblings(runPath);
    if (found.fieldMap) {
      const fieldMapHz = await readFieldMapForRun(found.fieldMap, { volume: run.volume, transformSource: run.info.transformSource });
      return { fieldMapHz, source: `the field map ${basename(found.fieldMap)} (found beside the run)`, pair: null, pairUnwarped: null, paths: [found.fieldMap] };
    }
    if (found.phaseEncodeImages.length === 2) pairPaths = [found.phaseEncodeImages[0], found.phaseEncodeImages[1]];
  }
  if (!pairPaths) return null;
  const pair = await readPhaseEncodePair(pairPaths, run.volume, run.info.transformSource !== 'pixdim');
  const names = pairPaths.map((p) => basename(p)).join(' and ');
  const u = unwarpPhaseEncodePair(pair, dims);
  return {
    fieldMapHz: u.fieldHz, pair, paths: pairPaths, pairUnwarped: { imageA: pair.imageA, imageB: pair.imageB, unwarpedA: u.unwarpedA, unwarpedB: u.unwarpedB },
    source: `the reversed phase-encode pair ${names}${options.pePair ? '' : ' (found beside the run)'}`,
  };
}
