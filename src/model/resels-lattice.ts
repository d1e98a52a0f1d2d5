import { fail } from '../core/fail.js';

/** Cell counts of a binary mask seen as a cubical complex on the voxel-centre lattice. */
export interface LatticeCounts {
  /** In-mask voxels (lattice points), P. */
  voxels: number;
  /** Edges joining two in-mask neighbours along x, y, z (Ex, Ey, Ez). */
  edges: [number, number, number];
  /** Unit squares with all four corners in the mask, in the xy, xz and yz planes (Fxy, Fxz, Fyz). */
  faces: [number, number, number];
  /** Unit cubes with all eight corners in the mask, C. */
  cubes: number;
  /** Euler characteristic P - (Ex+Ey+Ez) + (Fxy+Fxz+Fyz) - C (components - tunnels + cavities, 6-connected). */
  euler: number;
}

/**
 * Count the voxels, edges, faces and cubes of a mask's cubical complex: a cell is counted when all
 * its corner voxels are in the mask. These counts give the Euler characteristic and, scaled by the
 * FWHM, the lattice resel counts of Worsley KJ et al. (1996, Hum Brain Mapp 4:58-73).
 * @param mask - nonzero = in, length nx*ny*nz, x fastest
 * @param dims - [nx, ny, nz]
 * @returns the counts and Euler characteristic
 * @throws BoldsweepError GRID_MISMATCH when the mask length does not match dims
 * @example latticeCounts(new Uint8Array(8).fill(1), [2, 2, 2]).euler // 1
 */
export function latticeCounts(mask: ArrayLike<number>, dims: readonly number[]): LatticeCounts {
  const [nx, ny, nz] = dims;
  if (dims.length < 3 || [nx, ny, nz].some((d) => !Number.isInteger(d) || d < 1)) fail('INVALID_ARGUMENT', `dims must start with three positive integers, got [${dims.join(', ')}]`);
  if (mask.length !== nx * ny * nz) fail('GRID_MISMATCH', `mask has ${mask.length} voxels but dims ${nx}x${ny}x${nz} need ${nx * ny * nz}`);
  const sx = 1, sy = nx, sz = nx * ny;
  let p = 0, ex = 0, ey = 0, ez = 0, fxy = 0, fxz = 0, fyz = 0, c = 0;
  for (let z = 0; z < nz; z++) {
    for (let y = 0; y < ny; y++) {
      for (let x = 0; x < nx; x++) {
        const v = x + nx * (y + ny * z);
        if (!mask[v]) continue;
        p++;
        const hx = x + 1 < nx && !!mask[v + sx];
        const hy = y + 1 < ny && !!mask[v + sy];
        const hz = z + 1 < nz && !!mask[v + sz];
        if (hx) ex++;
        if (hy) ey++;
        if (hz) ez++;
        const hxy = hx && hy && !!mask[v + sx + sy];
        const hxz = hx && hz && !!mask[v + sx + sz];
        const hyz = hy && hz && !!mask[v + sy + sz];
        if (hxy) fxy++;
        if (hxz) fxz++;
        if (hyz) fyz++;
        if (hxy && hxz && hyz && mask[v + sx + sy + sz]) c++;
      }
    }
  }
  return { voxels: p, edges: [ex, ey, ez], faces: [fxy, fxz, fyz], cubes: c, euler: p - (ex + ey + ez) + (fxy + fxz + fyz) - c };
}
