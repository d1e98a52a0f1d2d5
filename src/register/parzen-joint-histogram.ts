import { fail } from '../core/fail.js';

/** How a value is spread over histogram bins: `box` (its one bin) or `cubic-bspline` (a Parzen window over 4 bins). */
export type ParzenWindow = 'box' | 'cubic-bspline';

/** Options of {@link parzenJointHistogram}. */
export interface JointHistogramOptions {
  /** Bins per image (at least 8 with the cubic B-spline window, at least 2 with the box). */
  bins: number;
  /** [min, max] of the fixed values mapped onto the bins (values outside are clamped). */
  fixedRange: readonly [number, number];
  /** [min, max] of the moving values mapped onto the bins (values outside are clamped). */
  movingRange: readonly [number, number];
  /** Window of the moving values; the fixed values always use the box. __Default value:__ `'cubic-bspline'` */
  window?: ParzenWindow;
}

/** Cubic B-spline beta3(u): 2/3 - u^2 + |u|^3/2 for |u| < 1, (2 - |u|)^3/6 for |u| < 2, else 0. */
function bspline3(u: number): number {
  const a = Math.abs(u);
  if (a < 1) return 2 / 3 - a * a + 0.5 * a * a * a;
  if (a < 2) { const b = 2 - a; return (b * b * b) / 6; }
  return 0;
}

/**
 * Weighted joint histogram of paired fixed and moving values, as in Mattes et al. (2003, IEEE TMI
 * 22:120-128): each fixed value falls in one bin (a box window: bin floor((f - min) / (max - min) * B),
 * the top value in the last bin), each moving value is spread by a cubic B-spline Parzen window
 * centred at z = 2 + (m - min) / (max - min) * (B - 5), so its four bins stay inside 0..B-1 and the
 * histogram is a smooth function of the moving values. With `window: 'box'` the moving values are
 * binned like the fixed ones (numpy.histogram2d with `bins=B` and these ranges gives the same counts).
 * @param fixedValues - fixed-image samples
 * @param movingValues - moving-image samples at the same points
 * @param weights - one weight per pair, or null for 1
 * @param options - bins, ranges, window
 * @returns B x B weights, fixed bin major: entry [bf * B + bm]
 * @throws BoldsweepError INVALID_ARGUMENT for arrays of different lengths, too few bins, or an empty range
 * @example const h = parzenJointHistogram(f, m, null, { bins: 32, fixedRange: [0, 1000], movingRange: [0, 1000] })
 */
export function parzenJointHistogram(fixedValues: ArrayLike<number>, movingValues: ArrayLike<number>, weights: ArrayLike<number> | null, options: JointHistogramOptions): Float64Array {
  const n = fixedValues.length;
  const B = options.bins;
  const window = options.window ?? 'cubic-bspline';
  if (movingValues.length !== n || (weights && weights.length !== n)) fail('INVALID_ARGUMENT', `joint histogram: ${n} fixed values, ${movingValues.length} moving values${weights ? `, ${weights.length} weights` : ''}; give one of each per sample`);
  if (!Number.isInteger(B) || B < (window === 'box' ? 2 : 8) || B > 1024) fail('INVALID_ARGUMENT', `bins must be an integer from ${window === 'box' ? 2 : 8} to 1024, got ${B}`);
  const [f0, f1] = options.fixedRange;
  const [m0, m1] = options.movingRange;
  if (!(f1 > f0) || !(m1 > m0)) fail('INVALID_ARGUMENT', `histogram ranges must have max > min, got fixed [${f0}, ${f1}], moving [${m0}, ${m1}]`);
  const h = new Float64Array(B * B);
  const fScale = B / (f1 - f0);
  const boxScale = B / (m1 - m0);
  const zScale = (B - 5) / (m1 - m0);
  for (let s = 0; s < n; s++) {
    const w = weights ? weights[s] : 1;
    if (w === 0) continue;
    let bf = Math.floor((fixedValues[s] - f0) * fScale);
    bf = bf < 0 ? 0 : bf > B - 1 ? B - 1 : bf;
    const row = bf * B;
    const m = movingValues[s];
    if (window === 'box') {
      let bm = Math.floor((m - m0) * boxScale);
      bm = bm < 0 ? 0 : bm > B - 1 ? B - 1 : bm;
      h[row + bm] += w;
      continue;
    }
    let z = 2 + (m - m0) * zScale;
    z = z < 2 ? 2 : z > B - 3 ? B - 3 : z;
    const j0 = Math.floor(z) - 1;
    for (let j = j0; j < j0 + 4; j++) {
      if (j >= 0 && j < B) h[row + j] += w * bspline3(z - j);
    }
  }
  return h;
}
