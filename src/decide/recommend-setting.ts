import { fail } from '../core/fail.js';
import type { MeanInterval } from './confidence.js';
import type { Scorecard } from '../sweep/scorecard.js';
import type { Setting } from '../sweep/settings-grid.js';
import { parameterName, settingText } from '../sweep/settings-grid.js';
import { summariseScorecard, type SettingSummary } from './summarise-scorecard.js';

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

/** The choice for one plant condition. */
export interface PlantChoice {
  plantSizeMm: number;
  plantAmplitudePct: number;
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
  const conditions = uniquePairs(summaries);
  const perPlant = conditions.map(([size, amp]) => choose(summaries.filter((s) => s.plantSizeMm === size && s.plantAmplitudePct === amp), card.varied, metric, prefer));
  const sizes = [...new Set(conditions.map((c) => c[0]))];
  const amps = [...new Set(conditions.map((c) => c[1]))];
  const targetSize = options.targetSizeMm ?? sizes[(sizes.length - 1) >> 1];
  const targetAmp = options.targetAmplitudePct ?? amps[(amps.length - 1) >> 1];
  const choice = perPlant.find((p) => p.plantSizeMm === targetSize && p.plantAmplitudePct === targetAmp);
  if (!choice) fail('INVALID_ARGUMENT', `no plant condition of size ${targetSize} mm and amplitude ${targetAmp} % in the scorecard; sizes are ${sizes.join(', ')} mm`);
  const thr = options.thresholdText ? ` with detections called at ${options.thresholdText}` : '';
  const rule = `Among the settings whose mean ${metricWords(metric)} across repeats${thr} lies within one standard error of the best mean, choose the ${prefer} ${card.varied.map(parameterName).join(' and ') || 'recipe'} (the one-standard-error rule: prefer the simpler setting when the difference is within noise).`;
  return { ruleId: 'one-se-simplest', rule, metric, prefer, varied: [...card.varied], choice, perPlant, summary: summaryText(choice, metric, card.varied), caveats: [...STANDING_CAVEATS] };
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

function choose(rows: SettingSummary[], varied: string[], metric: string, prefer: 'smallest' | 'largest'): PlantChoice {
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
  const order = [...finite].filter((e) => e.withinOneSe).sort((a, b) => compareSettings(a.setting, b.setting, varied) * (prefer === 'smallest' ? 1 : -1));
  return { plantSizeMm: rows[0].plantSizeMm, plantAmplitudePct: rows[0].plantAmplitudePct, chosen: order[0], best, cutoff, evidence: evidence.sort((a, b) => compareSettings(a.setting, b.setting, varied)) };
}

/** Metric names in words, for sentences. */
const METRIC_WORDS: Record<string, string> = {
  hitRate: 'hit rate (fraction of planted voxels detected)',
  blobHitRate: 'fraction of planted blobs detected',
  rocAuc: 'ROC area',
  dice: 'Dice overlap',
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

function summaryText(c: PlantChoice, metric: string, varied: string[]): string {
  const what = varied.length ? c.chosen.label : 'the fixed recipe';
  const d = c.chosen.detection;
  const b = c.best.detection;
  const fa = c.chosen.falseClusters;
  const plant = c.plantSizeMm > 0 ? `planted activations of ${c.plantSizeMm} mm at ${c.plantAmplitudePct} %` : 'no planted activations';
  return `Use ${what}. For ${plant}, its mean ${metricWords(metric)} was ${fmt(d.mean)} (95 % interval ${fmt(d.low)} to ${fmt(d.high)}, n = ${d.n}); `
    + `the best setting, ${c.best.label}, reached ${fmt(b.mean)} (SE ${fmt(b.se)}), so every setting at or above ${fmt(c.cutoff)} counts as equally good and the ${c.chosen === c.best ? 'best is also the simplest' : 'simplest of them is chosen'}.`
    + (fa ? ` False clusters per run at this setting: ${fmt(fa.mean, 2)} on average.` : '');
}
