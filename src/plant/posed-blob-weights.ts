import { composeAffine, invertAffine, type Affine, type Vec3 } from '../core/affine.js';
import { posedBlobBox } from './posed-blob-box.js';
import { blobSupportMm, blobWeight, type BlobShapeSpec } from './plant-profile.js';

/**
 * Blob weights at the voxels of one volume in which the head has moved: the weight at voxel
 * (i, j, k) is the analytic blob weight ({@link blobWeight}) at the head position
 * `inverse(pose) * affine * [i, j, k, 1]`, summed over blobs; no interpolation. Weights are added
 * (as float32, like the reference profile) into `out`, which should be zero where the blobs reach.
 * @param dims - [nx, ny, nz] of the run's grid
 * @param affine - the grid's voxel -> world affine
 * @param pose - reference world mm -> scanner world mm at this volume
 * @param centresMm - blob centres in the reference frame, world mm
 * @param spec - blob shape and size
 * @param out - float32 weights on the grid, added to
 * @returns `out`
 * @example posedBlobWeights(dims, affine, poses[t], truth.centresMm, truth.shape, weights)
 */
export function posedBlobWeights(dims: readonly number[], affine: Affine, pose: Affine, centresMm: readonly Vec3[], spec: BlobShapeSpec, out: Float32Array): Float32Array {
  const [nx, ny] = dims;
  const support = blobSupportMm(spec);
  const support2 = support * support * (1 + 1e-12);
  const m = composeAffine(invertAffine(pose), affine); // voxel index -> head mm
  for (const c of centresMm) {
    const [i0, i1, j0, j1, k0, k1] = posedBlobBox(dims, affine, pose, c, support);
    for (let k = k0; k <= k1; k++) {
      for (let j = j0; j <= j1; j++) {
        // head position of (i0, j, k) relative to the centre; stepping i adds the first column
        let x = m[0] * i0 + m[1] * j + m[2] * k + m[3] - c[0];
        let y = m[4] * i0 + m[5] * j + m[6] * k + m[7] - c[1];
        let z = m[8] * i0 + m[9] * j + m[10] * k + m[11] - c[2];
        let v = i0 + nx * (j + ny * k);
        for (let i = i0; i <= i1; i++, v++) {
          const r2 = x * x + y * y + z * z;
          // the box's corners lie outside the ball
          if (r2 <= support2) {
            const w = blobWeight(spec, Math.sqrt(r2));
            if (w > 0) out[v] += Math.fround(w);
          }
          x += m[0]; y += m[4]; z += m[8];
        }
      }
    }
  }
  return out;
}
