/**
 * Median of the finite values in `values` by quickselect (average O(n)); the input is not modified
 * (the values are copied into `scratch`, which is reused when it is long enough).
 * @param values - numbers; NaN and infinite values are skipped
 * @param scratch - optional work array of length >= values.length, to avoid an allocation per call
 * @returns the median (mean of the two middle values for an even count), NaN when no value is finite
 * @example medianOf([3, 1, 2]) // 2
 */
export function medianOf(values: ArrayLike<number>, scratch?: Float64Array): number {
  const work = scratch && scratch.length >= values.length ? scratch : new Float64Array(values.length);
  let n = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isFinite(v)) work[n++] = v;
  }
  if (n === 0) return NaN;
  const half = n >> 1;
  const upper = selectKth(work, n, half);
  if (n % 2 === 1) return upper;
  // after selecting `half`, every value below index `half` is <= upper: the lower middle is their max
  let lower = -Infinity;
  for (let i = 0; i < half; i++) if (work[i] > lower) lower = work[i];
  return (lower + upper) / 2;
}

/**
 * Hoare's quickselect on work[from..n): rearranges so work[k] is the k-th smallest (0-based, from <= k < n)
 * of that range with smaller-or-equal values before it. Median-of-three pivots keep sorted input fast.
 */
export function selectKth(work: Float64Array, n: number, k: number, from = 0): number {
  let lo = from, hi = n - 1;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // median of three to the `mid` slot as the pivot
    if (work[mid] < work[lo]) swap(work, mid, lo);
    if (work[hi] < work[lo]) swap(work, hi, lo);
    if (work[hi] < work[mid]) swap(work, hi, mid);
    const pivot = work[mid];
    let i = lo, j = hi;
    while (i <= j) {
      while (work[i] < pivot) i++;
      while (work[j] > pivot) j--;
      if (i <= j) { swap(work, i, j); i++; j--; }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return work[k];
  }
  return work[k];
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i]; a[i] = a[j]; a[j] = t;
}
