import { applyAffine, invertAffine, type Vec3 } from '../core/affine.js';
import type { Frame } from '../core/grid-frame.js';
import { blobProfile } from '../plant/plant-profile.js';
import type { PlantedBlob, PlantTruth } from '../plant/plant-activations.js';

/**
 * The planted truth in a cell's output frame. The truth lives in the reference frame on the run's
 * grid, so for the raw and reference frames it is returned as it is. For a target grid it is made
 * again, exactly, from the blobs' world centres and shape: each blob's weight is evaluated
 * analytically at every target voxel centre (the same `blobProfile` planting uses, so no
 * interpolation kernel blurs it), summed into the profile, and a voxel is truth where some blob's
 * weight is at least the truth fraction (half maximum by default), as on the run's grid. Centres
 * keep their exact (possibly fractional) target voxel positions.
 * @param truth - the planted truth (reference frame, run grid)
 * @param frame - the cell's output frame
 * @returns the truth on the frame's grid
 * @example const t = truthInFrame(stage.truth, { kind: 'target', grid: { dims: [32, 32, 18], affine } })
 */
export function truthInFrame(truth: PlantTruth, frame: Frame): PlantTruth {
  if (frame.kind !== 'target') return truth;
  const { dims, affine } = frame.grid;
  const n = dims[0] * dims[1] * dims[2];
  const voxelFromWorld = invertAffine(affine);
  const profile = new Float32Array(n);
  const mask = new Uint8Array(n);
  const centresVoxel: Vec3[] = [];
  const blobs: PlantedBlob[] = truth.centresMm.map((centreMm) => {
    const c = applyAffine(voxelFromWorld, centreMm);
    centresVoxel.push(c);
    const p = blobProfile(dims, affine, c, truth.shape);
    const truthVoxels: number[] = [];
    for (let m = 0; m < p.index.length; m++) {
      profile[p.index[m]] += p.weight[m];
      if (p.weight[m] >= truth.truthFraction) { truthVoxels.push(p.index[m]); mask[p.index[m]] = 1; }
    }
    return { centreVoxel: c, centreMm: [...centreMm] as Vec3, truthVoxels: Int32Array.from(truthVoxels) };
  });
  return { ...truth, dims: [dims[0], dims[1], dims[2]], affine: new Float64Array(affine), mask, profile, centresVoxel, blobs };
}
