import type { Affine, Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { indexExtent } from '../simulate/plant-profile.js';

/**
 * Peak-location error per planted blob: the world distance (mm) from the true centre to the voxel
 * with the largest statistic among voxels within `searchRadiusMm` of that centre (ties: first in
 * NIfTI order). 0 when the peak sits on the centre voxel.
 * @param statistic - per-voxel statistic, length nx*ny*nz
 * @param dims - [nx, ny, nz]
 * @param affine - voxel -> world (mm)
 * @param centresVoxel - true centres in voxel indices
 * @param searchRadiusMm - how far from each centre to look for the peak
 * @param within - optional region (e.g. brain mask); voxels outside are not searched
 * @returns one distance in mm per centre (NaN when no searchable voxel has a finite statistic)
 * @throws BoldsweepError INVALID_ARGUMENT on bad radius or lengths
 * @example peakErrorsMm(z.data, truth.dims, truth.affine, truth.centresVoxel, 6)
 */
export function peakErrorsMm(statistic: ArrayLike<number>, dims: readonly number[], affine: Affine, centresVoxel: readonly Vec3[], searchRadiusMm: number, within?: ArrayLike<number>): Float64Array {
  const [nx, ny, nz] = dims;
  if (statistic.length !== nx * ny * nz || (within && within.length !== statistic.length)) fail('INVALID_ARGUMENT', `statistic length ${statistic.length} does not match ${nx}x${ny}x${nz}`);
  if (!(searchRadiusMm >= 0) || !Number.isFinite(searchRadiusMm)) fail('INVALID_ARGUMENT', `searchRadiusMm must be >= 0, got ${searchRadiusMm}`);
  const ext = indexExtent(affine, searchRadiusMm);
  const a = affine;
  const r2 = searchRadiusMm * searchRadiusMm * (1 + 1e-12);
  const out = new Float64Array(centresVoxel.length);
  centresVoxel.forEach(([ci, cj, ck], b) => {
    let best = -Infinity, bestD2 = NaN;
    for (let k = Math.max(0, Math.ceil(ck - ext[2])); k <= Math.min(nz - 1, Math.floor(ck + ext[2])); k++) {
      for (let j = Math.max(0, Math.ceil(cj - ext[1])); j <= Math.min(ny - 1, Math.floor(cj + ext[1])); j++) {
        for (let i = Math.max(0, Math.ceil(ci - ext[0])); i <= Math.min(nx - 1, Math.floor(ci + ext[0])); i++) {
          const v = i + nx * (j + ny * k);
          if (within && !within[v]) continue;
          const di = i - ci, dj = j - cj, dk = k - ck;
          const x = a[0] * di + a[1] * dj + a[2] * dk, y = a[4] * di + a[5] * dj + a[6] * dk, z = a[8] * di + a[9] * dj + a[10] * dk;
          const d2 = x * x + y * y + z * z;
          if (d2 > r2) continue;
          const s = statistic[v];
          if (s > best) { best = s; bestD2 = d2; }
        }
      }
    }
    out[b] = Math.sqrt(bestD2);
  });
  return out;
}
