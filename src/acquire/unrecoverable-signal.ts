import { fail } from '../core/fail.js';
import { intravoxelDephasing } from './intravoxel-dephasing.js';

/** A voxel counts as lost to dephasing when it keeps less than this fraction of its signal. */
export const DEPHASING_KEPT_BELOW = 0.5;

/** Where a B0 field takes signal that unwarping cannot give back, and why. */
export interface UnrecoverableSignal {
  /** 1 where the signal is lost (dephased or folded), per voxel. */
  lost: Uint8Array;
  /** Fraction of its signal each voxel keeps after intravoxel dephasing (null when the echo time is unknown). */
  keptFraction: Float32Array | null;
  /** Voxels lost to dephasing (kept fraction below {@link DEPHASING_KEPT_BELOW}). */
  dephasedVoxels: number;
  /** Voxels where the shift map folds (1 + d(shift)/dy <= 0). */
  foldedVoxels: number;
  /** Voxels lost either way. */
  lostVoxels: number;
  /** The criterion, in words, for reports. */
  criterion: string;
}

/**
 * The voxels whose signal a B0 field destroys so that no unwarping can restore it, by two criteria:
 * 1. intravoxel dephasing: the field changes by g Hz across the voxel along an axis, so at echo
 *    time TE the voxel keeps |sinc(g TE)| of its signal per axis ({@link intravoxelDephasing}, the
 *    phantom's own model; the standard result for a linear gradient across a box voxel, Haacke EM et
 *    al. (1999) Magnetic Resonance Imaging: Physical Principles and Sequence Design [memory]); lost
 *    when the product over the three axes is below {@link DEPHASING_KEPT_BELOW} (over half the signal
 *    gone: |g TE| >= 0.6 cycles on one axis; the through-slice axis dominates near air-filled cavities);
 * 2. folding: where 1 + d(shift)/dy <= 0 along the phase-encode axis, signal from several positions
 *    lands in the same voxel and cannot be told apart again (the mapping y -> y + shift(y) is not
 *    invertible there; Jezzard & Balaban 1995 [memory]).
 * @param fieldHz - field offset, Hz, on the run's grid
 * @param dims - [nx, ny, nz]
 * @param shiftVoxels - the shift map along `axis` (voxels), as {@link shiftMapVoxels} gives it
 * @param axis - phase-encode voxel axis
 * @param teSec - echo time, seconds (the sidecar's EchoTime), or null when unknown (folding only)
 * @returns the map and its counts
 * @throws BoldsweepError INVALID_ARGUMENT for mismatched lengths or a bad axis
 * @example unrecoverableSignal(fieldHz, [64, 64, 36], shift, 1, 0.03).lostVoxels
 */
export function unrecoverableSignal(fieldHz: ArrayLike<number>, dims: readonly [number, number, number], shiftVoxels: ArrayLike<number>, axis: 0 | 1 | 2, teSec: number | null): UnrecoverableSignal {
  const n = dims[0] * dims[1] * dims[2];
  if (fieldHz.length !== n || shiftVoxels.length !== n) fail('INVALID_ARGUMENT', `field (${fieldHz.length}) and shift map (${shiftVoxels.length}) must both have ${n} values`);
  if (axis !== 0 && axis !== 1 && axis !== 2) fail('INVALID_ARGUMENT', `axis must be 0, 1 or 2, got ${String(axis)}`);
  const keptFraction = teSec === null ? null : intravoxelDephasing(fieldHz, dims, teSec);
  const len = dims[axis];
  const stride = axis === 0 ? 1 : axis === 1 ? dims[0] : dims[0] * dims[1];
  const lost = new Uint8Array(n);
  let dephasedVoxels = 0, foldedVoxels = 0, lostVoxels = 0;
  for (let v = 0; v < n; v++) {
    const dephased = keptFraction !== null && keptFraction[v] < DEPHASING_KEPT_BELOW;
    const y = Math.floor(v / stride) % len;
    let folded = false;
    if (len > 1) {
      const lo = y > 0 ? v - stride : v, hi = y < len - 1 ? v + stride : v;
      folded = 1 + (shiftVoxels[hi] - shiftVoxels[lo]) / ((hi - lo) / stride) <= 0;
    }
    if (dephased) dephasedVoxels++;
    if (folded) foldedVoxels++;
    if (dephased || folded) { lost[v] = 1; lostVoxels++; }
  }
  const criterion = `signal lost where intravoxel dephasing at the echo time leaves less than ${DEPHASING_KEPT_BELOW * 100} % of it (|sinc(field change across the voxel x TE)| per axis)${teSec === null ? ' (not assessed: echo time unknown)' : ''}, or where the shift map folds (1 + d(shift)/dy <= 0 along phase encode)`;
  return { lost, keptFraction, dephasedVoxels, foldedVoxels, lostVoxels, criterion };
}
