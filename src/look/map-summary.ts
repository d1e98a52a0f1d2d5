import { selectKth } from './median-of.js';

/** Summary of a map inside a mask, from {@link summariseInMask}. */
export interface MapSummary {
  /** Finite voxels summarised. */
  voxels: number;
  median: number;
  /** First and third quartiles. */
  q1: number;
  q3: number;
  min: number;
  max: number;
}

/**
 * Median and quartiles of a map's finite values inside a mask. Quantiles interpolate linearly
 * between order statistics at position p (n - 1) (numpy's default "linear" method).
 * @param values - the map
 * @param mask - nonzero = in (all voxels when omitted)
 * @returns the summary (NaN fields when no voxel is finite)
 * @example summariseInMask(look.maps.tsnr.data, look.mask.mask).median
 */
export function summariseInMask(values: ArrayLike<number>, mask?: ArrayLike<number>): MapSummary {
  let count = 0;
  for (let i = 0; i < values.length; i++) if ((!mask || mask[i]) && Number.isFinite(values[i])) count++;
  if (count === 0) return { voxels: 0, median: NaN, q1: NaN, q3: NaN, min: NaN, max: NaN };
  const work = new Float64Array(count);
  let n = 0, min = Infinity, max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    if (mask && !mask[i]) continue;
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    work[n++] = v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  // the median first; the lower quartile then lies in the part below it, the upper in the part above
  const median = quantileIn(work, n, 0.5, 0, n);
  const mid = Math.floor(0.5 * (n - 1));
  const q1 = quantileIn(work, n, 0.25, 0, mid + 1);
  const q3 = quantileIn(work, n, 0.75, mid, n);
  return { voxels: n, q1, median, q3, min, max };
}

/**
 * Quantile p of work[0..n) by linear interpolation at position p (n - 1), given that position lies in
 * work[from..to) and every value there ranks above work[0..from) and below work[to..n).
 */
function quantileIn(work: Float64Array, n: number, p: number, from: number, to: number): number {
  const pos = p * (n - 1);
  const lo = Math.floor(pos);
  const a = selectKth(work, to, lo, from);
  if (pos === lo) return a;
  // after selecting lo, everything above index lo is >= a (values past `to` rank above the range):
  // the next order statistic is their minimum
  let b = Infinity;
  for (let i = lo + 1; i < n; i++) if (work[i] < b) b = work[i];
  return a + (pos - lo) * (b - a);
}
