import { boundaryIndex } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';

/** Interpolation along a phase-encode line when unwarping: 'linear' (2 taps) or 'cubic' (cubic B-spline, 4 taps on prefiltered lines). */
export type UnwarpKernel = 'linear' | 'cubic';

/** The unwarping kernels, simplest first. */
export const UNWARP_KERNELS: readonly UnwarpKernel[] = ['linear', 'cubic'];

/**
 * What unwarping does at every voxel, computed once from a shift map and used for every volume:
 * the voxels its taps read (indices within a volume) and the tap weights (the Jacobian folded in).
 */
export interface UnwarpPlan {
  dims: [number, number, number];
  /** Phase-encode voxel axis. */
  axis: 0 | 1 | 2;
  kernel: UnwarpKernel;
  /** Taps per voxel: 2 (linear) or 4 (cubic). */
  taps: number;
  /** Per voxel: line-local index of its first tap, or NO_TAP when it reads from outside the line. */
  first: Int32Array;
  /** Per voxel, `taps` voxel indices within a volume that the taps read (a tap beyond the line reads a voxel of the line with weight 0, or the mirrored voxel for cubic). */
  sources: Int32Array;
  /** Per voxel, `taps` weights (interpolation weight x Jacobian; all 0 for NO_TAP). */
  weights: Float32Array;
  /** Per voxel: the Jacobian 1 + d(shift)/dy (before clamping at 0; 1 when not applied). */
  jacobian: Float32Array;
}

/** `first` of a voxel whose source position is outside its line (its output is 0). */
export const NO_TAP = -0x80000000;

/**
 * Plan the unwarping of images distorted along one axis by a known shift map (in the undistorted
 * space: the forward model moves the signal of position y to y + shift(y), as
 * {@link distortAlongAxis} does). The undistorted value at y is the distorted image read at
 * y + shift(y), times the Jacobian 1 + d(shift)/dy when `jacobian` is set, which undoes the pile-up
 * and thinning of signal where the shift converges or spreads, so each line's signal is kept
 * (Jezzard P & Balaban RS (1995) Magn Reson Med 34:65-73; Chang H & Fitzpatrick JM (1992) IEEE Trans
 * Med Imaging 11:319-329 for the intensity factor). d(shift)/dy is the central difference along the
 * line (one-sided at its ends). Where the shift map folds (Jacobian <= 0: several positions land on
 * one voxel) the signal cannot be separated again: the factor is clamped at 0 there (see
 * {@link unrecoverableSignal}). A source position outside the line reads zeros (the signal left the
 * field of view).
 * @param shiftVoxels - shift along `axis`, voxels, at every voxel (NIfTI order)
 * @param dims - [nx, ny, nz]
 * @param axis - phase-encode voxel axis
 * @param options - kernel ('linear' or 'cubic' B-spline), jacobian (true: intensity correction)
 * @returns the plan
 * @throws BoldsweepError INVALID_ARGUMENT for a bad axis, kernel, length or a non-finite shift
 * @example const plan = planUnwarp(shift, [64, 64, 36], 1, { kernel: 'linear', jacobian: true })
 */
export function planUnwarp(
  shiftVoxels: ArrayLike<number>,
  dims: readonly [number, number, number],
  axis: 0 | 1 | 2,
  options: { kernel: UnwarpKernel; jacobian: boolean },
): UnwarpPlan {
  if (axis !== 0 && axis !== 1 && axis !== 2) fail('INVALID_ARGUMENT', `axis must be 0, 1 or 2, got ${String(axis)}`);
  if (!UNWARP_KERNELS.includes(options.kernel)) fail('INVALID_ARGUMENT', `unwarp kernel must be one of ${UNWARP_KERNELS.join(', ')}, got '${String(options.kernel)}'`);
  const n = dims[0] * dims[1] * dims[2];
  if (shiftVoxels.length !== n) fail('INVALID_ARGUMENT', `shift map has ${shiftVoxels.length} values, the grid ${n}`);
  const len = dims[axis];
  const stride = axis === 0 ? 1 : axis === 1 ? dims[0] : dims[0] * dims[1];
  const taps = options.kernel === 'linear' ? 2 : 4;
  const first = new Int32Array(n).fill(NO_TAP);
  const sources = new Int32Array(n * taps);
  const weights = new Float32Array(n * taps);
  const jacobian = new Float32Array(n);
  for (let v = 0; v < n; v++) {
    const s = shiftVoxels[v];
    if (!Number.isFinite(s)) fail('INVALID_ARGUMENT', `shift map voxel ${v} is ${s}`);
    const y = Math.floor(v / stride) % len;
    let jac = 1;
    if (len > 1) {
      const lo = y > 0 ? v - stride : v, hi = y < len - 1 ? v + stride : v;
      jac = 1 + (shiftVoxels[hi] - shiftVoxels[lo]) / ((hi - lo) / stride);
    }
    jacobian[v] = options.jacobian ? jac : 1;
    const factor = options.jacobian ? Math.max(0, jac) : 1;
    const p = y + s;
    const w = v * taps;
    const lineBase = v - y * stride;
    for (let t = 0; t < taps; t++) sources[w + t] = v;
    if (options.kernel === 'linear') {
      // zeros beyond the line's ends, as in the forward model
      if (!(p > -1 && p < len)) continue;
      const i0 = Math.floor(p), f = p - i0;
      first[v] = i0;
      weights[w] = i0 >= 0 ? factor * (1 - f) : 0;
      weights[w + 1] = i0 + 1 < len ? factor * f : 0;
      sources[w] = lineBase + Math.max(0, i0) * stride;
      sources[w + 1] = lineBase + Math.min(len - 1, i0 + 1) * stride;
    } else {
      if (!(p >= 0 && p <= len - 1)) continue;
      const i0 = Math.floor(p), f = p - i0;
      // cubic B-spline weights of the taps i0-1 .. i0+2
      const g = 1 - f;
      first[v] = i0 - 1;
      weights[w] = factor * ((g * g * g) / 6);
      weights[w + 1] = factor * ((4 - 6 * f * f + 3 * f * f * f) / 6);
      weights[w + 2] = factor * ((4 - 6 * g * g + 3 * g * g * g) / 6);
      weights[w + 3] = factor * ((f * f * f) / 6);
      // the coefficients are mirror-extended beyond the line (the prefilter's own extension)
      for (let t = 0; t < 4; t++) sources[w + t] = lineBase + boundaryIndex(i0 - 1 + t, len, 'mirror') * stride;
    }
  }
  return { dims: [dims[0], dims[1], dims[2]], axis, kernel: options.kernel, taps, first, sources, weights, jacobian };
}
