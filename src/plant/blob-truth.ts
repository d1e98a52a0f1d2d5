import { applyAffine, type Affine, type Vec3 } from '../core/affine.js';
import type { PlantedBlob } from './plant-activations.js';
import { blobProfile, type BlobShapeSpec } from './plant-profile.js';

/**
 * The spatial part of a planting's truth: every blob's weight summed at the voxel centres of the
 * grid (1 at each centre), the voxels where a blob's weight reaches the truth fraction, and each
 * blob's own truth voxels. Centres may be fractional voxel positions.
 * @param dims - [nx, ny, nz]
 * @param affine - voxel -> world (mm)
 * @param centresVoxel - blob centres in voxel indices
 * @param spec - blob shape and size
 * @param truthFraction - weight at or above which a voxel is truth (0.5: half maximum)
 * @returns summed profile, truth mask and the blobs
 * @example const { mask } = blobTruth([64, 64, 36], affine, [[30, 31, 18]], { shape: 'gaussian', fwhmMm: 6 }, 0.5)
 */
export function blobTruth(dims: readonly number[], affine: Affine, centresVoxel: readonly Vec3[], spec: BlobShapeSpec, truthFraction: number): { profile: Float32Array; mask: Uint8Array; blobs: PlantedBlob[] } {
  const n = dims[0] * dims[1] * dims[2];
  const profile = new Float32Array(n);
  const mask = new Uint8Array(n);
  const blobs: PlantedBlob[] = centresVoxel.map((c) => {
    const p = blobProfile(dims, affine, c, spec);
    const truthVoxels: number[] = [];
    for (let m = 0; m < p.index.length; m++) {
      profile[p.index[m]] += p.weight[m];
      if (p.weight[m] >= truthFraction) { truthVoxels.push(p.index[m]); mask[p.index[m]] = 1; }
    }
    return { centreVoxel: c, centreMm: applyAffine(affine, c), truthVoxels: Int32Array.from(truthVoxels) };
  });
  return { profile, mask, blobs };
}
