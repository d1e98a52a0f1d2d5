import { getStep, listSteps, parseStepParams } from '../steps/registry.js';
import type { ParameterLabel } from '../steps/step-types.js';

/** One point of a sweep's grid: "<step>.<param>" -> value. */
export type Setting = Record<string, number | string | boolean | null>;

/**
 * Every combination of the varied values (a Cartesian product). The first key varies slowest, the
 * last fastest, in the order the keys were written; with nothing varied there is one empty setting.
 * @param vary - "<step>.<param>" -> candidate values
 * @returns the settings, in a stable order
 * @example settingsGrid({ 'smooth.fwhmMm': [0, 4], 'model.ar1': [true, false] }).length // 4
 */
export function settingsGrid(vary: Record<string, ReadonlyArray<number | string | boolean | null>>): Setting[] {
  let out: Setting[] = [{}];
  for (const [key, values] of Object.entries(vary)) {
    const next: Setting[] = [];
    for (const s of out) for (const v of values) next.push({ ...s, [key]: v });
    out = next;
  }
  return out;
}

/**
 * A short label for a setting, for tables and chart legends.
 * @param s - the setting
 * @returns e.g. "smooth.fwhmMm=6, model.ar1=true" ("(fixed recipe)" when nothing varies)
 * @example settingLabel({ 'smooth.fwhmMm': 6 }) // "smooth.fwhmMm=6"
 */
export function settingLabel(s: Setting): string {
  const parts = Object.entries(s).map(([k, v]) => `${k}=${v}`);
  return parts.length ? parts.join(', ') : '(fixed recipe)';
}

/**
 * Words and units of the model options a sweep may vary (the steps keep theirs in their definitions:
 * StepDefinition.labels). Options not listed are spelled out from their key.
 */
const MODEL_LABELS: Record<string, ParameterLabel> = {
  'model.ar1': { name: 'AR(1) noise model', unit: '' },
  'model.ar1SmoothFwhmMm': { name: 'AR(1) autocorrelation smoothing FWHM', unit: 'mm' },
  'model.highpassCutoffSec': { name: 'model drift cutoff', unit: 's' },
  'model.motionRegressors': { name: 'motion regressors', unit: '' },
  'model.censorFdMm': { name: 'censoring above framewise displacement', unit: 'mm' },
  'model.censorFdBefore': { name: 'volumes censored before each movement', unit: '' },
  'model.censorFdAfter': { name: 'volumes censored after each movement', unit: '' },
  'study.misregistrationMm': { name: 'misregistration SD', unit: 'mm' },
};

/** The label of a "<step>.<param>" or "model.<option>" key, from one place: the step's definition or the model table. */
function labelOf(key: string): ParameterLabel | null {
  if (MODEL_LABELS[key]) return MODEL_LABELS[key];
  const dot = key.indexOf('.');
  const step = key.slice(0, dot);
  if (step === 'model' || step === 'study' || !listSteps().includes(step)) return null;
  return getStep(step).labels[key.slice(dot + 1)] ?? null;
}

/**
 * A parameter's unit: from the step definition's labels (or the model options' table); for a
 * parameter without a label, the unit its name carries in its suffix (fwhmMm -> mm, cutoffSec -> s, ...).
 * @param key - e.g. 'smooth.fwhmMm'
 * @returns e.g. 'mm', 's', '%', 'deg' or ''
 * @example parameterUnit('highpass.cutoffSec') // 's'
 */
export function parameterUnit(key: string): string {
  const label = labelOf(key);
  if (label) return label.unit;
  if (/Mm$/.test(key)) return 'mm';
  if (/Sec$/.test(key)) return 's';
  if (/Pct$/.test(key)) return '%';
  if (/Deg$/.test(key)) return 'deg';
  return '';
}

/**
 * A parameter's plain name, without unit, from the step definition's labels (or the model options'
 * table): "smooth.fwhmMm" -> "smoothing FWHM"; parameters without a label become "<step> <param words>".
 * @param key - "<step>.<param>"
 * @returns the name
 * @example parameterName('smooth.fwhmMm') // 'smoothing FWHM'
 */
export function parameterName(key: string): string {
  const label = labelOf(key);
  if (label) return label.name;
  const dot = key.indexOf('.');
  const param = key.slice(dot + 1).replace(/(Mm|Sec|Pct|Deg)$/, '').replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
  return `${key.slice(0, dot)} ${param}`;
}

/**
 * How simple a setting is by its steps' own simplicity orders (StepDefinition.simplicity): for each
 * varied step, its simplicity at the recipe's parameters with the setting filled in, in the order
 * the keys are varied; model options and steps without a simplicity order give null (use the
 * sweep's order of values).
 * @param setting - the setting
 * @param recipe - the sweep's recipe (fixed parameters of each step)
 * @returns one number (lower = simpler) or null per varied key
 * @example settingSimplicity({ 'smooth.fwhmMm': 6 }, spec.recipe) // [6]
 */
export function settingSimplicity(setting: Setting, recipe: ReadonlyArray<{ step: string; params: Record<string, unknown> }>): Array<number | null> {
  return Object.entries(setting).map(([key, value]) => {
    const dot = key.indexOf('.');
    const step = key.slice(0, dot);
    const at = recipe.find((r) => r.step === step);
    if (step === 'model' || !at || !listSteps().includes(step)) return null;
    const def = getStep(step);
    if (!def.simplicity) return null;
    const s = def.simplicity(parseStepParams(step, { ...at.params, [key.slice(dot + 1)]: value }));
    return Number.isFinite(s) ? s : null;
  });
}

/**
 * A setting in words with units, for people: "smoothing FWHM 6 mm"; a null value reads "none".
 * @param s - the setting
 * @returns the text ("the fixed recipe" when nothing varies)
 * @example settingText({ 'smooth.fwhmMm': 6 }) // 'smoothing FWHM 6 mm'
 */
export function settingText(s: Setting): string {
  const parts = Object.entries(s).map(([k, v]) => {
    if (v === null) return `${parameterName(k)} none`; // e.g. no censoring, no drift cutoff
    const unit = parameterUnit(k);
    return `${parameterName(k)} ${v}${unit ? (unit === '%' ? ' %' : ` ${unit}`) : ''}`;
  });
  return parts.length ? parts.join(', ') : 'the fixed recipe';
}

/**
 * Which end of the varied values is simpler, by the varied steps' own simplicity orders
 * (StepDefinition.simplicity) at the recipe's parameters: 'smallest' when every varied step
 * parameter's simplicity rises with its value, 'largest' when every one falls, null when they
 * disagree, a key has no order (a model option, a step without `simplicity`, one not registered
 * here) or values are not numbers. The recommendation's one-standard-error rule uses it as its
 * default preference.
 * @param spec - the sweep's recipe and varied values
 * @returns 'smallest', 'largest' or null
 * @example simplerEnd({ recipe: [{ step: 'highpass', params: { cutoffSec: 128 } }], vary: { 'highpass.cutoffSec': [64, 128] } }) // 'largest'
 */
export function simplerEnd(spec: { recipe: ReadonlyArray<{ step: string; params: Record<string, unknown> }>; vary: Record<string, ReadonlyArray<number | string | boolean | null>> }): 'smallest' | 'largest' | null {
  let end: 'smallest' | 'largest' | null = null;
  for (const [key, values] of Object.entries(spec.vary)) {
    if (values.length < 2) continue;
    if (values.some((v) => typeof v !== 'number')) return null;
    let ranked: Array<[number, number]>;
    try {
      ranked = values.map((v) => [v as number, settingSimplicity({ [key]: v }, spec.recipe)[0] ?? NaN]);
    } catch {
      return null; // parameters this registry cannot check (a step registered elsewhere)
    }
    if (ranked.some(([, s]) => !Number.isFinite(s))) return null;
    ranked.sort((a, b) => a[0] - b[0]);
    let rising = true, falling = true;
    for (let i = 1; i < ranked.length; i++) {
      if (ranked[i][1] < ranked[i - 1][1]) rising = false;
      if (ranked[i][1] > ranked[i - 1][1]) falling = false;
    }
    const here = rising && !falling ? 'smallest' : falling && !rising ? 'largest' : null;
    if (here === null || (end !== null && end !== here)) return null;
    end = here;
  }
  return end;
}
