import { thresholdBonferroni } from './threshold-bonferroni.js';
import { survivorsAtOrAbove, type ThresholdResult } from './threshold-result.js';
import { thresholdRft, type RftDetails, type RftOptions } from './threshold-rft.js';
import type { StatMap } from './threshold-input.js';

/** Details of {@link thresholdRftBonferroni}: both cut-offs and which one was used. */
export interface RftBonferroniDetails extends RftDetails {
  /** The random-field critical value. */
  rftThreshold: number;
  /** The Bonferroni critical value over the mask's voxels. */
  bonferroniThreshold: number;
  /** Which of the two was lower, and so used. */
  used: 'rft' | 'bonferroni';
}

/**
 * Voxel-level family-wise threshold as the lesser of the random-field and the Bonferroni critical
 * values. Both bound the family-wise error rate by alpha (Bonferroni for any correlation; random-field
 * theory for a smooth field), so the lower one does too and loses less power. Random-field theory is
 * conservative when the field is rough (FWHM under about 3 voxels, where the lattice maximum falls short of
 * the continuous one), and Bonferroni is then the lower value; for smooth fields the reverse holds
 * (Nichols T & Hayasaka S 2003, Stat Methods Med Res 12(5):419-446 [memory]).
 * @param map - statistic map
 * @param mask - nonzero = search region
 * @param dims - [nx, ny, nz]
 * @param options - alpha, statistic kind, smoothness and voxel size (as for thresholdRft)
 * @returns rule 'rft-bonferroni-fwe', the lower critical value, survivors, and both values
 * @throws BoldsweepError as thresholdRft and thresholdBonferroni
 * @example thresholdRftBonferroni(t, mask, [64, 64, 36], { alpha: 0.05, stat: { kind: 't', dof: 190 }, fwhmMm: [5, 5, 5], spacingMm: [3, 3, 3] }).details.used
 */
export function thresholdRftBonferroni(map: StatMap, mask: ArrayLike<number>, dims: readonly number[], options: RftOptions): ThresholdResult<RftBonferroniDetails> {
  const rft = thresholdRft(map, mask, dims, options);
  const bon = thresholdBonferroni(map, mask, { alpha: options.alpha, stat: options.stat });
  const used = bon.threshold < rft.threshold ? 'bonferroni' : 'rft';
  const threshold = used === 'rft' ? rft.threshold : bon.threshold;
  const { survivors, count } = used === 'rft' ? { survivors: rft.survivors, count: rft.details.survivorCount } : survivorsAtOrAbove(map, mask, threshold);
  return {
    rule: 'rft-bonferroni-fwe', threshold, survivors,
    details: { ...rft.details, survivorCount: count, rftThreshold: rft.threshold, bonferroniThreshold: bon.threshold, used },
  };
}
