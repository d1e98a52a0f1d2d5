import type { BoundaryMode } from '../core/boundary-mode.js';

/**
 * Bring a continuous position along one axis back inside the line the way scipy.ndimage
 * (1.10, map_coordinates) does before it picks the interpolation taps, so that ties of the nearest
 * kernel and far-outside positions match it. The taps that still fall outside are then mapped by
 * {@link extendIndex}.
 * - `constant`: a position outside [0, n-1] gets NaN (the caller writes cval; no blending at the edge);
 * - `nearest`: clamped to [0, n-1];
 * - `reflect` (half-sample symmetric, period 2n), `mirror` (whole-sample symmetric, period 2n-2),
 *   `wrap` (periodic with period n: scipy's 'grid-wrap'; scipy's own interpolation 'wrap' has period
 *   n-1 and is not offered): folded into one period.
 * @param x - position in voxels
 * @param n - line length
 * @param mode - boundary mode
 * @returns the folded position, or NaN for `constant` outside the line
 * @example foldCoordinate(-0.5, 5, 'mirror') // 0.5
 */
export function foldCoordinate(x: number, n: number, mode: BoundaryMode): number {
  if (x >= 0 && x <= n - 1) return x;
  if (mode === 'constant' || x !== x) return NaN;
  if (mode === 'nearest') return x < 0 ? 0 : n - 1;
  if (n <= 1) return 0;
  if (x < 0) {
    switch (mode) {
      case 'mirror': {
        const p = 2 * n - 2;
        x = p * Math.trunc(-x / p) + x;
        return x <= 1 - n ? x + p : -x;
      }
      case 'reflect': {
        const p = 2 * n;
        if (x < -p) x = p * Math.trunc(-x / p) + x;
        return x < -n ? x + p : (x > -1e-15 ? 1e-15 : -x) - 1;
      }
      case 'wrap':
        return x + n * (Math.trunc((-1 - x) / n) + 1);
    }
  }
  switch (mode) {
    case 'mirror': {
      const p = 2 * n - 2;
      x -= p * Math.trunc(x / p);
      return x >= n ? p - x : x;
    }
    case 'reflect': {
      const p = 2 * n;
      x -= p * Math.trunc(x / p);
      return x >= n ? p - x - 1 : x;
    }
    case 'wrap':
      return x - n * Math.trunc(x / n);
  }
}
