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
  const work = new Float64Array(values.length);
  let n = 0, min = Infinity, max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    if (mask && !mask[i]) continue;
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    work[n++] = v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (n === 0) return { voxels: 0, median: NaN, q1: NaN, q3: NaN, min: NaN, max: NaN };
  const q = (p: number): number => {
    const pos = p * (n - 1);
    const lo = Math.floor(pos);
    const a = selectKth(work, n, lo);
    if (pos === lo) return a;
    // after selecting lo, everything above index lo is >= a: the next order statistic is their minimum
    let b = Infinity;
    for (let i = lo + 1; i < n; i++) if (work[i] < b) b = work[i];
    return a + (pos - lo) * (b - a);
  };
  return { voxels: n, q1: q(0.25), median: q(0.5), q3: q(0.75), min, max };
}
