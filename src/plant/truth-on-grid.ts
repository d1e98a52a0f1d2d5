import { applyAffine, invertAffine } from '../core/affine.js';
import type { Grid } from '../core/grid-frame.js';
import type { PlantTruth } from './plant-activations.js';
import { blobProfile } from './plant-profile.js';

/**
 * The planted truth evaluated on another grid of the reference frame (a target grid, another voxel
 * size): the analytic blobs (the truth's centres in world mm and its shape) sampled at that grid's
 * voxel centres, and the voxels where some blob's weight is at least the truth's fraction (half
 * maximum by default). On the run's own grid it reproduces the truth's profile and mask (up to the
 * rounding of the centres' voxel positions).
 * @param truth - the truth of a planting (its centresMm, shape and truthFraction are used)
 * @param grid - dims and voxel -> world affine of the target grid (same world space as the run's reference frame)
 * @returns profile (summed weights, 1 at each centre) and mask, length of the grid, and the centres in the grid's voxel indices
 * @example const { profile, mask } = truthOnGrid(truth, { dims: [97, 115, 97], affine: mni2mm })
 */
export function truthOnGrid(truth: Pick<PlantTruth, 'centresMm' | 'shape' | 'truthFraction'>, grid: Grid): { profile: Float32Array; mask: Uint8Array; centresVoxel: Array<[number, number, number]> } {
  const n = grid.dims[0] * grid.dims[1] * grid.dims[2];
  const profile = new Float32Array(n);
  const mask = new Uint8Array(n);
  const toVoxel = invertAffine(grid.affine);
  const centresVoxel = truth.centresMm.map((c) => applyAffine(toVoxel, c));
  for (const c of centresVoxel) {
    const p = blobProfile(grid.dims, grid.affine, c, truth.shape);
    for (let m = 0; m < p.index.length; m++) {
      profile[p.index[m]] += p.weight[m];
      if (p.weight[m] >= truth.truthFraction) mask[p.index[m]] = 1;
    }
  }
  return { profile, mask, centresVoxel };
}
