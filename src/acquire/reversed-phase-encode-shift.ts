import { fail } from '../core/fail.js';
import { FWHM_PER_SIGMA, gaussianKernel1d } from '../filter/gaussian-kernel.js';

/** Options of {@link reversedPhaseEncodeShift}. */
export interface ReversedPhaseEncodeOptions {
  /**
   * FWHM, in voxels, of the Gaussian that regularises the displacement field across neighbouring
   * lines (and along them): a normalised convolution weighted by where a line gave an estimate, so
   * lines without signal take their neighbours' displacement. __Default value:__ 2
   */
  smoothFwhmVoxels?: number;
  /**
   * Intensities below this fraction of the image's 99th percentile count as background (set to 0)
   * before the cumulative sums, so noise outside the head does not shift the match.
   * __Default value:__ 0.1
   */
  backgroundFraction?: number;
}

/** What {@link reversedPhaseEncodeShift} estimated. */
export interface ReversedPhaseEncodeShift {
  /** Shift of image A's signal along the axis, voxels, in the undistorted space (image B's is its negative). */
  shiftVoxels: Float32Array;
  /** 1 where a line gave a direct estimate (before regularisation). */
  measured: Uint8Array;
  /** Lines (of all lines along the axis) that held signal in both images. */
  linesMatched: number;
}

/**
 * The displacement field of a pair of EPI images acquired with opposite phase-encode directions, by
 * line-by-line matching of cumulative intensity (Chang H & Fitzpatrick JM (1992) A technique for
 * accurate magnetic resonance imaging in the presence of field inhomogeneities. IEEE Trans Med
 * Imaging 11:319-329). Along each phase-encode line the two images hold the same signal, moved by
 * +s(y) in A and -s(y) in B (s the shift of the undistorted position y), and each keeps the line's
 * signal (the intensity piles up where it is compressed). So the position a_c where A's cumulative
 * intensity reaches a level c and the position b_c where B's does are the images of one undistorted
 * position: y = (a_c + b_c) / 2, s(y) = (a_c - b_c) / 2. Levels are taken at 4 per voxel of the
 * line's total; each image's cumulative intensity is piecewise linear (constant within a voxel); B
 * is scaled to A's line total (noise and the Jacobian's edge effects make them differ slightly); s
 * is interpolated linearly onto the voxel centres between the first and last matched positions.
 * Regularisation: the per-line estimates are smoothed across neighbouring lines (and along them) by
 * a normalised Gaussian convolution of stated FWHM (default 2 voxels), weighted by where a line gave
 * an estimate, which also fills lines without signal from their neighbours.
 * @param imageA - the image acquired along the axis's direction as given (e.g. 'j'), one 3D image
 * @param imageB - the image acquired in the opposite direction ('j-'), on the same grid
 * @param dims - [nx, ny, nz]
 * @param axis - phase-encode voxel axis shared by the pair
 * @param options - smoothFwhmVoxels, backgroundFraction
 * @returns the shift of A's signal in voxels (a field in Hz is shift / (sign_A x total readout time))
 * @throws BoldsweepError INVALID_ARGUMENT for lengths, a bad axis or option
 * @example const { shiftVoxels } = reversedPhaseEncodeShift(meanJ, meanJMinus, [64, 64, 36], 1)
 */
export function reversedPhaseEncodeShift(
  imageA: ArrayLike<number>,
  imageB: ArrayLike<number>,
  dims: readonly [number, number, number],
  axis: 0 | 1 | 2,
  options: ReversedPhaseEncodeOptions = {},
): ReversedPhaseEncodeShift {
  const n = dims[0] * dims[1] * dims[2];
  if (imageA.length !== n || imageB.length !== n) fail('INVALID_ARGUMENT', `both images must have ${n} voxels, got ${imageA.length} and ${imageB.length}`);
  if (axis !== 0 && axis !== 1 && axis !== 2) fail('INVALID_ARGUMENT', `axis must be 0, 1 or 2, got ${String(axis)}`);
  const fwhm = options.smoothFwhmVoxels ?? 2;
  const bgFraction = options.backgroundFraction ?? 0.1;
  if (!(fwhm >= 0) || !Number.isFinite(fwhm)) fail('INVALID_ARGUMENT', `smoothFwhmVoxels must be >= 0, got ${fwhm}`);
  if (!(bgFraction >= 0 && bgFraction < 1)) fail('INVALID_ARGUMENT', `backgroundFraction must be in [0, 1), got ${bgFraction}`);
  const floor = bgFraction * percentile99(imageA, imageB);
  const len = dims[axis];
  const stride = axis === 0 ? 1 : axis === 1 ? dims[0] : dims[0] * dims[1];
  const lines = n / len;
  const shift = new Float64Array(n);
  const weight = new Float64Array(n);
  const ca = new Float64Array(len + 1), cb = new Float64Array(len + 1);
  const levels = 4 * len;
  const ys = new Float64Array(levels), ss = new Float64Array(levels);
  let linesMatched = 0;
  for (let li = 0; li < lines; li++) {
    const base = axis === 0 ? li * dims[0] : axis === 1 ? (li % dims[0]) + dims[0] * dims[1] * Math.floor(li / dims[0]) : li;
    let countA = 0, countB = 0;
    ca[0] = 0; cb[0] = 0;
    for (let y = 0; y < len; y++) {
      const a = imageA[base + y * stride], b = imageB[base + y * stride];
      const av = a > floor ? a : 0, bv = b > floor ? b : 0;
      if (av > 0) countA++;
      if (bv > 0) countB++;
      ca[y + 1] = ca[y] + av;
      cb[y + 1] = cb[y] + bv;
    }
    // a line needs some signal in both images to be matched
    if (countA < 2 || countB < 2) continue;
    linesMatched++;
    const total = ca[len], scaleB = total / cb[len];
    for (let m = 0; m < levels; m++) {
      const c = (total * (m + 0.5)) / levels;
      const a = inverseCumulative(ca, c, 1), b = inverseCumulative(cb, c, scaleB);
      ys[m] = (a + b) / 2;
      ss[m] = (a - b) / 2;
    }
    // s at the voxel centres between the first and last matched positions (ys never decreases)
    let m = 0;
    for (let y = Math.max(0, Math.ceil(ys[0])); y <= Math.min(len - 1, Math.floor(ys[levels - 1])); y++) {
      while (m < levels - 2 && ys[m + 1] < y) m++;
      const dy = ys[m + 1] - ys[m];
      const f = dy > 0 ? Math.min(1, Math.max(0, (y - ys[m]) / dy)) : 0;
      const v = base + y * stride;
      shift[v] = ss[m] + f * (ss[m + 1] - ss[m]);
      weight[v] = 1;
    }
  }
  const measured = Uint8Array.from(weight);
  const smoothed = normalisedGaussian(shift, weight, dims, fwhm / FWHM_PER_SIGMA);
  return { shiftVoxels: Float32Array.from(smoothed), measured, linesMatched };
}

/** Position (voxel coordinates) where a cumulative sum given at voxel edges (edge k at k - 0.5) x scale reaches c. */
function inverseCumulative(cum: Float64Array, c: number, scale: number): number {
  // binary search for the voxel whose interval holds c
  let lo = 0, hi = cum.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (cum[mid] * scale < c) lo = mid; else hi = mid;
  }
  const a = cum[lo] * scale, b = cum[hi] * scale;
  const f = b > a ? (c - a) / (b - a) : 0.5;
  return lo - 0.5 + f;
}

/** 99th percentile of the positive values of two images (the bright end of the head). */
function percentile99(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const vals: number[] = [];
  for (let i = 0; i < a.length; i++) { if (a[i] > 0) vals.push(a[i]); if (b[i] > 0) vals.push(b[i]); }
  if (vals.length === 0) return 0;
  const sorted = Float64Array.from(vals).sort();
  return sorted[Math.min(sorted.length - 1, Math.floor(0.99 * sorted.length))];
}

/** Normalised convolution: G*(x w) / G*w, separable, zero beyond the grid; 0 where no weight reaches. */
function normalisedGaussian(x: Float64Array, w: Float64Array, dims: readonly [number, number, number], sigma: number): Float64Array {
  const num = new Float64Array(x.length), den = Float64Array.from(w);
  for (let v = 0; v < x.length; v++) num[v] = x[v] * w[v];
  if (sigma > 0) {
    const k = gaussianKernel1d(sigma);
    for (let a = 0; a < 3; a++) { convolveAxis(num, dims, a, k); convolveAxis(den, dims, a, k); }
  }
  const out = new Float64Array(x.length);
  for (let v = 0; v < x.length; v++) out[v] = den[v] > 1e-6 ? num[v] / den[v] : 0;
  return out;
}

function convolveAxis(x: Float64Array, dims: readonly [number, number, number], axis: number, k: Float64Array): void {
  const len = dims[axis];
  const stride = axis === 0 ? 1 : axis === 1 ? dims[0] : dims[0] * dims[1];
  const r = (k.length - 1) / 2;
  const lines = x.length / len;
  const line = new Float64Array(len);
  for (let li = 0; li < lines; li++) {
    const base = axis === 0 ? li * dims[0] : axis === 1 ? (li % dims[0]) + dims[0] * dims[1] * Math.floor(li / dims[0]) : li;
    for (let y = 0; y < len; y++) line[y] = x[base + y * stride];
    for (let y = 0; y < len; y++) {
      let s = 0;
      for (let d = -r; d <= r; d++) { const q = y + d; if (q >= 0 && q < len) s += k[r + d] * line[q]; }
      x[base + y * stride] = s;
    }
  }
}
