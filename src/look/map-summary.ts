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
  const { work, n, min, max } = collectFinite(values, mask);
  if (n === 0) return { voxels: 0, median: NaN, q1: NaN, q3: NaN, min: NaN, max: NaN };
  if (min === max) return { voxels: n, q1: min, median: min, q3: min, min, max };
  // the order statistics at the quartile positions, by bucket selection: count the values per bucket
  // of equal width, then select only among the values of the buckets that hold the wanted ranks
  const positions = [0.25, 0.5, 0.75].map((p) => p * (n - 1));
  const ranks = [...new Set(positions.flatMap((pos) => (Number.isInteger(pos) ? [pos] : [Math.floor(pos), Math.floor(pos) + 1])))];
  const stats = orderStatistics(work, n, min, max, ranks);
  const at = (pos: number): number => {
    const lo = Math.floor(pos);
    const a = stats.get(lo)!;
    return pos === lo ? a : a + (pos - lo) * (stats.get(lo + 1)! - a);
  };
  return { voxels: n, q1: at(positions[0]), median: at(positions[1]), q3: at(positions[2]), min, max };
}

/**
 * The k-th smallest of work[0..n) (0-based) for each k in `ranks`, exactly: values are counted into
 * up to 4096 buckets of equal width between min and max (max > min), and each wanted rank is selected
 * among the values of its bucket only.
 */
function orderStatistics(work: Float64Array, n: number, min: number, max: number, ranks: number[]): Map<number, number> {
  const B = Math.max(1, Math.min(4096, n >> 3));
  const scale = B / (max - min);
  const bucketOf = new Uint16Array(n);
  const count = new Int32Array(B);
  bucketCounts(work, n, min, scale, bucketOf, count);
  // bucket and rank within it of each wanted rank; gather those buckets' values
  const first = new Int32Array(B + 1);
  for (let b = 0; b < B; b++) first[b + 1] = first[b] + count[b];
  const bucketOfRank = ranks.map((k) => {
    let lo = 0, hi = B - 1;
    while (lo < hi) { const mid = (lo + hi) >> 1; if (first[mid + 1] > k) hi = mid; else lo = mid + 1; }
    return lo;
  });
  const slot = new Int32Array(B).fill(-1);
  const lists: Float64Array[] = [];
  for (const b of bucketOfRank) if (slot[b] < 0) { slot[b] = lists.length; lists.push(new Float64Array(count[b])); }
  gatherBuckets(work, n, bucketOf, slot, lists);
  const out = new Map<number, number>();
  ranks.forEach((k, j) => {
    const b = bucketOfRank[j], list = lists[slot[b]];
    out.set(k, selectKth(list, list.length, k - first[b]));
  });
  return out;
}

/** bucketOf[i] = bucket of work[i] (B = count.length buckets from min, `scale` buckets per unit); count[b] += 1. */
function bucketCounts(work: Float64Array, n: number, min: number, scale: number, bucketOf: Uint16Array, count: Int32Array): void {
  const B = count.length;
  for (let i = 0; i < n; i++) {
    let b = Math.floor((work[i] - min) * scale);
    if (b >= B) b = B - 1;
    bucketOf[i] = b;
    count[b]++;
  }
}

/** The values of each bucket b with slot[b] >= 0, into lists[slot[b]]. */
function gatherBuckets(work: Float64Array, n: number, bucketOf: Uint16Array, slot: Int32Array, lists: Float64Array[]): void {
  const filled = new Int32Array(lists.length);
  for (let i = 0; i < n; i++) {
    const q = slot[bucketOf[i]];
    if (q >= 0) lists[q][filled[q]++] = work[i];
  }
}

/** The finite values inside the mask (in a Float64Array of the mask's size), how many, their range. */
function collectFinite(values: ArrayLike<number>, mask: ArrayLike<number> | undefined): { work: Float64Array; n: number; min: number; max: number } {
  const work = new Float64Array(countIn(values.length, mask));
  const range = new Float64Array(3);
  fillFinite(values, mask, work, range);
  return { work, n: range[0], min: range[1], max: range[2] };
}

/** Voxels inside the mask (all when none). */
function countIn(length: number, mask: ArrayLike<number> | undefined): number {
  if (!mask) return length;
  let count = 0;
  for (let i = 0; i < length; i++) if (mask[i]) count++;
  return count;
}

/** work <- the finite values inside the mask; out = [count, min, max]. */
function fillFinite(values: ArrayLike<number>, mask: ArrayLike<number> | undefined, work: Float64Array, out: Float64Array): void {
  let n = 0, min = Infinity, max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    if (mask && !mask[i]) continue;
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    work[n++] = v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  out[0] = n; out[1] = min; out[2] = max;
}
