import { meanInterval, type MeanInterval } from './confidence.js';
import { rowSetting, type Scorecard, type ScorecardRow } from '../sweep/scorecard.js';
import type { Setting } from '../sweep/settings-grid.js';

/** Summary of one setting for one plant condition, across its repeats. */
export interface SettingSummary {
  settingIndex: number;
  setting: Setting;
  plantSizeMm: number;
  plantAmplitudePct: number;
  /** Repeats summarised. */
  repeats: number;
  /** Metric -> mean with t-based interval across repeats. */
  metrics: Record<string, MeanInterval>;
  /** Median seconds per cell (NaN when timings are unknown). */
  medianSeconds: number;
}

/**
 * Summarise a scorecard per setting and plant condition: mean, SD, SE and t-based 95 % interval
 * of every metric across repeats.
 * @param card - the scorecard
 * @param level - interval coverage. __Default value:__ 0.95
 * @returns one summary per setting x plant condition, ordered by plant condition then setting
 * @example summariseScorecard(card).map((s) => s.metrics.hitRate.mean)
 */
export function summariseScorecard(card: Scorecard, level = 0.95): SettingSummary[] {
  const groups = new Map<string, { rows: ScorecardRow[]; seconds: number[] }>();
  card.rows.forEach((row, i) => {
    const key = `${row.plantSizeMm}\u0000${row.plantAmplitudePct}\u0000${row.settingIndex}`;
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { rows: [], seconds: [] }));
    g.rows.push(row);
    g.seconds.push(card.seconds[i]);
  });
  const out: SettingSummary[] = [];
  for (const { rows, seconds } of groups.values()) {
    const first = rows[0];
    const metrics: Record<string, MeanInterval> = {};
    for (const m of card.metrics) metrics[m] = meanInterval(rows.map((r) => (typeof r[m] === 'number' ? (r[m] as number) : typeof r[m] === 'boolean' ? Number(r[m]) : null)), level);
    out.push({
      settingIndex: first.settingIndex as number, setting: rowSetting(card, first),
      plantSizeMm: first.plantSizeMm as number, plantAmplitudePct: first.plantAmplitudePct as number,
      repeats: rows.length, metrics, medianSeconds: median(seconds.filter(Number.isFinite)),
    });
  }
  return out.sort((a, b) => a.plantSizeMm - b.plantSizeMm || a.plantAmplitudePct - b.plantAmplitudePct || a.settingIndex - b.settingIndex);
}

function median(xs: number[]): number {
  if (xs.length === 0) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : (s[h - 1] + s[h]) / 2;
}
