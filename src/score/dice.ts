import { fail } from '../core/fail.js';

/**
 * Dice's overlap coefficient of two binary masks, 2|A ∩ B| / (|A| + |B|)
 * (Dice LR 1945, Ecology 26(3):297-302): 1 for identical masks, 0 for disjoint ones.
 * @param a - first mask, nonzero = in
 * @param b - second mask, same length
 * @param within - optional region (nonzero = counted); voxels outside it are ignored
 * @returns the coefficient in [0, 1], or NaN when both masks are empty (0/0)
 * @throws BoldsweepError INVALID_ARGUMENT when lengths differ
 * @example diceCoefficient(survivors, truth.mask, brainMask)
 */
export function diceCoefficient(a: ArrayLike<number>, b: ArrayLike<number>, within?: ArrayLike<number>): number {
  if (a.length !== b.length || (within && within.length !== a.length)) {
    fail('INVALID_ARGUMENT', `masks must have the same length, got ${a.length}, ${b.length}${within ? `, ${within.length}` : ''}`);
  }
  let na = 0, nb = 0, both = 0;
  for (let v = 0; v < a.length; v++) {
    if (within && !within[v]) continue;
    const inA = a[v] !== 0, inB = b[v] !== 0;
    if (inA) na++;
    if (inB) nb++;
    if (inA && inB) both++;
  }
  return na + nb === 0 ? NaN : (2 * both) / (na + nb);
}
