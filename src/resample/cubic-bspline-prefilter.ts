import { boundaryIndex, type BoundaryMode } from '../core/boundary-mode.js';

/**
 * Pole of the cubic B-spline prefilter: the root of z^2 + 4z + 1 = 0 inside the unit circle,
 * z = sqrt(3) - 2 (Unser M (1999) Splines: a perfect fit for signal and image processing. IEEE
 * Signal Process Mag 16(6):22-38 [memory]).
 */
export const CUBIC_BSPLINE_POLE = Math.sqrt(3) - 2;

/**
 * Samples of edge padding that scipy.ndimage (1.10) adds before prefiltering in `nearest` mode
 * (edge values repeated), so that the spline beyond the edge follows the repeated edge value.
 */
export const NEAREST_SPLINE_PAD = 12;

/** Beyond this many terms z^j is below 1e-18 and the periodic sums need no more (|z|^32 ~ 5e-19). */
const HORIZON = 32;

/** Result of {@link cubicBSplinePrefilter}. */
export interface CubicCoefficients {
  /** B-spline coefficients, x fastest, on `dims` (the source grid plus `pad` voxels each side). */
  coefficients: Float64Array;
  /** Dimensions of the coefficient array. */
  dims: [number, number, number];
  /** Voxels of padding on each side of every axis (12 for `nearest`, else 0). */
  pad: number;
}

/**
 * Exact cubic B-spline prefilter of one line, in place: the coefficients c whose spline goes
 * through the samples, (c[k-1] + 4 c[k] + c[k+1]) / 6 = s[k], with c extended past the edges like
 * the samples (`mirror`, `reflect`, `wrap`). The inverse filter is sqrt(3) sum_m z^|m| s[k - m]
 * (z the pole), computed as a causal and an anticausal first-order recursion whose starting values
 * are the exact sums over the periodic extension (period 2n-2, 2n or n), so nothing is truncated
 * beyond double precision (Unser 1999, box 2 [memory]).
 * @param line - samples in, coefficients out (modified)
 * @param mode - `mirror`, `reflect` or `wrap` (the others are mapped by the caller)
 * @param scratch - at least line.length doubles
 * @returns nothing
 * @example prefilterLine(Float64Array.of(1, 5, 2, 7, 3), 'mirror', new Float64Array(5))
 */
export function prefilterLine(line: Float64Array, mode: 'mirror' | 'reflect' | 'wrap', scratch: Float64Array): void {
  const n = line.length;
  if (n === 1) return; // a constant: its coefficient is the sample
  const z = CUBIC_BSPLINE_POLE;
  const alpha = (-6 * z) / (1 - z * z); // = sqrt(3)
  const period = mode === 'mirror' ? 2 * n - 2 : mode === 'reflect' ? 2 * n : n;
  const terms = Math.min(period, HORIZON);
  const norm = period <= HORIZON ? 1 / (1 - Math.pow(z, period)) : 1;
  // causal: yp[k] = s[k] + z yp[k-1], yp[0] = sum_j z^j s~[-j]
  let zj = 1, sum = 0;
  for (let j = 0; j < terms; j++, zj *= z) sum += zj * line[boundaryIndex(-j, n, mode)];
  const yp = scratch;
  yp[0] = sum * norm;
  for (let k = 1; k < n; k++) yp[k] = line[k] + z * yp[k - 1];
  // anticausal: ym[k] = s[k] + z ym[k+1], ym[n-1] = sum_j z^j s~[n-1+j]; c = alpha (yp + ym - s)
  zj = 1; sum = 0;
  for (let j = 0; j < terms; j++, zj *= z) sum += zj * line[boundaryIndex(n - 1 + j, n, mode)];
  let ym = sum * norm;
  line[n - 1] = alpha * (yp[n - 1] + ym - line[n - 1]);
  for (let k = n - 2; k >= 0; k--) {
    const s = line[k];
    ym = s + z * ym;
    line[k] = alpha * (yp[k] + ym - s);
  }
}

/**
 * Cubic B-spline coefficients of a 3D image (Unser 1999), separable along x, y, z, for
 * interpolation under a boundary mode with scipy.ndimage's (1.10) meaning: `mirror`, `reflect` and
 * `wrap` (period n) use their own exact extension; `constant` uses the mirror (cval only replaces
 * positions outside the grid); `nearest` pads 12 edge values each side first, then uses `reflect`.
 * @param data - voxel values, x fastest (not modified)
 * @param dims - [nx, ny, nz]
 * @param mode - boundary mode
 * @param out - a reusable coefficient array of the right length (see the returned dims), optional
 * @returns the coefficients, their dims and the padding
 * @example const { coefficients } = cubicBSplinePrefilter(image, [64, 64, 36], 'mirror')
 */
export function cubicBSplinePrefilter(data: ArrayLike<number>, dims: readonly [number, number, number], mode: BoundaryMode, out?: Float64Array): CubicCoefficients {
  const pad = mode === 'nearest' ? NEAREST_SPLINE_PAD : 0;
  const [sx, sy, sz] = dims;
  const nx = sx + 2 * pad, ny = sy + 2 * pad, nz = sz + 2 * pad;
  const total = nx * ny * nz;
  const c = out && out.length === total ? out : new Float64Array(total);
  if (pad === 0) {
    for (let p = 0; p < total; p++) c[p] = data[p];
  } else {
    let p = 0;
    for (let k = 0; k < nz; k++) {
      const kk = Math.min(sz - 1, Math.max(0, k - pad));
      for (let j = 0; j < ny; j++) {
        const jj = Math.min(sy - 1, Math.max(0, j - pad));
        const row = sx * (jj + sy * kk);
        for (let i = 0; i < nx; i++, p++) c[p] = data[row + Math.min(sx - 1, Math.max(0, i - pad))];
      }
    }
  }
  const lineMode: 'mirror' | 'reflect' | 'wrap' = mode === 'wrap' ? 'wrap' : mode === 'reflect' || mode === 'nearest' ? 'reflect' : 'mirror';
  const longest = Math.max(nx, ny, nz);
  const line = new Float64Array(longest), scratch = new Float64Array(longest);
  const axes: [number, number, number][] = [[nx, 1, 0], [ny, nx, 1], [nz, nx * ny, 2]];
  for (const [n, stride, axis] of axes) {
    if (n === 1) continue;
    const l = line.subarray(0, n);
    // every line along this axis: start offsets over the other two axes
    const [na, sa, nb, sb] = axis === 0 ? [ny, nx, nz, nx * ny] : axis === 1 ? [nx, 1, nz, nx * ny] : [nx, 1, ny, nx];
    for (let b = 0; b < nb; b++) {
      for (let a = 0; a < na; a++) {
        const start = a * sa + b * sb;
        for (let m = 0, q = start; m < n; m++, q += stride) l[m] = c[q];
        prefilterLine(l, lineMode, scratch);
        for (let m = 0, q = start; m < n; m++, q += stride) c[q] = l[m];
      }
    }
  }
  return { coefficients: c, dims: [nx, ny, nz], pad };
}
