import type { NuisanceRegressor } from './design.js';
import type { MotionParameters } from './framewise-displacement.js';
import { motionExpansion, type MotionRegressorCount } from './motion-expansion.js';

/**
 * Motion regressors for a GLM design: the expansion of `motionExpansion` (6, 12 or 24 columns),
 * each mean-centred over the volumes that inform the fit (the ones not censored). A censored volume
 * gets its own indicator column in the design, which takes up its whole value, so what any other
 * column holds there does not change the fit: it is set to 0. A column that is constant over those
 * volumes (a parameter that never changes, say with no rotation at all) is left out, since the
 * intercept already holds it and the design would be rank deficient.
 * @param table - one row per volume of the modelled run (not modified)
 * @param count - 0, 6, 12 or 24
 * @param censored - volumes (0-based, in `table`'s rows) with their own indicator column. __Default value:__ none
 * @returns the columns to add as nuisance regressors (named as in motionExpansion)
 * @example buildDesign(events, { nt, trSec, nuisance: motionRegressors(table, 24) })
 */
export function motionRegressors(table: readonly MotionParameters[], count: MotionRegressorCount, censored: readonly number[] = []): NuisanceRegressor[] {
  const { names, columns } = motionExpansion(table, count);
  const nt = table.length;
  const kept = new Uint8Array(nt).fill(1);
  for (const t of censored) if (t >= 0 && t < nt) kept[t] = 0;
  const out: NuisanceRegressor[] = [];
  columns.forEach((c, j) => {
    let sum = 0, n = 0, scale = 0;
    for (let t = 0; t < nt; t++) if (kept[t]) { sum += c[t]; n++; scale = Math.max(scale, Math.abs(c[t])); }
    if (n === 0) return;
    const mean = sum / n;
    let spread = 0;
    for (let t = 0; t < nt; t++) {
      c[t] = kept[t] ? c[t] - mean : 0;
      spread = Math.max(spread, Math.abs(c[t]));
    }
    // constant up to rounding (relative to the column's size): no information beyond the intercept
    if (!(spread > 1e-12 * scale)) return;
    out.push({ name: names[j], values: c });
  });
  return out;
}
