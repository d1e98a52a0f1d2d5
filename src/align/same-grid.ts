import type { Grid } from '../core/grid-frame.js';

/**
 * Whether two grids are the same: equal dims and voxel-to-world mappings within `toleranceMm` per
 * entry (grids written to JSON and read back, or computed by two routes, differ by rounding).
 * @param a - a grid
 * @param b - another grid
 * @param toleranceMm - largest difference of any affine entry. __Default value:__ 1e-6 (a millionth of a mm: rounding, not a different grid)
 * @returns true when they match
 * @example sameGrid(meanToStructural.to.grid, structuralToTemplate.from.grid)
 */
export function sameGrid(a: Grid, b: Grid, toleranceMm = 1e-6): boolean {
  if (a.dims.some((n, i) => n !== b.dims[i])) return false;
  for (let i = 0; i < 16; i++) if (!(Math.abs(a.affine[i] - b.affine[i]) <= toleranceMm)) return false;
  return true;
}
