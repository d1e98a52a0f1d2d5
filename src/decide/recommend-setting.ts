import { fail } from '../core/fail.js';
import type { MeanInterval } from './confidence.js';
import type { Scorecard } from '../sweep/scorecard.js';
import type { Setting } from '../sweep/settings-grid.js';
import { parameterName, settingText } from '../sweep/settings-grid.js';
import { summariseScorecard, type SettingSummary } from './summarise-scorecard.js';
import { EDGE_FRACTION, metricBounds } from './metric-bounds.js';

/** Options of {@link recommendSetting}. */
export interface RecommendOptions {
  /** Detection metric to maximise (a scorecard column). __Default value:__ 'hitRate' */
  metric?: string;
  /** Which end of the parameter range counts as simpler when settings are equally good. __Default value:__ 'smallest' */
  prefer?: 'smallest' | 'largest';
  /** Planted size (mm) the choice is made for. __Default value:__ the median planted size */
  targetSizeMm?: number;
  /** Planted amplitude (%) the choice is made for. __Default value:__ the median planted amplitude */
  targetAmplitudePct?: number;
  /** Threshold rule the detections were called with, as text for the rule statement. */
  thresholdText?: string;
  /**
   * The varied steps' own simplicity order of a setting (lower = simpler, one number per varied
   * key, compared in key order; see StepDefinition.simplicity). When it gives a finite number for
   * every setting, it ranks the settings instead of `prefer`, so named values (interpolation
   * kernels, slice-timing methods) are ranked by what the step calls simpler, not alphabetically.
   * __Default value:__ none (rank by `prefer`)
   */
  simplicity?: (setting: Setting) => ReadonlyArray<number | null>;
}

/** How the one-standard-error rule ranks equally good settings: the order, and its name in words. */
interface Preference {
  /** negative when a is simpler than b */
  compare: (a: Setting, b: Setting) => number;
  /** 'smallest', 'largest' or 'simplest' */
  word: string;
}

/** The evidence for one setting: mean detection and false alarms with their spread across repeats. */
export interface SettingEvidence {
  settingIndex: number;
  setting: Setting;
  label: string;
  detection: MeanInterval;
  falseClusters: MeanInterval | null;
  /** True when this setting's mean detection is within one SE of the best. */
  withinOneSe: boolean;
}

/**
 * How much a choice can be trusted: 'chosen' (one setting stands out, or the simplest of those as
 * good as the best does); 'no-detection' (the best mean is at the metric's floor: nothing planted was
 * found at any setting); 'saturated' (two or more settings at the metric's ceiling, so it cannot
 * separate them; the choice falls back to a metric that still does); 'tied' (every setting lies
 * within one standard error of the best: the sweep does not separate them).
 */
export type ChoiceStatus = 'chosen' | 'no-detection' | 'saturated' | 'tied' | 'nothing-planted';

/** The choice for one plant condition. */
export interface PlantChoice {
  plantSizeMm: number;
  plantAmplitudePct: number;
  /** How far the choice can be trusted (see {@link ChoiceStatus}). */
  status: ChoiceStatus;
  /** The metric the choice was made on: the requested one, or the fallback when it saturated. */
  metric: string;
  /** When the requested metric saturated: which metric took over and why. */
  fallback: { from: string; to: string; reason: string } | null;
  /** Settings at the requested metric's ceiling (for 'saturated'). */
  atCeiling: string[];
  /** What to change in the sweep when the status is not 'chosen' (empty for 'chosen'). */
  advice: string;
  chosen: SettingEvidence;
  best: SettingEvidence;
  /** best mean - best SE: the lowest mean detection still counted as "as good as the best". */
  cutoff: number;
  evidence: SettingEvidence[];
}

/** A recommendation with its rule, evidence and caveats. */
export interface Recommendation {
  /** Stable identifier of the rule. */
  ruleId: 'one-se-simplest';
  /** The rule in words. */
  rule: string;
  metric: string;
  prefer: 'smallest' | 'largest';
  /** The varied keys the settings differ in. */
  varied: string[];
  /** The choice for the target plant condition. */
  choice: PlantChoice;
  /** One choice per plant condition. */
  perPlant: PlantChoice[];
  /** A short paragraph: what to use and why, with numbers. */
  summary: string;
  /** What the simulation cannot know. */
  caveats: string[];
}

/**
 * Caveats that hold for every simulation-based choice. Sources: Eklund A, Nichols TE & Knutsson H
 * (2016) PNAS 113(28):7900-7905 (non-Gaussian spatial autocorrelation of real fMRI noise);
 * Handwerker DA, Ollinger JM & D'Esposito M (2004) NeuroImage 21(4):1639-1651 (HRF varies across
 * regions and people) [from memory].
 */
export const STANDING_CAVEATS: readonly string[] = [
  'Planted activations are idealised blobs (Gaussian or soft-edged spheres); real activations follow the folding of the cortex and have other shapes and sizes, so the best width for them may differ.',
  'Planted time courses follow the same haemodynamic response model that is fitted, so detection is optimistic; real responses vary in shape and delay across regions and people (Handwerker, Ollinger & D\'Esposito 2004).',
  'The noise is this run\'s own noise: any real task-related signal already in the run is counted as a false alarm, and other runs, sessions or scanners may have different noise.',
  'Real fMRI noise has spatial autocorrelation with heavier tails than a Gaussian, so random-field-theory thresholds may not hold their nominal error rate exactly (Eklund, Nichols & Knutsson 2016).',
  'Intervals describe the spread across repeated plantings in one run; they do not include the variability between runs, subjects or sites.',
  'A single-subject choice ignores what smoothing also does for group studies (tolerance of imperfect alignment between brains).',
];

function mi(s: SettingSummary, metric: string): MeanInterval | null {
  return s.metrics[metric] ?? null;
}

/**
 * Recommend a setting by the one-standard-error rule (Breiman L, Friedman JH, Olshen RA & Stone CJ
 * 1984, Classification and Regression Trees, Wadsworth; Hastie, Tibshirani & Friedman 2009, The
 * Elements of Statistical Learning, 2nd ed., sec. 7.10): among the settings whose mean detection is
 * within one standard error of the best mean, take the simplest (the smallest value of the varied
 * parameter by default; for several varied keys, the first in grid order after sorting).
 * Detections were called under the sweep's threshold rule, so the choice holds at that false-alarm control.
 * @param card - the scorecard
 * @param options - metric, preference, target plant condition
 * @returns the recommendation with its evidence and caveats
 * @throws BoldsweepError INVALID_ARGUMENT when the metric is not in the scorecard or has no values
 * @example const rec = recommendSetting(card, { metric: 'hitRate' }); console.log(rec.summary)
 */
export function recommendSetting(card: Scorecard, options: RecommendOptions = {}): Recommendation {
  const metric = options.metric ?? 'hitRate';
  const prefer = options.prefer ?? 'smallest';
  if (!card.metrics.includes(metric)) fail('INVALID_ARGUMENT', `metric "${metric}" is not a scorecard column; columns are ${card.metrics.join(', ')}`);
  const summaries = summariseScorecard(card);
  const pref = preference(card.varied, summaries.map((s) => s.setting), prefer, options.simplicity);
  const conditions = uniquePairs(summaries);
  const fallbackMetric = FALLBACK_METRICS.find((m) => m !== metric && card.metrics.includes(m)) ?? null;
  const perPlant = conditions.map(([size, amp]) => decide(summaries.filter((s) => s.plantSizeMm === size && s.plantAmplitudePct === amp), card.varied, metric, pref, fallbackMetric));
  const sizes = [...new Set(conditions.map((c) => c[0]))];
  const amps = [...new Set(conditions.map((c) => c[1]))];
  const targetSize = options.targetSizeMm ?? sizes[(sizes.length - 1) >> 1];
  const targetAmp = options.targetAmplitudePct ?? amps[(amps.length - 1) >> 1];
  const choice = perPlant.find((p) => p.plantSizeMm === targetSize && p.plantAmplitudePct === targetAmp);
  if (!choice) fail('INVALID_ARGUMENT', `no plant condition of size ${targetSize} mm and amplitude ${targetAmp} % in the scorecard; sizes are ${sizes.join(', ')} mm`);
  const thr = options.thresholdText ? ` with detections called at ${options.thresholdText}` : '';
  const rule = `Among the settings whose mean ${metricWords(metric)} across repeats${thr} lies within one standard error of the best mean, choose the ${pref.word} ${card.varied.map(parameterName).join(' and ') || 'recipe'} (the one-standard-error rule: prefer the simpler setting when the difference is within noise).`;
  return { ruleId: 'one-se-simplest', rule, metric, prefer, varied: [...card.varied], choice, perPlant, summary: summaryText(choice, metric, card.varied, pref.word), caveats: [...STANDING_CAVEATS] };
}

/** The ranking of equally good settings: by the steps' simplicity order when it covers every setting, else by value. */
function preference(varied: string[], settings: Setting[], prefer: 'smallest' | 'largest', simplicity: RecommendOptions['simplicity']): Preference {
  const byValue: Preference = { compare: (a, b) => compareSettings(a, b, varied) * (prefer === 'smallest' ? 1 : -1), word: prefer };
  if (!simplicity || varied.length === 0) return byValue;
  const ranks = new Map<string, number[]>();
  for (const setting of settings) {
    let r: ReadonlyArray<number | null>;
    try { r = simplicity(setting); } catch { return byValue; }
    if (r.length !== varied.length || r.some((x) => x === null || !Number.isFinite(x))) return byValue;
    ranks.set(JSON.stringify(setting), r as number[]);
  }
  // a simplicity order that agrees with the value order says nothing new; keep the plainer word
  const compare = (a: Setting, b: Setting): number => {
    const x = ranks.get(JSON.stringify(a)), y = ranks.get(JSON.stringify(b));
    if (!x || !y) return byValue.compare(a, b);
    for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return x[i] - y[i];
    return byValue.compare(a, b);
  };
  const agrees = settings.every((a) => settings.every((b) => Math.sign(compare(a, b)) === Math.sign(byValue.compare(a, b))));
  return agrees ? byValue : { compare, word: 'simplest' };
}

function uniquePairs(summaries: SettingSummary[]): Array<[number, number]> {
  const seen = new Map<string, [number, number]>();
  for (const s of summaries) seen.set(`${s.plantSizeMm}/${s.plantAmplitudePct}`, [s.plantSizeMm, s.plantAmplitudePct]);
  return [...seen.values()];
}

function compareSettings(a: Setting, b: Setting, keys: string[]): number {
  for (const k of keys) {
    const x = a[k], y = b[k];
    if (x === y) continue;
    if (typeof x === 'number' && typeof y === 'number') return x - y;
    return String(x) < String(y) ? -1 : 1;
  }
  return 0;
}

/**
 * Metrics a saturated choice falls back to, in order: the mean statistic at the planted centres keeps
 * growing with the matched filter's gain after every planted voxel is detected, and peaks where the
 * kernel matches the blob (Rosenfeld A & Kak AC 1982, Digital Picture Processing, 2nd ed., vol. 2,
 * Academic Press, ch. 9).
 */
const FALLBACK_METRICS = ['centreStatisticMean'];

/** The one-SE choice, then its status: floor, ceiling (with the fallback metric) or tie. */
function decide(rows: SettingSummary[], varied: string[], metric: string, prefer: Preference, fallbackMetric: string | null): PlantChoice {
  if (!rows.some((r) => Number.isFinite(r.metrics[metric]?.mean))) return nullSweepChoice(rows, varied, metric);
  const first = choose(rows, varied, metric, prefer);
  const bounds = metricBounds(metric);
  const finiteEv = first.evidence.filter((e) => Number.isFinite(e.detection.mean));
  const amp = `${first.plantAmplitudePct} %`;
  if (bounds) {
    const edge = EDGE_FRACTION * (bounds.ceiling - bounds.floor);
    if (first.best.detection.mean <= bounds.floor + edge) {
      return { ...first, status: 'no-detection', advice: `Nothing planted was detected at any setting (best mean ${metricWords(metric)} ${fmt(first.best.detection.mean)}), so the sweep cannot rank the settings. Plant a larger amplitude (now ${amp}) or larger blobs; check that the events match the task (the planted time course follows them); drop or censor volumes the look flags; or use a less strict threshold rule.` };
    }
    const atCeiling = finiteEv.filter((e) => e.detection.mean >= bounds.ceiling - edge);
    if (atCeiling.length >= 2) {
      const labels = atCeiling.map((e) => e.label);
      const reason = `${labels.length} settings (${labels.join(', ')}) reach the ceiling of the ${metricWords(metric)}, which therefore cannot separate them`;
      const fb = fallbackMetric && rows.some((r) => Number.isFinite(r.metrics[fallbackMetric]?.mean)) ? choose(rows, varied, fallbackMetric, prefer) : null;
      const base = fb ?? first;
      return { ...base, status: 'saturated', atCeiling: labels, fallback: fb ? { from: metric, to: fallbackMetric!, reason } : null, advice: `Detection is at its ceiling: ${reason}. Plant a smaller amplitude (now ${amp}) or smaller blobs so the ${metricWords(metric)} can tell the settings apart.` };
    }
  }
  if (finiteEv.length > 1 && finiteEv.every((e) => e.withinOneSe)) {
    return { ...first, status: 'tied', advice: `No setting separates from the others: every mean ${metricWords(metric)} lies within one standard error of the best. Add repeats (now ${first.best.detection.n}) to narrow the intervals, or plant an amplitude (now ${amp}) where detection is neither rare nor certain.` };
  }
  return first;
}

/**
 * A sweep that planted nothing measures false alarms only: no detection metric can rank its settings,
 * so there is no choice; the evidence lists each setting's false clusters per run.
 */
function nullSweepChoice(rows: SettingSummary[], varied: string[], metric: string): PlantChoice {
  const evidence: SettingEvidence[] = rows.map((s) => ({
    settingIndex: s.settingIndex, setting: s.setting, label: settingText(s.setting),
    detection: mi(s, metric)!, falseClusters: mi(s, 'falseClusters'), withinOneSe: false,
  })).sort((a, b) => compareSettings(a.setting, b.setting, varied));
  const list = evidence.map((e) => `${e.label}: ${e.falseClusters ? fmt(e.falseClusters.mean, 2) : 'n/a'}`).join('; ');
  return {
    plantSizeMm: rows[0].plantSizeMm, plantAmplitudePct: rows[0].plantAmplitudePct, status: 'nothing-planted', metric, fallback: null, atCeiling: [],
    advice: `Nothing was planted (a null sweep), so the sweep measures false alarms, not detection: false clusters per run ${list}. Compare them (and the family-wise error column of the scorecard) with the threshold's nominal rate; to choose a setting by detection, plant activations (plant.count above 0).`,
    chosen: evidence[0], best: evidence[0], cutoff: NaN, evidence,
  };
}

function choose(rows: SettingSummary[], varied: string[], metric: string, prefer: Preference): PlantChoice {
  const evidence: SettingEvidence[] = rows.map((s) => ({
    settingIndex: s.settingIndex, setting: s.setting, label: settingText(s.setting),
    detection: mi(s, metric)!, falseClusters: mi(s, 'falseClusters'), withinOneSe: false,
  }));
  const finite = evidence.filter((e) => Number.isFinite(e.detection.mean));
  if (finite.length === 0) fail('INVALID_ARGUMENT', `metric "${metric}" has no finite values (was anything planted?)`);
  const best = finite.reduce((b, e) => (e.detection.mean > b.detection.mean ? e : b));
  // with one repeat the SE is undefined; then only settings equal to the best qualify
  const cutoff = best.detection.mean - (Number.isFinite(best.detection.se) ? best.detection.se : 0);
  for (const e of finite) e.withinOneSe = e.detection.mean >= cutoff;
  const order = [...finite].filter((e) => e.withinOneSe).sort((a, b) => prefer.compare(a.setting, b.setting));
  return { plantSizeMm: rows[0].plantSizeMm, plantAmplitudePct: rows[0].plantAmplitudePct, status: 'chosen', metric, fallback: null, atCeiling: [], advice: '', chosen: order[0], best, cutoff, evidence: evidence.sort((a, b) => compareSettings(a.setting, b.setting, varied)) };
}

/** Metric names in words, for sentences. */
const METRIC_WORDS: Record<string, string> = {
  hitRate: 'hit rate (fraction of planted voxels detected)',
  blobHitRate: 'fraction of planted blobs detected',
  rocAuc: 'ROC area',
  dice: 'Dice overlap',
  centreStatisticMean: 'statistic at the planted centres',
};

/**
 * A metric column in words.
 * @param metric - column name
 * @returns e.g. 'hit rate (fraction of planted voxels detected)'
 * @example metricWords('rocAuc') // 'ROC area'
 */
export function metricWords(metric: string): string {
  return METRIC_WORDS[metric] ?? metric;
}

function fmt(x: number, digits = 3): string {
  return Number.isFinite(x) ? x.toFixed(digits) : 'n/a';
}

/**
 * The summary of a choice in words. Only a 'chosen' status reads "Use ..."; the others say what the
 * sweep shows and what to change.
 */
function summaryText(c: PlantChoice, requested: string, varied: string[], prefer: string): string {
  const what = varied.length ? c.chosen.label : 'the fixed recipe';
  const d = c.chosen.detection;
  const b = c.best.detection;
  const fa = c.chosen.falseClusters;
  const plant = c.plantSizeMm > 0 ? `planted activations of ${c.plantSizeMm} mm at ${c.plantAmplitudePct} %` : 'no planted activations';
  // the interval within the metric's possible range (a t-interval of a rate can pass 0 or 1)
  const bounds = metricBounds(c.metric);
  const lowCut = bounds ? Math.max(bounds.floor === 0.5 ? 0 : bounds.floor, d.low) : d.low;
  const highCut = bounds ? Math.min(bounds.ceiling, d.high) : d.high;
  const interval = Number.isFinite(d.low) && d.high > d.low ? ` (95 % interval ${fmt(lowCut)} to ${fmt(highCut)}, n = ${d.n})` : ` (n = ${d.n}${d.n > 1 ? ', the same in every repeat' : ''})`;
  const qualifying = c.evidence.filter((e) => e.withinOneSe).length;
  const why = qualifying === 1
    ? 'no other setting comes within one standard error of it'
    : c.chosen === c.best
      ? `every setting at or above ${fmt(c.cutoff)} counts as equally good, and the best is also the ${prefer} of them`
      : `every setting at or above ${fmt(c.cutoff)} counts as equally good, and the ${prefer} of them is chosen`;
  const falseText = fa ? ` False clusters per run at this setting: ${fmt(fa.mean, 2)} on average.` : '';
  switch (c.status) {
    case 'nothing-planted':
      return `No choice: ${c.advice}`;
    case 'no-detection':
      return `No choice: for ${plant}, no setting detected the planted activations (best mean ${metricWords(requested)} ${fmt(b.mean)}, at ${c.best.label}). ${c.advice}`;
    case 'saturated':
      return c.fallback
        ? `No choice by ${metricWords(requested)}: for ${plant}, ${c.fallback.reason}. By the ${metricWords(c.metric)}, which still separates them, the best setting is ${c.best.label} (${fmt(b.mean, 2)}) and the one-standard-error rule picks ${what} (${fmt(d.mean, 2)}). ${c.advice}`
        : `No choice: for ${plant}, ${c.atCeiling.length} settings reach the ceiling of the ${metricWords(requested)}. ${c.advice}`;
    case 'tied':
      return `No clear choice: for ${plant}, the settings do not separate (best ${c.best.label} at ${fmt(b.mean)}, SE ${fmt(b.se)}; every setting at or above ${fmt(c.cutoff)}). The ${prefer} setting, ${what}, is as good as any here. ${c.advice}`;
    default:
      return `Use ${what}. For ${plant}, its mean ${metricWords(c.metric)} was ${fmt(d.mean)}${interval}; `
        + `the best setting, ${c.best.label}, reached ${fmt(b.mean)} (SE ${fmt(b.se)}), so ${why}.${falseText}`;
  }
}
