import { fail } from '../core/fail.js';
import { phaseEncodeAxis } from './phase-encode-axis.js';

/**
 * Two images of the same head acquired with opposite phase-encode directions (BIDS fieldmap
 * `dir-<label>_epi` files), each on the run's grid: one 3D image each (the mean of their volumes).
 */
export interface PhaseEncodePair {
  /** Image acquired in direction `directionA`, one 3D image on the run's grid. */
  imageA: Float32Array;
  /** Image acquired in direction `directionB`, opposite to A along the same axis. */
  imageB: Float32Array;
  /** BIDS PhaseEncodingDirection of A, e.g. 'j'. */
  directionA: string;
  /** BIDS PhaseEncodingDirection of B, e.g. 'j-'. */
  directionB: string;
  /** Total readout time of the pair, seconds. */
  totalReadoutTimeSec: number;
}

/**
 * Check a reversed phase-encode pair against the run's grid and return A's axis and sign.
 * @param pair - the pair
 * @param voxels - voxels per volume of the run's grid
 * @returns A's phase-encode axis and sign
 * @throws BoldsweepError PHASE_ENCODE_PAIR_INVALID for images of another size, non-finite values,
 *   directions that are not opposite on one axis, or a readout time that is not positive;
 *   PHASE_ENCODE_INVALID for a direction that is not a voxel axis
 * @example checkPhaseEncodePair(pair, 64 * 64 * 36) // { axis: 1, sign: 1 }
 */
export function checkPhaseEncodePair(pair: PhaseEncodePair, voxels: number): { axis: 0 | 1 | 2; sign: 1 | -1 } {
  if (pair.imageA.length !== voxels || pair.imageB.length !== voxels) fail('PHASE_ENCODE_PAIR_INVALID', `the pair's images have ${pair.imageA.length} and ${pair.imageB.length} voxels, the run's grid ${voxels}`);
  for (const [name, img] of [['A', pair.imageA], ['B', pair.imageB]] as const) {
    const bad = img.findIndex((x) => !Number.isFinite(x));
    if (bad >= 0) fail('PHASE_ENCODE_PAIR_INVALID', `image ${name} of the pair has ${img[bad]} at voxel ${bad}`);
  }
  for (const d of [pair.directionA, pair.directionB]) {
    if (typeof d !== 'string' || !/^[ijk]-?$/.test(d)) fail('PHASE_ENCODE_INVALID', `PhaseEncodingDirection of a reversed phase-encode image is '${String(d)}', not one of i, j, k, i-, j-, k-`);
  }
  const a = phaseEncodeAxis(pair.directionA), b = phaseEncodeAxis(pair.directionB);
  if (a.axis !== b.axis || a.sign === b.sign) fail('PHASE_ENCODE_PAIR_INVALID', `the pair's PhaseEncodingDirection values '${pair.directionA}' and '${pair.directionB}' are not opposite senses of one axis`);
  if (!(pair.totalReadoutTimeSec > 0) || !Number.isFinite(pair.totalReadoutTimeSec)) fail('PHASE_ENCODE_PAIR_INVALID', `the pair's total readout time must be a positive number of seconds (TotalReadoutTime), got ${pair.totalReadoutTimeSec}`);
  return a;
}
