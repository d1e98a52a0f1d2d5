import { applyAffine, composeAffine, invertAffine, type Affine, type Vec3 } from '../core/affine.js';

/** An inclusive box of voxel indices: [i0, i1, j0, j1, k0, k1]; empty when i0 > i1 (or j, k). */
export type VoxelBox = [number, number, number, number, number, number];

/**
 * The voxels of a grid that a ball fixed to the head can reach at one pose: the ball (centre in the
 * head's reference-frame world mm, radius in mm) is carried by the pose into the scanner, and the box
 * of voxel indices that holds its image is returned, clipped to the grid. Along index axis a the
 * half-width is r |row a of (grid affine^-1 pose)| (the largest reach of a ball through a linear map),
 * so the box is exact for rigid and affine poses and oblique grids.
 * @param dims - [nx, ny, nz] of the grid
 * @param affine - the grid's voxel -> world affine
 * @param pose - reference world mm -> scanner world mm at this volume
 * @param centreMm - ball centre, reference world mm
 * @param radiusMm - ball radius, mm
 * @returns the clipped index box
 * @example posedBlobBox([64, 64, 36], affine, pose, [10, -40, 12], 10.2)
 */
export function posedBlobBox(dims: readonly number[], affine: Affine, pose: Affine, centreMm: Readonly<Vec3>, radiusMm: number): VoxelBox {
  const m = composeAffine(invertAffine(affine), pose);
  const c = applyAffine(m, centreMm);
  const box: number[] = [];
  for (let a = 0; a < 3; a++) {
    const half = radiusMm * Math.hypot(m[4 * a], m[4 * a + 1], m[4 * a + 2]);
    box.push(Math.max(0, Math.ceil(c[a] - half - 1e-9)), Math.min(dims[a] - 1, Math.floor(c[a] + half + 1e-9)));
  }
  return box as VoxelBox;
}
