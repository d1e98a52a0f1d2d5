import { fail } from '../core/fail.js';
import type { Scorecard } from '../sweep/scorecard.js';
import { parameterName, parameterUnit, settingText, type Setting } from '../sweep/settings-grid.js';
import { meanInterval, type MeanInterval } from './confidence.js';
import { metricWords } from './recommend-setting.js';

/** One value of the compared parameter, at one setting of the other varied parameters. */
export interface TradeoffEntry {
  value: number | string | boolean | null;
  /** Detection metric across every repeat and plant condition of this value. */
  detection: MeanInterval;
  /** Blur metric (residual smoothness FWHM, mm, by default) across the same cells. */
  blur: MeanInterval;
}

/** The comparison at one setting of the other varied parameters. */
export interface TradeoffGroup {
  /** The other varied parameters' values ({} when only the compared one varies). */
  others: Setting;
  entries: TradeoffEntry[];
  /** Value with the highest mean detection, and the one with the lowest mean blur. */
  detectsBest: TradeoffEntry;
  blursLeast: TradeoffEntry;
  /** One sentence with the numbers. */
  text: string;
}

/** Options of {@link parameterTradeoff}. */
export interface TradeoffOptions {
  /** Detection metric (higher is better). __Default value:__ 'hitRate' */
  metric?: string;
  /** Blur metric (lower is less blur). __Default value:__ 'smoothnessFwhmMm' (residual smoothness) */
  blurMetric?: string;
}

const fmt = (x: number, digits: number): string => (Number.isFinite(x) ? x.toFixed(digits) : 'n/a');

/**
 * Which value of one varied parameter detects best and which blurs least, at each setting of the
 * other varied parameters (e.g. which interpolation kernel, at each target voxel size): means across
 * repeats and plant conditions, with their standard errors. Ties go to the first value in the sweep's
 * order.
 * @param card - the scorecard
 * @param key - the varied key to compare, e.g. 'resample.kernel'
 * @param options - detection and blur metrics
 * @returns one group per setting of the other varied keys, in the sweep's order
 * @throws BoldsweepError INVALID_ARGUMENT when the key is not varied or a metric is not a column
 * @example parameterTradeoff(card, 'resample.kernel').map((g) => g.text)
 */
export function parameterTradeoff(card: Scorecard, key: string, options: TradeoffOptions = {}): TradeoffGroup[] {
  const metric = options.metric ?? 'hitRate';
  const blurMetric = options.blurMetric ?? 'smoothnessFwhmMm';
  if (!card.varied.includes(key)) fail('INVALID_ARGUMENT', `"${key}" is not varied in this sweep; varied: ${card.varied.join(', ') || '(none)'}`);
  for (const m of [metric, blurMetric]) if (!card.metrics.includes(m)) fail('INVALID_ARGUMENT', `metric "${m}" is not a scorecard column; columns are ${card.metrics.join(', ')}`);
  const others = card.varied.filter((k) => k !== key);
  const groups = new Map<string, { others: Setting; values: Map<string, { value: TradeoffEntry['value']; det: Array<number | null>; blur: Array<number | null> }> }>();
  const num = (x: unknown): number | null => (typeof x === 'number' ? x : null);
  for (const row of card.rows) {
    const o: Setting = Object.fromEntries(others.map((k) => [k, row[k] ?? null]));
    const gk = JSON.stringify(others.map((k) => row[k]));
    let g = groups.get(gk);
    if (!g) groups.set(gk, (g = { others: o, values: new Map() }));
    const vk = JSON.stringify(row[key]);
    let v = g.values.get(vk);
    if (!v) g.values.set(vk, (v = { value: row[key] ?? null, det: [], blur: [] }));
    v.det.push(num(row[metric]));
    v.blur.push(num(row[blurMetric]));
  }
  const unit = parameterUnit(key);
  const show = (v: TradeoffEntry['value']) => `${v}${unit ? ` ${unit}` : ''}`;
  return [...groups.values()].map((g) => {
    const entries: TradeoffEntry[] = [...g.values.values()].map((v) => ({ value: v.value, detection: meanInterval(v.det), blur: meanInterval(v.blur) }));
    let best = entries[0], least = entries[0];
    for (const e of entries) {
      if (e.detection.mean > best.detection.mean || !Number.isFinite(best.detection.mean)) best = e;
      if (e.blur.mean < least.blur.mean || !Number.isFinite(least.blur.mean)) least = e;
    }
    const at = others.length ? `At ${settingText(g.others)}, of` : 'Of';
    const detList = entries.map((e) => `${show(e.value)} ${fmt(e.detection.mean, 3)} (SE ${fmt(e.detection.se, 3)})`).join(', ');
    const blurList = entries.map((e) => `${show(e.value)} ${fmt(e.blur.mean, 2)}`).join(', ');
    const blurWords = blurMetric === 'smoothnessFwhmMm' ? 'residual smoothness FWHM (mm)' : blurMetric;
    const text = `${at} the ${parameterName(key)} values, ${show(best.value)} detects best and ${show(least.value)} blurs least: mean ${metricWords(metric)} ${detList}; ${blurWords} ${blurList}.`;
    return { others: g.others, entries, detectsBest: best, blursLeast: least, text };
  });
}
