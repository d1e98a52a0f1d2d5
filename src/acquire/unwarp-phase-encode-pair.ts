import { applyUnwarp } from './apply-unwarp.js';
import { checkPhaseEncodePair, type PhaseEncodePair } from './phase-encode-pair.js';
import { planUnwarp } from './plan-unwarp.js';
import { reversedPhaseEncodeShift } from './reversed-phase-encode-shift.js';

/** A reversed phase-encode pair unwarped with its own displacement field. */
export interface UnwarpedPair {
  /** Shift of A's signal, voxels (B's is its negative). */
  shiftVoxels: Float32Array;
  /** The field it implies, Hz: shift / (sign of A x readout time). */
  fieldHz: Float32Array;
  /** A and B unwarped (linear, Jacobian). */
  unwarpedA: Float32Array;
  unwarpedB: Float32Array;
  /** Lines matched by the estimate. */
  linesMatched: number;
}

/**
 * Estimate the displacement of a reversed phase-encode pair ({@link reversedPhaseEncodeShift},
 * regularised by a `smoothFwhmVoxels` Gaussian across lines) and unwarp both images with it (A by
 * +shift, B by -shift; linear, Jacobian), so their agreement before and after can be compared.
 * @param pair - the pair on one grid
 * @param dims - [nx, ny, nz]
 * @param smoothFwhmVoxels - regularisation FWHM, voxels. __Default value:__ 2
 * @returns the shift, the field, both unwarped images
 * @throws BoldsweepError PHASE_ENCODE_PAIR_INVALID, PHASE_ENCODE_INVALID
 * @example const u = unwarpPhaseEncodePair(pair, [64, 64, 36]); imageAgreement(u.unwarpedA, u.unwarpedB, mask)
 */
export function unwarpPhaseEncodePair(pair: PhaseEncodePair, dims: readonly [number, number, number], smoothFwhmVoxels = 2): UnwarpedPair {
  const n = dims[0] * dims[1] * dims[2];
  const a = checkPhaseEncodePair(pair, n);
  const est = reversedPhaseEncodeShift(pair.imageA, pair.imageB, dims, a.axis, { smoothFwhmVoxels });
  const fieldHz = new Float32Array(n);
  for (let v = 0; v < n; v++) fieldHz[v] = est.shiftVoxels[v] / (a.sign * pair.totalReadoutTimeSec);
  const opposite = est.shiftVoxels.map((x) => -x);
  const unwarpedA = applyUnwarp(pair.imageA, planUnwarp(est.shiftVoxels, dims, a.axis, { kernel: 'linear', jacobian: true }), new Float32Array(n));
  const unwarpedB = applyUnwarp(pair.imageB, planUnwarp(opposite, dims, a.axis, { kernel: 'linear', jacobian: true }), new Float32Array(n));
  return { shiftVoxels: est.shiftVoxels, fieldHz, unwarpedA, unwarpedB, linesMatched: est.linesMatched };
}
