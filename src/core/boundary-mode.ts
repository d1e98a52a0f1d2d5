/**
 * How a filter extends an image past its edge. The names and meanings are scipy.ndimage's, so a
 * value written here means the same there (edge a b c d, extended to the left):
 * - `reflect`  d c b a | a b c d   half-sample symmetric (edge sample repeated)
 * - `mirror`   d c b | a b c d     whole-sample symmetric (edge sample not repeated)
 * - `nearest`  a a a | a b c d     edge value repeated
 * - `constant` 0 0 0 | a b c d     zeros (cval 0)
 * - `wrap`     b c d | a b c d     periodic
 */
export type BoundaryMode = 'reflect' | 'constant' | 'nearest' | 'mirror' | 'wrap';

/** All boundary modes, for validation and schemas. */
export const BOUNDARY_MODES: readonly BoundaryMode[] = ['reflect', 'constant', 'nearest', 'mirror', 'wrap'];

/**
 * Index inside 0..n-1 that position `i` (possibly outside) reads under a boundary mode, or -1 when
 * it reads the constant 0. Works for any distance past the edge (the extension repeats), so a
 * kernel wider than the line is fine.
 * @param i - position, any integer
 * @param n - line length (>= 1)
 * @param mode - boundary mode
 * @returns index in 0..n-1, or -1 for `constant` outside the line
 * @example boundaryIndex(-1, 4, 'reflect') // 0; boundaryIndex(-1, 4, 'mirror') // 1
 */
export function boundaryIndex(i: number, n: number, mode: BoundaryMode): number {
  if (i >= 0 && i < n) return i;
  switch (mode) {
    case 'constant':
      return -1;
    case 'nearest':
      return i < 0 ? 0 : n - 1;
    case 'wrap':
      return ((i % n) + n) % n;
    case 'reflect': {
      const p = 2 * n;
      const m = ((i % p) + p) % p;
      return m < n ? m : p - 1 - m;
    }
    case 'mirror': {
      if (n === 1) return 0;
      const p = 2 * n - 2;
      const m = ((i % p) + p) % p;
      return m < n ? m : p - m;
    }
  }
}
