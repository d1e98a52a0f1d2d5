import { applyAffine, type Vec3 } from '../core/affine.js';
import type { Grid } from '../core/grid-frame.js';

/**
 * World position of a grid's middle: the voxel-centre position ((nx-1)/2, (ny-1)/2, (nz-1)/2). The
 * default centre a motion table's rotations turn about when none is stated (for the digital phantom
 * this is the world origin, the centre its motion uses).
 * @param grid - dims and voxel -> world affine
 * @returns world mm
 * @example gridCentreMm({ dims: [64, 64, 36], affine }) // centre of the field of view
 */
export function gridCentreMm(grid: Grid): Vec3 {
  return applyAffine(grid.affine, [(grid.dims[0] - 1) / 2, (grid.dims[1] - 1) / 2, (grid.dims[2] - 1) / 2]);
}
