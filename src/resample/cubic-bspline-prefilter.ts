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

let scratchYp = new Float64Array(0);
let scratchYm = new Float64Array(0);

/** Starting sums of the two recursions as index/weight lists (norm included), for lines of length n. */
export interface InitTaps { causalIdx: Int32Array; causalW: Float64Array; antiIdx: Int32Array; antiW: Float64Array }

/**
 * The starting sums of the prefilter's two recursions for lines of length n under a mode, as index and
 * weight lists (exact over the mode's periodic extension, truncated where z^j < 1e-18).
 * @param n - line length
 * @param mode - line extension
 * @returns the taps
 * @example const t = initTaps(64, 'mirror')
 */
export function initTaps(n: number, mode: 'mirror' | 'reflect' | 'wrap'): InitTaps {
  const z = CUBIC_BSPLINE_POLE;
  const period = mode === 'mirror' ? 2 * n - 2 : mode === 'reflect' ? 2 * n : n;
  const terms = Math.min(period, HORIZON);
  const norm = period <= HORIZON ? 1 / (1 - Math.pow(z, period)) : 1;
  const t: InitTaps = { causalIdx: new Int32Array(terms), causalW: new Float64Array(terms), antiIdx: new Int32Array(terms), antiW: new Float64Array(terms) };
  let zj = norm;
  for (let j = 0; j < terms; j++, zj *= z) {
    t.causalIdx[j] = boundaryIndex(-j, n, mode); t.causalW[j] = zj;
    t.antiIdx[j] = boundaryIndex(n - 1 + j, n, mode); t.antiW[j] = zj;
  }
  return t;
}

/**
 * Prefilter B lines at once: line b, sample k is at c[o + b + k * stride] (B contiguous lines, as
 * the y and z passes of an x-fastest volume are), so every inner loop runs over contiguous memory.
 * @param c - values in, coefficients out
 * @param o - offset of the first line's first sample
 * @param lines - B
 * @param n - line length
 * @param stride - distance between a line's samples
 * @param t - {@link initTaps} for n
 * @param yp - scratch, at least n x B
 * @param ym - scratch, at least B
 * @returns nothing
 * @example prefilterBatch(c, 0, 64, 64, 64, initTaps(64, 'mirror'), yp, ym)
 */
export function prefilterBatch(c: Float64Array, o: number, lines: number, n: number, stride: number, t: InitTaps, yp: Float64Array, ym: Float64Array): void {
  const z = CUBIC_BSPLINE_POLE;
  const alpha = (-6 * z) / (1 - z * z);
  for (let b = 0; b < lines; b++) yp[b] = 0;
  for (let j = 0; j < t.causalIdx.length; j++) {
    const w = t.causalW[j], q = o + t.causalIdx[j] * stride;
    for (let b = 0; b < lines; b++) yp[b] += w * c[q + b];
  }
  for (let k = 1; k < n; k++) {
    const q = o + k * stride, r = k * lines;
    for (let b = 0; b < lines; b++) yp[r + b] = c[q + b] + z * yp[r - lines + b];
  }
  for (let b = 0; b < lines; b++) ym[b] = 0;
  for (let j = 0; j < t.antiIdx.length; j++) {
    const w = t.antiW[j], q = o + t.antiIdx[j] * stride;
    for (let b = 0; b < lines; b++) ym[b] += w * c[q + b];
  }
  {
    const q = o + (n - 1) * stride, r = (n - 1) * lines;
    for (let b = 0; b < lines; b++) c[q + b] = alpha * (yp[r + b] + ym[b] - c[q + b]);
  }
  for (let k = n - 2; k >= 0; k--) {
    const q = o + k * stride, r = k * lines;
    for (let b = 0; b < lines; b++) {
      const s = c[q + b];
      const m = s + z * ym[b];
      ym[b] = m;
      c[q + b] = alpha * (yp[r + b] + m - s);
    }
  }
}

/**
 * Prefilter one line in place at c[o + k] (the x pass: samples contiguous).
 * @param c - values in, coefficients out
 * @param o - offset of the line
 * @param n - line length
 * @param t - {@link initTaps} for n
 * @param yp - scratch, at least n
 * @returns nothing
 * @example prefilterRow(c, 0, 64, initTaps(64, 'mirror'), yp)
 */
export function prefilterRow(c: Float64Array, o: number, n: number, t: InitTaps, yp: Float64Array): void {
  const z = CUBIC_BSPLINE_POLE;
  const alpha = (-6 * z) / (1 - z * z);
  let sum = 0;
  for (let j = 0; j < t.causalIdx.length; j++) sum += t.causalW[j] * c[o + t.causalIdx[j]];
  yp[0] = sum;
  for (let k = 1; k < n; k++) yp[k] = c[o + k] + z * yp[k - 1];
  let ym = 0;
  for (let j = 0; j < t.antiIdx.length; j++) ym += t.antiW[j] * c[o + t.antiIdx[j]];
  c[o + n - 1] = alpha * (yp[n - 1] + ym - c[o + n - 1]);
  for (let k = n - 2; k >= 0; k--) {
    const s = c[o + k];
    ym = s + z * ym;
    c[o + k] = alpha * (yp[k] + ym - s);
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
  if (pad === 0 && (data instanceof Float32Array || data instanceof Float64Array)) {
    // a typed array is copied in one call: the element loop over ArrayLike took 1.7 ms of a 64 x 64 x 36 volume's 4.4
    c.set(data.length === total ? data : data.subarray(0, total));
  } else if (pad === 0) {
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
  const sxy = nx * ny;
  // scratch for the causal pass of a batch (the z pass holds a whole volume of it), kept between calls
  const need = Math.max(nx, ny * nx, nz * sxy);
  if (scratchYp.length < need) scratchYp = new Float64Array(need);
  if (scratchYm.length < Math.max(nx, sxy)) scratchYm = new Float64Array(Math.max(nx, sxy));
  const yp = scratchYp, ym = scratchYm;
  if (nx > 1) {
    const t = initTaps(nx, lineMode);
    for (let o = 0; o < total; o += nx) prefilterRow(c, o, nx, t, yp);
  }
  if (ny > 1) {
    const t = initTaps(ny, lineMode);
    for (let k = 0; k < nz; k++) prefilterBatch(c, k * sxy, nx, ny, nx, t, yp, ym);
  }
  if (nz > 1) prefilterBatch(c, 0, sxy, nz, sxy, initTaps(nz, lineMode), yp, ym);
  return { coefficients: c, dims: [nx, ny, nz], pad };
}
