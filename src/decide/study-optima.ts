import { createRng } from '../core/random.js';
import type { Scorecard, ScorecardRow } from '../sweep/scorecard.js';
import { curvePeak } from './curve-peak.js';
import { EDGE_FRACTION, metricBounds } from './metric-bounds.js';

/** An optimum width with its bootstrap interval. */
export interface OptimumEstimate {
  /** Peak of the mean curve (mm, or the varied key's unit); NaN when the curve is flat or at the metric's floor. */
  value: number;
  /** 95 % percentile bootstrap interval over repeats [low, high] (NaN when undefined). */
  low: number;
  high: number;
}

/** One misregistration level of a study: the group curve, its optimum and how far it lies from the single-run optimum. */
export interface StudyLevelOptimum {
  levelMm: number;
  /** Mean group detection per width (same order as `widths`). */
  curve: number[];
  /** The group map detected nothing at any width (the curve's best mean within EDGE_FRACTION of the metric's floor): no optimum. */
  noDetection: boolean;
  optimum: OptimumEstimate;
  /** Group optimum minus single-run optimum, paired over repeats. */
  widerBy: OptimumEstimate;
}

/** The single-run and group optima of a study sweep, side by side. */
export interface StudyOptima {
  /** The varied width key (e.g. smooth.fwhmMm) and its values, ascending. */
  key: string;
  widths: number[];
  /** Group metric and its single-run counterpart. */
  metric: string;
  firstLevelMetric: string;
  plantSizeMm: number;
  plantAmplitudePct: number;
  repeats: number;
  /** The first subject's own run scored as a single run: mean over levels and repeats per width. */
  singleRun: { curve: number[]; optimum: OptimumEstimate; noDetection: boolean };
  levels: StudyLevelOptimum[];
  resamples: number;
}

/** Options of {@link studyOptima}. */
export interface StudyOptimaOptions {
  /** Group detection metric. __Default value:__ 'hitRate' */
  metric?: string;
  /** Varied key of the width. __Default value:__ the first varied key that is not the study's */
  key?: string;
  /** Plant condition. __Default value:__ the first in the scorecard */
  plantSizeMm?: number;
  plantAmplitudePct?: number;
  /** Bootstrap resamples. __Default value:__ 2000 */
  resamples?: number;
  /** Seed of the resampling. __Default value:__ 1 */
  seed?: number;
}

const LEVEL_KEY = 'study.misregistrationMm';

/**
 * The optimum width of a study sweep for the single-run question (the first subject's own run against
 * its own blobs) and for the group question at each misregistration level (the group map against the
 * group's blobs), each the peak of the mean detection curve over widths (three-point parabola,
 * {@link curvePeak}), with 95 % percentile bootstrap intervals over repeats (Efron B 1979, Ann Stat
 * 7:1-26): repeats are resampled with replacement, the same ones for every width and level (the
 * levels of a repeat share its seeds), so the difference between the group and single-run optima is
 * a paired estimate. A curve whose best mean lies at the metric's floor (nothing detected at any
 * width, EDGE_FRACTION of the range) has no optimum (NaN, `noDetection`). With few repeats the
 * bootstrap intervals are too narrow to trust (resampling 2 repeats gives 3 distinct curves).
 * @param card - a study sweep's scorecard (with the firstLevel columns)
 * @param options - metric, width key, plant condition, resamples, seed
 * @returns the curves, optima and differences; null when the scorecard is not a study's or has no numeric width
 * @example const o = studyOptima(result.scorecard); o?.levels.map((l) => l.widerBy.value)
 */
export function studyOptima(card: Scorecard, options: StudyOptimaOptions = {}): StudyOptima | null {
  const metric = options.metric ?? 'hitRate';
  const firstLevelMetric = `firstLevel${metric.charAt(0).toUpperCase()}${metric.slice(1)}`;
  if (!card.metrics.includes(firstLevelMetric) || !card.metrics.includes(metric)) return null;
  const key = options.key ?? card.varied.find((k) => k !== LEVEL_KEY);
  if (!key) return null;
  const first = card.rows[0];
  if (!first) return null;
  const size = options.plantSizeMm ?? (first.plantSizeMm as number);
  const amp = options.plantAmplitudePct ?? (first.plantAmplitudePct as number);
  const rows = card.rows.filter((r) => r.plantSizeMm === size && r.plantAmplitudePct === amp);
  const widths = [...new Set(rows.map((r) => r[key]))].filter((v): v is number => typeof v === 'number').sort((a, b) => a - b);
  if (widths.length < 2) return null;
  const levels = card.varied.includes(LEVEL_KEY) ? [...new Set(rows.map((r) => r[LEVEL_KEY] as number))] : [null];
  const repeats = [...new Set(rows.map((r) => r.repeat as number))].sort((a, b) => a - b);
  // value[level][width][repeat] of the group metric, and of the first-level metric
  const cube = (col: string) => levels.map((lv) => widths.map((w) => repeats.map((rep) => value(rows.find((r) => r[key] === w && r.repeat === rep && (lv === null || r[LEVEL_KEY] === lv)), col))));
  const group = cube(metric);
  const single = cube(firstLevelMetric);
  const singleCurveOf = (pick: number[]) => widths.map((_, wi) => mean(levels.flatMap((_, li) => pick.map((ri) => single[li][wi][ri]))));
  const groupCurveOf = (li: number, pick: number[]) => widths.map((_, wi) => mean(pick.map((ri) => group[li][wi][ri])));
  const all = repeats.map((_, i) => i);
  // a curve at the metric's floor everywhere has no optimum (its peak would be noise)
  const bounds = metricBounds(metric);
  const atFloor = (curve: number[]) => bounds !== null && !(Math.max(...curve.filter(Number.isFinite)) > bounds.floor + EDGE_FRACTION * (bounds.ceiling - bounds.floor));
  const peak = (curve: number[]) => (atFloor(curve) ? NaN : curvePeak(widths, curve));
  const singleNone = atFloor(singleCurveOf(all));
  const groupNone = levels.map((_, li) => atFloor(groupCurveOf(li, all)));
  const singlePeak = peak(singleCurveOf(all));
  const groupPeaks = levels.map((_, li) => peak(groupCurveOf(li, all)));
  const resamples = options.resamples ?? 2000;
  const rng = createRng(options.seed ?? 1);
  const bootSingle: number[] = [];
  const bootGroup: number[][] = levels.map(() => []);
  const bootDiff: number[][] = levels.map(() => []);
  for (let b = 0; b < resamples; b++) {
    const pick = all.map(() => rng.int(all.length));
    const s = singleNone ? NaN : curvePeak(widths, singleCurveOf(pick));
    bootSingle.push(s);
    levels.forEach((_, li) => {
      const g = groupNone[li] ? NaN : curvePeak(widths, groupCurveOf(li, pick));
      bootGroup[li].push(g);
      bootDiff[li].push(g - s);
    });
  }
  return {
    key, widths, metric, firstLevelMetric, plantSizeMm: size, plantAmplitudePct: amp, repeats: repeats.length, resamples,
    singleRun: { curve: singleCurveOf(all), optimum: { value: singlePeak, ...percentiles(bootSingle) }, noDetection: singleNone },
    levels: levels.map((lv, li) => ({
      levelMm: lv ?? 0, curve: groupCurveOf(li, all), noDetection: groupNone[li],
      optimum: { value: groupPeaks[li], ...percentiles(bootGroup[li]) },
      widerBy: { value: groupPeaks[li] - singlePeak, ...percentiles(bootDiff[li]) },
    })),
  };
}

function value(row: ScorecardRow | undefined, col: string): number {
  const v = row?.[col];
  return typeof v === 'number' ? v : NaN;
}

function mean(xs: number[]): number {
  const f = xs.filter(Number.isFinite);
  return f.length ? f.reduce((s, x) => s + x, 0) / f.length : NaN;
}

/** 2.5th and 97.5th percentiles (linear between order statistics) of the finite values. */
function percentiles(xs: number[]): { low: number; high: number } {
  const f = xs.filter(Number.isFinite).sort((a, b) => a - b);
  if (f.length < 2) return { low: NaN, high: NaN };
  const at = (p: number) => { const h = (f.length - 1) * p; const lo = Math.floor(h); return f[lo] + (f[Math.min(lo + 1, f.length - 1)] - f[lo]) * (h - lo); };
  return { low: at(0.025), high: at(0.975) };
}
