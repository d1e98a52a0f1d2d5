import { checkMapAndMask, checkOpenUnit, type StatMap } from './threshold-input.js';
import { survivorsAtOrAbove, type ThresholdResult } from './threshold-result.js';
import { checkStatisticKind, upperCriticalValue, type StatisticKind } from './threshold-statistic.js';

/** Options of {@link thresholdUncorrected} and {@link thresholdBonferroni}. */
export interface VoxelwiseOptions {
  /** Family-wise (Bonferroni) or per-voxel (uncorrected) error rate, in (0, 1). */
  alpha: number;
  /** Null distribution of the map. */
  stat: StatisticKind;
}

/** Details of a voxelwise threshold. */
export interface VoxelwiseDetails {
  alpha: number;
  /** The per-voxel p-value cut-off actually used. */
  pCutoff: number;
  /** In-mask voxels tested. */
  voxels: number;
  survivorCount: number;
}

/**
 * Voxelwise uncorrected threshold: each voxel is tested at `alpha` on its own (one-sided, positive
 * tail), so about alpha x voxels false positives are expected under the null.
 * @param map - statistic map
 * @param mask - nonzero = search region; same length as the map
 * @param options - alpha and statistic kind
 * @returns rule 'uncorrected', the critical value and survivors
 * @throws BoldsweepError INVALID_ARGUMENT (alpha outside (0, 1), bad stat), GRID_MISMATCH, NON_FINITE_VOXELS
 * @example thresholdUncorrected(z, mask, { alpha: 0.001, stat: { kind: 'z' } }).threshold // 3.0902
 */
export function thresholdUncorrected(map: StatMap, mask: ArrayLike<number>, options: VoxelwiseOptions): ThresholdResult<VoxelwiseDetails> {
  checkOpenUnit('alpha', options.alpha);
  checkStatisticKind(options.stat);
  const voxels = checkMapAndMask(map, mask);
  const threshold = upperCriticalValue(options.alpha, options.stat);
  const { survivors, count } = survivorsAtOrAbove(map, mask, threshold);
  return { rule: 'uncorrected', threshold, survivors, details: { alpha: options.alpha, pCutoff: options.alpha, voxels, survivorCount: count } };
}
