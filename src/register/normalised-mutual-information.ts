import { fail } from '../core/fail.js';
import { parzenJointHistogram, type JointHistogramOptions } from './parzen-joint-histogram.js';

/**
 * Normalised mutual information of Studholme, Hill and Hawkes (1999, Pattern Recognition 32:71-86):
 * NMI = (H(F) + H(M)) / H(F, M), from the weighted joint histogram of parzenJointHistogram (entropies
 * with the natural logarithm; the ratio does not depend on the base). 1 for independent images, 2 for
 * images that determine each other.
 * @param fixedValues - fixed-image samples
 * @param movingValues - moving-image samples at the same points
 * @param weights - one weight per pair, or null
 * @param options - bins, ranges and window of the histogram
 * @returns NMI, from 1 to 2
 * @throws BoldsweepError INVALID_ARGUMENT as parzenJointHistogram; CONSTANT_DATA when the histogram is empty or all in one bin
 * @example normalisedMutualInformation(f, m, null, { bins: 32, fixedRange: [0, 1], movingRange: [0, 1] })
 */
export function normalisedMutualInformation(fixedValues: ArrayLike<number>, movingValues: ArrayLike<number>, weights: ArrayLike<number> | null, options: JointHistogramOptions): number {
  const h = parzenJointHistogram(fixedValues, movingValues, weights, options);
  const B = options.bins;
  let total = 0;
  for (let i = 0; i < h.length; i++) total += h[i];
  if (!(total > 0)) fail('CONSTANT_DATA', 'mutual information: every sample has weight 0');
  const pf = new Float64Array(B);
  const pm = new Float64Array(B);
  let hJoint = 0;
  for (let a = 0; a < B; a++) {
    for (let b = 0; b < B; b++) {
      const p = h[a * B + b] / total;
      if (p > 0) { hJoint -= p * Math.log(p); pf[a] += p; pm[b] += p; }
    }
  }
  let hf = 0, hm = 0;
  for (let a = 0; a < B; a++) {
    if (pf[a] > 0) hf -= pf[a] * Math.log(pf[a]);
    if (pm[a] > 0) hm -= pm[a] * Math.log(pm[a]);
  }
  if (!(hJoint > 0)) fail('CONSTANT_DATA', 'mutual information: all samples fall in one histogram bin');
  return (hf + hm) / hJoint;
}
