import { fail } from '../core/fail.js';
import { checkOpenUnit } from './threshold-input.js';

function checkPValues(pValues: ArrayLike<number>): void {
  for (let i = 0; i < pValues.length; i++) {
    const p = pValues[i];
    if (!(p >= 0 && p <= 1)) fail('INVALID_ARGUMENT', `p-values must lie in [0, 1]; entry ${i} is ${p}`);
  }
}

/** Indices 0..n-1 ordered by ascending p (ties by index, so the order is deterministic). */
function ascendingOrder(pValues: ArrayLike<number>): Uint32Array {
  const order = new Uint32Array(pValues.length);
  for (let i = 0; i < order.length; i++) order[i] = i;
  return order.sort((a, b) => pValues[a] - pValues[b] || a - b);
}

/**
 * Benjamini-Hochberg step-up cut-off (Benjamini Y & Hochberg Y 1995, J R Stat Soc B 57(1):289-300):
 * with p-values sorted ascending p_(1) <= ... <= p_(m), k is the largest i with p_(i) <= i q / m, and
 * every test with p <= p_(k) is declared a discovery. Controls the expected false discovery
 * proportion at q for independent or positively dependent tests.
 * @param pValues - p-values in [0, 1]
 * @param q - false discovery rate in (0, 1)
 * @returns k (0 = no discoveries), the p cut-off p_(k) (null when k is 0) and m
 * @throws BoldsweepError INVALID_ARGUMENT for q outside (0, 1) or p outside [0, 1]
 * @example fdrBhCutoff([0.001, 0.008, 0.039, 0.041], 0.05) // { k: 2, pCutoff: 0.008, m: 4 }
 */
export function fdrBhCutoff(pValues: ArrayLike<number>, q: number): { k: number; pCutoff: number | null; m: number } {
  checkOpenUnit('q', q);
  checkPValues(pValues);
  const m = pValues.length;
  const sorted = Float64Array.from(pValues).sort();
  // step-up: scan from the largest p down; the first i that passes is the largest such i
  for (let i = m; i >= 1; i--) {
    if (sorted[i - 1] <= (i * q) / m) return { k: i, pCutoff: sorted[i - 1], m };
  }
  return { k: 0, pCutoff: null, m };
}

/**
 * Benjamini-Hochberg adjusted p-values: adj_(i) = min over j >= i of min(1, m p_(j) / j), returned in
 * the input order. A test is a discovery at level q exactly when its adjusted p-value is <= q, the
 * same decision as {@link fdrBhCutoff}.
 * @param pValues - p-values in [0, 1]
 * @param out - optional output array (length m)
 * @returns adjusted p-values in input order
 * @throws BoldsweepError INVALID_ARGUMENT for p outside [0, 1] or an out of the wrong length
 * @example fdrBhAdjust([0.01, 0.02, 0.03]) // [0.03, 0.03, 0.03]
 */
export function fdrBhAdjust(pValues: ArrayLike<number>, out?: Float64Array): Float64Array {
  checkPValues(pValues);
  const m = pValues.length;
  const result = out ?? new Float64Array(m);
  if (result.length !== m) fail('INVALID_ARGUMENT', `out has length ${result.length}, expected ${m}`);
  const order = ascendingOrder(pValues);
  let running = 1;
  for (let r = m; r >= 1; r--) {
    const idx = order[r - 1];
    running = Math.min(running, (m * pValues[idx]) / r);
    result[idx] = running;
  }
  return result;
}
