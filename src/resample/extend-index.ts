import { boundaryIndex, type BoundaryMode } from '../core/boundary-mode.js';

/**
 * Index in 0..n-1 that an interpolation tap at integer position `i` reads. Same extension as
 * {@link boundaryIndex}, except that `constant` reads the whole-sample mirror: with scipy.ndimage's
 * 'constant' mode the cval only replaces positions outside [0, n-1]; inside, a cubic B-spline near
 * the edge uses coefficients extended by the mirror, as scipy (1.10) prefilters with it.
 * @param i - tap position, any integer
 * @param n - line length
 * @param mode - boundary mode
 * @returns index in 0..n-1
 * @example extendIndex(-1, 5, 'constant') // 1
 */
export function extendIndex(i: number, n: number, mode: BoundaryMode): number {
  if (i >= 0 && i < n) return i;
  return boundaryIndex(i, n, mode === 'constant' ? 'mirror' : mode);
}
