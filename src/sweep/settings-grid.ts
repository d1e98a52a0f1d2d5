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

/** Plain names of well-known parameters (others are spelled out from their key). */
const PARAMETER_NAMES: Record<string, string> = {
  'smooth.fwhmMm': 'smoothing FWHM',
  'highpass.cutoffSec': 'high-pass cutoff',
  'detrend.order': 'detrending order',
  'drop-initial-volumes.count': 'initial volumes dropped',
  'grand-mean-scale.target': 'grand-mean target',
  'model.ar1': 'AR(1) noise model',
  'model.ar1SmoothFwhmMm': 'AR(1) autocorrelation smoothing FWHM',
  'model.highpassCutoffSec': 'model drift cutoff',
};

/**
 * The unit a parameter name carries in its suffix (fwhmMm -> mm, cutoffSec -> s, ...).
 * @param key - e.g. 'smooth.fwhmMm'
 * @returns 'mm', 's', '%', 'deg' or ''
 * @example parameterUnit('highpass.cutoffSec') // 's'
 */
export function parameterUnit(key: string): string {
  if (/Mm$/.test(key)) return 'mm';
  if (/Sec$/.test(key)) return 's';
  if (/Pct$/.test(key)) return '%';
  if (/Deg$/.test(key)) return 'deg';
  return '';
}

/**
 * A parameter's plain name, without unit: "smooth.fwhmMm" -> "smoothing FWHM"; unknown keys become
 * "<step> <param words>".
 * @param key - "<step>.<param>"
 * @returns the name
 * @example parameterName('smooth.fwhmMm') // 'smoothing FWHM'
 */
export function parameterName(key: string): string {
  if (PARAMETER_NAMES[key]) return PARAMETER_NAMES[key];
  const dot = key.indexOf('.');
  const param = key.slice(dot + 1).replace(/(Mm|Sec|Pct|Deg)$/, '').replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
  return `${key.slice(0, dot)} ${param}`;
}

/**
 * A setting in words with units, for people: "smoothing FWHM 6 mm".
 * @param s - the setting
 * @returns the text ("the fixed recipe" when nothing varies)
 * @example settingText({ 'smooth.fwhmMm': 6 }) // 'smoothing FWHM 6 mm'
 */
export function settingText(s: Setting): string {
  const parts = Object.entries(s).map(([k, v]) => {
    const unit = parameterUnit(k);
    return `${parameterName(k)} ${v}${unit ? (unit === '%' ? ' %' : ` ${unit}`) : ''}`;
  });
  return parts.length ? parts.join(', ') : 'the fixed recipe';
}
