import { checkMapAndMask, checkOpenUnit, type StatMap } from './threshold-input.js';
import { survivorsAtOrAbove, type ThresholdResult } from './threshold-result.js';
import { checkStatisticKind, upperCriticalValue } from './threshold-statistic.js';
import type { VoxelwiseDetails, VoxelwiseOptions } from './threshold-uncorrected.js';

/**
 * Bonferroni family-wise threshold: each of the m in-mask voxels is tested at alpha / m, which bounds
 * the chance of any false positive by alpha whatever the correlation between voxels (and is
 * conservative for smooth maps, where the random-field rule is less so).
 * @param map - statistic map
 * @param mask - nonzero = search region; same length as the map
 * @param options - alpha and statistic kind
 * @returns rule 'bonferroni', the critical value and survivors
 * @throws BoldsweepError INVALID_ARGUMENT (alpha outside (0, 1), bad stat, empty mask), GRID_MISMATCH, NON_FINITE_VOXELS
 * @example thresholdBonferroni(t, mask, { alpha: 0.05, stat: { kind: 't', dof: 120 } })
 */
export function thresholdBonferroni(map: StatMap, mask: ArrayLike<number>, options: VoxelwiseOptions): ThresholdResult<VoxelwiseDetails> {
  checkOpenUnit('alpha', options.alpha);
  checkStatisticKind(options.stat);
  const voxels = checkMapAndMask(map, mask);
  const pCutoff = options.alpha / voxels;
  const threshold = upperCriticalValue(pCutoff, options.stat);
  const { survivors, count } = survivorsAtOrAbove(map, mask, threshold);
  return { rule: 'bonferroni', threshold, survivors, details: { alpha: options.alpha, pCutoff, voxels, survivorCount: count } };
}
