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
