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
  /** Value with the highest mean detection, and the one with the lowest mean blur (the first value when all are equal). */
  detectsBest: TradeoffEntry;
  blursLeast: TradeoffEntry;
  /**
   * Whether every value gives the same mean detection, and the same mean blur (e.g. every kernel
   * when nothing is resampled: at the run's own voxel size the data are copied unchanged).
   */
  same: { detection: boolean; blur: boolean };
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

/** Means that identical cells give: equal to rounding (sums in another order), or both not finite. */
function sameMean(a: number, b: number): boolean {
  if (!Number.isFinite(a) || !Number.isFinite(b)) return !Number.isFinite(a) && !Number.isFinite(b);
  return Math.abs(a - b) <= 1e-12 * Math.max(1, Math.abs(a), Math.abs(b));
}

/**
 * Which value of one varied parameter detects best and which blurs least, at each setting of the
 * other varied parameters (e.g. which interpolation kernel, at each target voxel size): means across
 * repeats and plant conditions, with their standard errors. Ties go to the first value in the sweep's
 * order. When every value gives the same mean detection and blur, the sentence says that the values do
 * not differ (and names the usual cause: the step resampled nothing, as at the run's own voxel size)
 * instead of naming a best one.
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
    const same = {
      detection: entries.every((e) => sameMean(e.detection.mean, entries[0].detection.mean)),
      blur: entries.every((e) => sameMean(e.blur.mean, entries[0].blur.mean)),
    };
    const at = others.length ? `At ${settingText(g.others)}, of` : 'Of';
    const detList = entries.map((e) => `${show(e.value)} ${fmt(e.detection.mean, 3)} (SE ${fmt(e.detection.se, 3)})`).join(', ');
    const blurList = entries.map((e) => `${show(e.value)} ${fmt(e.blur.mean, 2)}`).join(', ');
    const blurWords = blurMetric === 'smoothnessFwhmMm' ? 'residual smoothness FWHM (mm)' : blurMetric;
    const values = entries.map((e) => show(e.value)).join(', ');
    let text: string;
    if (entries.length > 1 && same.detection && same.blur) {
      const e = entries[0];
      text = `${at} the ${parameterName(key)} values (${values}), none differs from the others: each gives mean ${metricWords(metric)} ${fmt(e.detection.mean, 3)} (SE ${fmt(e.detection.se, 3)}) and ${blurWords} ${fmt(e.blur.mean, 2)}. This is what a step that moves nothing gives (say resampling at the run's own voxel size, which copies the data unchanged), so this sweep cannot tell them apart here.`;
    } else {
      const detects = entries.length > 1 && same.detection ? 'none detects better than the others' : `${show(best.value)} detects best`;
      const blurs = entries.length > 1 && same.blur ? 'none blurs less than the others' : `${show(least.value)} blurs least`;
      text = `${at} the ${parameterName(key)} values, ${detects} and ${blurs}: mean ${metricWords(metric)} ${detList}; ${blurWords} ${blurList}.`;
    }
    return { others: g.others, entries, detectsBest: best, blursLeast: least, same, text };
  });
}
