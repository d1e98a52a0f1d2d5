import { fail } from '../core/fail.js';

/**
 * Weighted Pearson correlation of paired samples: sum w (f - f') (m - m') / sqrt(sum w (f - f')^2
 * sum w (m - m')^2), with f' and m' the weighted means (two passes, so large offsets do not cancel).
 * @param a - first samples (e.g. fixed image)
 * @param b - second samples at the same points
 * @param weights - one weight per pair, or null for 1
 * @returns r, from -1 to 1
 * @throws BoldsweepError INVALID_ARGUMENT for different lengths; CONSTANT_DATA when either side does not vary
 * @example normalisedCorrelation(fixedValues, movingValues, null) // 1 for images equal up to a linear scaling
 */
export function normalisedCorrelation(a: ArrayLike<number>, b: ArrayLike<number>, weights: ArrayLike<number> | null): number {
  const n = a.length;
  if (b.length !== n || (weights && weights.length !== n)) fail('INVALID_ARGUMENT', `normalised correlation: ${n} and ${b.length} samples${weights ? `, ${weights.length} weights` : ''}; give one of each per sample`);
  let sw = 0, sa = 0, sb = 0;
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    sw += w; sa += w * a[i]; sb += w * b[i];
  }
  if (!(sw > 0)) fail('CONSTANT_DATA', 'normalised correlation: every sample has weight 0');
  const ma = sa / sw, mb = sb / sw;
  let saa = 0, sbb = 0, sab = 0;
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    const da = a[i] - ma, db = b[i] - mb;
    saa += w * da * da; sbb += w * db * db; sab += w * da * db;
  }
  if (!(saa > 0) || !(sbb > 0)) fail('CONSTANT_DATA', 'normalised correlation: one of the images is constant over the samples');
  return sab / Math.sqrt(saa * sbb);
}
