import { fail } from '../core/fail.js';
import type { Resels } from './rft-ec-density.js';
import { latticeCounts, type LatticeCounts } from './resels-lattice.js';

/** Result of {@link reselCounts}. */
export interface ReselCounts {
  /** [R0, R1, R2, R3]: Euler characteristic, then resels per unit 1, 2 and 3 dimensional. */
  resels: Resels;
  /** FWHM per axis in voxels (fwhmMm / spacingMm). */
  fwhmVoxels: [number, number, number];
  /** The lattice cell counts the resels come from. */
  counts: LatticeCounts;
}

/**
 * Resel counts of a search region from its voxel, edge, face and cube counts (Worsley KJ et al.
 * 1996, Hum Brain Mapp 4:58-73, lattice formulas; from memory). With FWHM (in voxels) fx, fy, fz:
 *
 *   R0 = P - (Ex + Ey + Ez) + (Fxy + Fxz + Fyz) - C          (Euler characteristic)
 *   R1 = (Ex - Fxy - Fxz + C)/fx + (Ey - Fxy - Fyz + C)/fy + (Ez - Fxz - Fyz + C)/fz
 *   R2 = (Fxy - C)/(fx fy) + (Fxz - C)/(fx fz) + (Fyz - C)/(fy fz)
 *   R3 = C/(fx fy fz)
 *
 * These are the intrinsic volumes of the union of lattice cubes joining voxel centres, in FWHM
 * units: exact for a box (a box of side a, b, c mm gives R1 = (a+b+c)/F, R2 = (ab+bc+ca)/F^2,
 * R3 = abc/F^3), and for curved regions those of the staircase polyhedron (a voxelised sphere has
 * R1 = 1.5 x 4r/F, see the tests).
 * @param mask - nonzero = search region, length nx*ny*nz
 * @param dims - [nx, ny, nz]
 * @param fwhmMm - smoothness FWHM in mm, one number or one per axis
 * @param spacingMm - voxel size in mm per axis
 * @returns resels, FWHM in voxels and the lattice counts
 * @throws BoldsweepError INVALID_ARGUMENT for non-positive FWHM or spacing, GRID_MISMATCH for a mask of another size
 * @example reselCounts(brainMask, [64, 64, 36], 8, [3, 3, 3]).resels[3]
 */
export function reselCounts(mask: ArrayLike<number>, dims: readonly number[], fwhmMm: number | readonly number[], spacingMm: readonly number[]): ReselCounts {
  const f = typeof fwhmMm === 'number' ? [fwhmMm, fwhmMm, fwhmMm] : fwhmMm;
  if (f.length !== 3 || f.some((v) => !(v > 0) || !Number.isFinite(v))) fail('INVALID_ARGUMENT', `fwhmMm must be a positive finite number or three of them, got ${String(fwhmMm)}`);
  if (spacingMm.length !== 3 || spacingMm.some((v) => !(v > 0) || !Number.isFinite(v))) fail('INVALID_ARGUMENT', `spacingMm must be three positive numbers, got [${spacingMm.join(', ')}]`);
  const counts = latticeCounts(mask, dims);
  const [fx, fy, fz] = [f[0] / spacingMm[0], f[1] / spacingMm[1], f[2] / spacingMm[2]];
  const { edges: [ex, ey, ez], faces: [fxy, fxz, fyz], cubes: c } = counts;
  const r1 = (ex - fxy - fxz + c) / fx + (ey - fxy - fyz + c) / fy + (ez - fxz - fyz + c) / fz;
  const r2 = (fxy - c) / (fx * fy) + (fxz - c) / (fx * fz) + (fyz - c) / (fy * fz);
  const r3 = c / (fx * fy * fz);
  return { resels: [counts.euler, r1, r2, r3], fwhmVoxels: [fx, fy, fz], counts };
}
