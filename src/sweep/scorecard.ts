import type { Setting } from './settings-grid.js';

/** A cell of a scorecard: numbers, labels or flags; null when a metric is undefined (written "n/a"). */
export type ScorecardValue = number | string | boolean | null;

/** One row of a scorecard: one setting x plant condition x repeat. */
export type ScorecardRow = Record<string, ScorecardValue>;

/**
 * The tidy result of a sweep. `rows` are ordered by `cell` (the cell's index in the full plan), so the
 * same spec and seed always give the same table, whatever the number of workers or shards.
 * Time taken is kept apart in `seconds` because a clock is never reproducible.
 */
export interface Scorecard {
  /** Hash of everything that determines the scores (spec without workers, run, masks, events). */
  sweepKey: string;
  /** The varied "<step>.<param>" keys, in grid order; each is a column. */
  varied: string[];
  /** Metric columns, in order. */
  metrics: string[];
  /** One row per cell, ascending `cell`. */
  rows: ScorecardRow[];
  /** Seconds each cell took to compute (same order as rows; from the cache when it was reused). */
  seconds: number[];
}

/** Columns that identify a row, before the varied keys and the metrics. */
export const SCORECARD_ID_COLUMNS = ['cell', 'group', 'settingIndex'] as const;
/** Columns that describe the planting of a row, after the varied keys. */
export const SCORECARD_PLANT_COLUMNS = ['plantShape', 'plantSizeMm', 'plantAmplitudePct', 'plantCount', 'repeat', 'plantSeed'] as const;

/**
 * All column names of a scorecard in table order.
 * @param card - the scorecard (or its varied keys and metrics)
 * @returns id columns, varied keys, plant columns, metrics
 * @example scorecardColumns(card) // ['cell', 'group', 'settingIndex', 'smooth.fwhmMm', 'plantShape', ...]
 */
export function scorecardColumns(card: Pick<Scorecard, 'varied' | 'metrics'>): string[] {
  return [...SCORECARD_ID_COLUMNS, ...card.varied, ...SCORECARD_PLANT_COLUMNS, ...card.metrics];
}

/**
 * The setting of a row (its varied columns).
 * @param card - the scorecard
 * @param row - one of its rows
 * @returns "<step>.<param>" -> value
 * @example rowSetting(card, card.rows[0]) // { 'smooth.fwhmMm': 0 }
 */
export function rowSetting(card: Pick<Scorecard, 'varied'>, row: ScorecardRow): Setting {
  const s: Setting = {};
  for (const k of card.varied) s[k] = row[k] as Setting[string];
  return s;
}
