import { fail } from '../core/fail.js';
import { checkMapAndMask, checkOpenUnit, type StatMap } from './threshold-input.js';
import { survivorsAtOrAbove, type ThresholdResult } from './threshold-result.js';

/** Options of {@link thresholdCalibrated}. */
export interface CalibratedOptions {
  /** Family-wise error rate in (0, 1). */
  alpha: number;
  /** The maximum statistic over the search region of each of K null fits (designs with no true effect). */
  nullMaxima: ArrayLike<number>;
}

/** Details of a calibrated threshold. */
export interface CalibratedDetails {
  alpha: number;
  /** Number of null maxima the value comes from. */
  designs: number;
  /** Which order statistic (1 = smallest) of the maxima is the threshold. */
  rank: number;
  voxels: number;
  survivorCount: number;
}

/**
 * The fewest null maxima that give a threshold at level alpha: with K maxima the rank
 * ceil((K + 1)(1 - alpha)) must not pass K.
 * @param alpha - family-wise error rate in (0, 1)
 * @returns the smallest usable K (19 for alpha 0.05)
 * @example minimumNullDesigns(0.05) // 19
 */
export function minimumNullDesigns(alpha: number): number {
  checkOpenUnit('alpha', alpha);
  return Math.ceil((1 - alpha) / alpha - 1e-9);
}

/**
 * The family-wise critical value from K null maxima: the ceil((K + 1)(1 - alpha))-th smallest. A new null
 * map whose maximum is exchangeable with the K exceeds it with probability (K + 1 - rank) / (K + 1) <= alpha
 * (the maximum-statistic rule of Nichols TE & Holmes AP 2002, Hum Brain Mapp 15(1):1-25, counted without
 * the observed map, which here is not among the null fits).
 * @param nullMaxima - the K maxima (finite)
 * @param alpha - family-wise error rate
 * @returns the value and its rank
 * @throws BoldsweepError INVALID_ARGUMENT for alpha outside (0, 1), a non-finite maximum, or fewer maxima than minimumNullDesigns(alpha)
 * @example calibratedCriticalValue(maxima, 0.05) // with 100 maxima: the 96th smallest
 */
export function calibratedCriticalValue(nullMaxima: ArrayLike<number>, alpha: number): { threshold: number; rank: number } {
  checkOpenUnit('alpha', alpha);
  const k = nullMaxima.length;
  const need = minimumNullDesigns(alpha);
  if (k < need) fail('INVALID_ARGUMENT', `a calibrated threshold at alpha ${alpha} needs at least ${need} null maxima, got ${k}`);
  const sorted = Float64Array.from(nullMaxima).sort();
  if (!sorted.every(Number.isFinite)) fail('INVALID_ARGUMENT', 'every null maximum must be finite');
  const rank = Math.ceil((k + 1) * (1 - alpha) - 1e-9);
  return { threshold: sorted[rank - 1], rank };
}

/**
 * Family-wise threshold calibrated on the data's own noise: the critical value of the maximum statistic over
 * K null fits (calibratedCriticalValue). It holds alpha whatever the noise's spatial autocorrelation or
 * distribution, the concern of Eklund A, Nichols TE & Knutsson H (2016) PNAS 113(28):7900-7905, as far as
 * the null fits share the tested map's noise.
 * @param map - statistic map
 * @param mask - nonzero = search region
 * @param options - alpha and the null maxima
 * @returns rule 'calibrated-fwe', the critical value and survivors
 * @throws BoldsweepError INVALID_ARGUMENT (alpha, too few maxima), GRID_MISMATCH, NON_FINITE_VOXELS
 * @example thresholdCalibrated(t, mask, { alpha: 0.05, nullMaxima: maxima })
 */
export function thresholdCalibrated(map: StatMap, mask: ArrayLike<number>, options: CalibratedOptions): ThresholdResult<CalibratedDetails> {
  const voxels = checkMapAndMask(map, mask);
  const { threshold, rank } = calibratedCriticalValue(options.nullMaxima, options.alpha);
  const { survivors, count } = survivorsAtOrAbove(map, mask, threshold);
  return { rule: 'calibrated-fwe', threshold, survivors, details: { alpha: options.alpha, designs: options.nullMaxima.length, rank, voxels, survivorCount: count } };
}
