import type { Scorecard } from '../sweep/scorecard.js';
import { summariseScorecard } from '../decide/summarise-scorecard.js';
import { settingLabel, type Setting } from '../sweep/settings-grid.js';
import { fail } from '../core/fail.js';

/** One point of a "metric vs parameter" chart. */
export interface ChartPoint {
  /** Value of the x-axis parameter. */
  x: number | string | boolean | null;
  /** Position of the setting in the grid (keeps the grid order for categorical x). */
  order: number;
  /** The other varied parameters, as a label (empty when only one is varied). */
  others: string;
  /** Planted condition label, e.g. "8 mm, 1.5 %". */
  plant: string;
  plantSizeMm: number;
  mean: number | null;
  low: number | null;
  high: number | null;
  se: number | null;
  n: number;
}

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

/**
 * Flatten a scorecard into chart points: one per setting x plant condition, with the mean of a
 * metric and its 95 % interval across repeats.
 * @param card - the scorecard
 * @param metric - column to summarise
 * @param x - varied key on the x axis. __Default value:__ the first varied key
 * @returns the points
 * @throws BoldsweepError INVALID_ARGUMENT when the metric or key is not in the scorecard
 * @example chartPoints(card, 'hitRate')
 */
export function chartPoints(card: Scorecard, metric: string, x?: string): ChartPoint[] {
  if (!card.metrics.includes(metric)) fail('INVALID_ARGUMENT', `metric "${metric}" is not a scorecard column; columns are ${card.metrics.join(', ')}`);
  const key = x ?? card.varied[0];
  if (key !== undefined && !card.varied.includes(key)) fail('INVALID_ARGUMENT', `"${key}" is not a varied parameter; varied: ${card.varied.join(', ') || '(none)'}`);
  return summariseScorecard(card).map((s) => {
    const m = s.metrics[metric];
    const rest: Setting = { ...s.setting };
    if (key !== undefined) delete rest[key];
    return {
      x: key === undefined ? 'recipe' : s.setting[key], order: s.settingIndex,
      others: Object.keys(rest).length ? settingLabel(rest) : '',
      plant: plantLabel(s.plantSizeMm, s.plantAmplitudePct), plantSizeMm: s.plantSizeMm,
      mean: finiteOrNull(m.mean), low: finiteOrNull(m.low), high: finiteOrNull(m.high), se: finiteOrNull(m.se), n: m.n,
    };
  });
}

/**
 * Label of a plant condition.
 * @param sizeMm - blob size (0 = nothing planted)
 * @param amplitudePct - amplitude
 * @returns e.g. "8 mm, 1.5 %" or "nothing planted"
 * @example plantLabel(8, 1.5) // "8 mm, 1.5 %"
 */
export function plantLabel(sizeMm: number, amplitudePct: number): string {
  return sizeMm > 0 ? `${sizeMm} mm, ${amplitudePct} %` : 'nothing planted';
}
