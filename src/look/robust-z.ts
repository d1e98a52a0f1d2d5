import { fail } from '../core/fail.js';
import { medianOf } from './median-of.js';

/**
 * Consistency factor that turns the median absolute deviation into an estimate of the standard
 * deviation for normal data: 1 / Phi^-1(3/4) = 1.482602... (common practice, e.g. Rousseeuw &
 * Croux 1993 J Am Stat Assoc 88:1273).
 */
export const MAD_TO_SD = 1.482602218505602;

/** Result of {@link robustZ}. */
export interface RobustZ {
  /** (x - median) / scale per value; NaN where the input is not finite. */
  z: Float64Array;
  /** Median of the finite values. */
  median: number;
  /** Robust standard deviation: 1.4826 x MAD, or the fallback below when the MAD is 0. */
  scale: number;
  /** Which estimate gave `scale`. */
  scaleFrom: 'mad' | 'mean-absolute-deviation' | 'constant';
}

/**
 * Robust z-scores: distance from the median in units of 1.4826 x MAD (median absolute deviation).
 * When more than half the values are equal the MAD is 0; then the mean absolute deviation from the
 * median times sqrt(pi/2) (its normal consistency factor) is used instead, and when that is 0 too
 * every value equals the median and all z are 0 (never a division by zero).
 * @param values - the series (NaN values are skipped and get z = NaN)
 * @param out - optional output array of the same length
 * @returns z, median and scale
 * @throws BoldsweepError TOO_FEW_VOLUMES when fewer than 3 values are finite
 * @example robustZ([10, 11, 9, 10, 30]).z[4] // large: 30 is an outlier
 */
export function robustZ(values: ArrayLike<number>, out?: Float64Array): RobustZ {
  const n = values.length;
  const z = out && out.length === n ? out : new Float64Array(n);
  let finite = 0;
  for (let i = 0; i < n; i++) if (Number.isFinite(values[i])) finite++;
  if (finite < 3) fail('TOO_FEW_VOLUMES', `a robust z-score needs at least 3 finite values, got ${finite}`);
  const median = medianOf(values);
  const dev = new Float64Array(n);
  for (let i = 0; i < n; i++) dev[i] = Math.abs(values[i] - median);
  let scale = MAD_TO_SD * medianOf(dev);
  let scaleFrom: RobustZ['scaleFrom'] = 'mad';
  if (!(scale > 0)) {
    let sum = 0;
    for (let i = 0; i < n; i++) if (Number.isFinite(dev[i])) sum += dev[i];
    scale = Math.sqrt(Math.PI / 2) * (sum / finite);
    scaleFrom = 'mean-absolute-deviation';
  }
  if (!(scale > 0)) {
    for (let i = 0; i < n; i++) z[i] = Number.isFinite(values[i]) ? 0 : NaN;
    return { z, median, scale: 0, scaleFrom: 'constant' };
  }
  for (let i = 0; i < n; i++) z[i] = (values[i] - median) / scale;
  return { z, median, scale, scaleFrom };
}
