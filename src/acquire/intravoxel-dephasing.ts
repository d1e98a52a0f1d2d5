import { fail } from '../core/fail.js';

/**
 * Signal kept in each voxel after intravoxel dephasing by a field that varies linearly across the
 * voxel: for a change of g Hz from one side of the voxel to the other, the spins' phases at echo
 * time TE spread evenly over 2 pi g TE and the voxel keeps |sinc(g TE)| = |sin(pi g TE)/(pi g TE)|
 * of its signal (from memory; the standard result for a linear gradient across a box voxel, e.g.
 * Haacke EM et al. (1999) MRI: Physical Principles and Sequence Design). The three axes are taken
 * as independent (product of three sinc factors); g per axis is the central difference of the
 * field map (one-sided at the grid edge).
 * @param fieldHz - field offset map, Hz, NIfTI order
 * @param dims - [nx, ny, nz]
 * @param teSec - echo time, seconds
 * @returns factor in [0, 1] per voxel
 * @example intravoxelDephasing(fieldHz, [44, 52, 34], 0.03)
 */
export function intravoxelDephasing(fieldHz: ArrayLike<number>, dims: readonly [number, number, number], teSec: number): Float32Array {
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  if (fieldHz.length !== n) fail('INVALID_ARGUMENT', `fieldHz length ${fieldHz.length} does not match dims [${dims.join(', ')}]`);
  if (!(teSec >= 0)) fail('INVALID_ARGUMENT', `teSec must be >= 0, got ${teSec}`);
  const out = new Float32Array(n);
  const size = [nx, ny, nz];
  const stride = [1, nx, nx * ny];
  let p = 0;
  for (let k = 0; k < nz; k++) {
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++, p++) {
        const idx = [i, j, k];
        let factor = 1;
        for (let a = 0; a < 3; a++) {
          if (size[a] < 2) continue;
          const lo = idx[a] > 0 ? p - stride[a] : p;
          const hi = idx[a] < size[a] - 1 ? p + stride[a] : p;
          const g = (fieldHz[hi] - fieldHz[lo]) / ((hi - lo) / stride[a]);
          factor *= sinc(g * teSec);
        }
        out[p] = factor;
      }
    }
  }
  return out;
}

function sinc(x: number): number {
  if (Math.abs(x) < 1e-8) return 1;
  return Math.abs(Math.sin(Math.PI * x) / (Math.PI * x));
}
