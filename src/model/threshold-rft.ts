import { rftCriticalValue } from './rft-critical-value.js';
import type { Resels } from './rft-ec-density.js';
import { reselCounts } from './resels.js';
import { checkMapAndMask, checkOpenUnit, type StatMap } from './threshold-input.js';
import { survivorsAtOrAbove, type ThresholdResult } from './threshold-result.js';
import { checkStatisticKind, type StatisticKind } from './threshold-statistic.js';

/** Options of {@link thresholdRft}. */
export interface RftOptions {
  /** Family-wise error rate in (0, 1). */
  alpha: number;
  /** Null distribution of the map. */
  stat: StatisticKind;
  /** Smoothness FWHM in mm, one number or one per axis (e.g. estimateSmoothness(...).fwhmMm). */
  fwhmMm: number | readonly number[];
  /** Voxel size in mm along x, y, z. */
  spacingMm: readonly number[];
}

/** Details of a random-field threshold. */
export interface RftDetails {
  alpha: number;
  /** [R0, R1, R2, R3] of the mask. */
  resels: Resels;
  fwhmVoxels: [number, number, number];
  /** Expected Euler characteristic at the threshold (= alpha unless the region is tiny). */
  expectedEc: number;
  voxels: number;
  survivorCount: number;
}

/**
 * Random-field-theory family-wise threshold (Worsley KJ et al. 1996, Hum Brain Mapp 4:58-73): the
 * mask's resel counts at the given smoothness, then the statistic value where the expected Euler
 * characteristic of the excursion set equals alpha. One-sided, positive tail. Known to be
 * conservative when the FWHM is under about 3 voxels (the field is then too rough for the
 * continuous theory); Bonferroni is then the tighter bound, see thresholdBonferroni.
 * @param map - statistic map
 * @param mask - nonzero = search region
 * @param dims - [nx, ny, nz] of the map
 * @param options - alpha, statistic kind, smoothness and voxel size
 * @returns rule 'rft-fwe', the critical value, survivors and the resels behind it
 * @throws BoldsweepError INVALID_ARGUMENT (alpha, stat, FWHM, spacing, t dof <= 3), GRID_MISMATCH, NON_FINITE_VOXELS
 * @example thresholdRft(t, mask, [64, 64, 36], { alpha: 0.05, stat: { kind: 't', dof: 190 }, fwhmMm: est.fwhmMm, spacingMm: [3, 3, 3] })
 */
export function thresholdRft(map: StatMap, mask: ArrayLike<number>, dims: readonly number[], options: RftOptions): ThresholdResult<RftDetails> {
  checkOpenUnit('alpha', options.alpha);
  checkStatisticKind(options.stat);
  const voxels = checkMapAndMask(map, mask, dims);
  const { resels, fwhmVoxels } = reselCounts(mask, dims, options.fwhmMm, options.spacingMm);
  const { threshold, expectedEc } = rftCriticalValue(resels, options.alpha, options.stat);
  const { survivors, count } = survivorsAtOrAbove(map, mask, threshold);
  return { rule: 'rft-fwe', threshold, survivors, details: { alpha: options.alpha, resels, fwhmVoxels, expectedEc, voxels, survivorCount: count } };
}
