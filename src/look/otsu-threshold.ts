import { fail } from '../core/fail.js';

/** Result of {@link otsuThreshold}. */
export interface OtsuResult {
  /** Intensity threshold: the upper edge of the last background bin; foreground is value > threshold. */
  threshold: number;
  /** Index k* of the last bin of the lower class (0-based). */
  binIndex: number;
  /** Centre of bin k* (what some implementations report as the threshold). */
  binCentre: number;
  /** Between-class variance at k*, in squared intensity units. */
  betweenClassVariance: number;
  /** Class separability eta = sigma_B^2 / sigma_T^2 at k* (0..1), Otsu's own figure of merit. */
  separability: number;
  /** The histogram used: counts per bin and bin edges (length bins + 1). */
  counts: Float64Array;
  edges: Float64Array;
}

/**
 * Otsu's threshold (Otsu N 1979, IEEE Trans Syst Man Cybern 9(1):62-66) of a histogram: choose the
 * split k maximising the between-class variance
 *   sigma_B^2(k) = (mu_T w(k) - mu(k))^2 / (w(k) (1 - w(k)))
 * with w(k) = sum_{i<=k} p_i, mu(k) = sum_{i<=k} p_i x_i and mu_T = mu(L-1) (eq. 18 of the paper),
 * where x_i are the bin centres. The first maximum wins a tie.
 * @param counts - histogram counts (non-negative)
 * @param edges - bin edges, length counts.length + 1, increasing
 * @returns the threshold and its figures of merit
 * @throws BoldsweepError CONSTANT_DATA when all weight sits in one bin (no split exists)
 * @example otsuFromHistogram(new Float64Array([5, 1, 0, 6]), new Float64Array([0, 1, 2, 3, 4])).binIndex // 1
 */
export function otsuFromHistogram(counts: ArrayLike<number>, edges: ArrayLike<number>): OtsuResult {
  const bins = counts.length;
  if (edges.length !== bins + 1) fail('INVALID_ARGUMENT', `Otsu: edges must have ${bins + 1} entries, got ${edges.length}`);
  let total = 0;
  for (let i = 0; i < bins; i++) total += counts[i];
  if (!(total > 0)) fail('CONSTANT_DATA', 'Otsu: the histogram is empty');
  let muT = 0;
  for (let i = 0; i < bins; i++) muT += (counts[i] / total) * 0.5 * (edges[i] + edges[i + 1]);
  let varT = 0;
  for (let i = 0; i < bins; i++) { const d = 0.5 * (edges[i] + edges[i + 1]) - muT; varT += (counts[i] / total) * d * d; }
  let w = 0, mu = 0, best = -1, bestK = -1;
  for (let k = 0; k < bins - 1; k++) {
    const p = counts[k] / total;
    w += p;
    mu += p * 0.5 * (edges[k] + edges[k + 1]);
    if (w <= 0 || w >= 1) continue;
    const num = muT * w - mu;
    const sb = (num * num) / (w * (1 - w));
    if (sb > best) { best = sb; bestK = k; }
  }
  // a class probability that rounds to 1 only happens when one bin holds everything
  if (bestK < 0 || !(varT > 0)) fail('CONSTANT_DATA', 'Otsu: every value falls in one histogram bin, so no threshold separates two classes');
  return {
    threshold: edges[bestK + 1],
    binIndex: bestK,
    binCentre: 0.5 * (edges[bestK] + edges[bestK + 1]),
    betweenClassVariance: best,
    separability: best / varT,
    counts: Float64Array.from(counts),
    edges: Float64Array.from(edges),
  };
}

/**
 * Histogram of the finite values (optionally only where `mask` is nonzero) in `bins` equal bins
 * from the minimum to the maximum; the last bin includes the maximum (as numpy.histogram does).
 * @param values - intensities
 * @param bins - number of bins (default 256)
 * @param mask - optional: only voxels with mask[i] != 0 count
 * @returns counts and edges
 * @throws BoldsweepError CONSTANT_DATA when fewer than two distinct finite values exist
 * @example const { counts, edges } = histogramOf(meanMap, 256)
 */
export function histogramOf(values: ArrayLike<number>, bins = 256, mask?: ArrayLike<number>): { counts: Float64Array; edges: Float64Array } {
  if (!Number.isInteger(bins) || bins < 2) fail('INVALID_ARGUMENT', `bins must be an integer >= 2, got ${bins}`);
  const range = new Float64Array(2);
  finiteRange(values, mask, range);
  const lo = range[0], hi = range[1];
  if (!(hi > lo)) fail('CONSTANT_DATA', `the image has ${lo === Infinity ? 'no finite values' : `a single value (${lo})`}, so no intensity threshold exists`);
  const edges = new Float64Array(bins + 1);
  const width = (hi - lo) / bins;
  for (let i = 0; i <= bins; i++) edges[i] = lo + i * width;
  edges[bins] = hi;
  const counts = new Float64Array(bins);
  countIntoBins(values, mask, lo, bins / (hi - lo), counts);
  return { counts, edges };
}

/**
 * Otsu threshold of an image's intensities: {@link histogramOf} then {@link otsuFromHistogram}.
 * @param values - intensities (e.g. the mean image of a run)
 * @param bins - histogram bins (default 256)
 * @param mask - optional: only voxels with mask[i] != 0 count
 * @returns the threshold and the histogram it came from
 * @example const { threshold } = otsuThreshold(meanMap.data); const inBrain = meanMap.data[v] > threshold
 */
export function otsuThreshold(values: ArrayLike<number>, bins = 256, mask?: ArrayLike<number>): OtsuResult {
  const { counts, edges } = histogramOf(values, bins, mask);
  return otsuFromHistogram(counts, edges);
}

// The loops over all values live in small functions, which V8 optimises once and keeps (the histogram
// is made once per look: as part of one long function its loops ran unoptimised at first).

/** out = [min, max] of the finite values (inside the mask). */
function finiteRange(values: ArrayLike<number>, mask: ArrayLike<number> | undefined, out: Float64Array): void {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    if (mask && !mask[i]) continue;
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  out[0] = lo; out[1] = hi;
}

/** counts[floor((v - lo) * scale)] += 1 for the finite values (inside the mask); the top edge goes to the last bin. */
function countIntoBins(values: ArrayLike<number>, mask: ArrayLike<number> | undefined, lo: number, scale: number, counts: Float64Array): void {
  const bins = counts.length;
  for (let i = 0; i < values.length; i++) {
    if (mask && !mask[i]) continue;
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    let b = Math.floor((v - lo) * scale);
    if (b >= bins) b = bins - 1;
    counts[b]++;
  }
}
