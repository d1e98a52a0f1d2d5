import { fail } from '../core/fail.js';
import type { MotionParameters } from './framewise-displacement.js';

/** How many motion regressors a model takes: none, the 6 parameters, 12 or the 24 of Friston et al. (1996). */
export type MotionRegressorCount = 0 | 6 | 12 | 24;

/** The counts {@link motionExpansion} accepts. */
export const MOTION_REGRESSOR_COUNTS: readonly MotionRegressorCount[] = [0, 6, 12, 24];

const PARAMETERS = ['shiftXMm', 'shiftYMm', 'shiftZMm', 'rotXDeg', 'rotYDeg', 'rotZDeg'] as const;

/** Named columns, one value per volume, in the order listed. */
export interface MotionColumns {
  names: string[];
  columns: Float64Array[];
}

/**
 * The motion table expanded into regressor columns, as defined (no centring; see `motionRegressors`
 * for what enters a design). With p(t) the six parameters at volume t (shifts mm, rotations degrees,
 * as in the table: relative to the head's reference position):
 * - 6: p(t);
 * - 12: p(t) and its backward difference p(t) - p(t-1), 0 at the first volume (the movement since the
 *   volume before, as framewise displacement measures it);
 * - 24 (Friston et al. 1996, Magn Reson Med 35:346-355): p(t), p(t-1), p(t)^2 and p(t-1)^2, with
 *   p(-1) taken as p(0): the head's position before the run is unknown, and repeating the first row
 *   adds no step that did not happen (a zero would add one of the size of the first row).
 * The 12 span the same space as the first 12 of the 24 (p(t) - p(t-1) is their difference).
 * Column names: `motion_<parameter>` for p(t), then `_diff`, `_lag1`, `_sq`, `_lag1_sq`.
 * @param table - one row per volume (not modified)
 * @param count - 0, 6, 12 or 24
 * @returns the columns: for 24, the 6 parameters, then their lags, then the squares of both
 * @throws BoldsweepError INVALID_ARGUMENT for another count
 * @example motionExpansion(table, 24).names[6] // 'motion_shiftXMm_lag1'
 */
export function motionExpansion(table: readonly MotionParameters[], count: MotionRegressorCount): MotionColumns {
  if (!MOTION_REGRESSOR_COUNTS.includes(count)) fail('INVALID_ARGUMENT', `motion regressors must be 0, 6, 12 or 24, got ${String(count)}`);
  const nt = table.length;
  const names: string[] = [];
  const columns: Float64Array[] = [];
  if (count === 0) return { names, columns };
  const now = PARAMETERS.map((p) => Float64Array.from(table, (row) => row[p]));
  const lag = now.map((c) => Float64Array.from({ length: nt }, (_, t) => c[t === 0 ? 0 : t - 1]));
  const add = (suffix: string, cols: Float64Array[]) => cols.forEach((c, j) => { names.push(`motion_${PARAMETERS[j]}${suffix}`); columns.push(c); });
  add('', now);
  if (count === 12) add('_diff', now.map((c, j) => c.map((x, t) => x - lag[j][t])));
  if (count === 24) {
    add('_lag1', lag);
    add('_sq', now.map((c) => c.map((x) => x * x)));
    add('_lag1_sq', lag.map((c) => c.map((x) => x * x)));
  }
  return { names, columns };
}
