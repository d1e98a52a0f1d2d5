import type { Affine, Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { indexExtent } from '../plant/plant-profile.js';

/** Result of {@link blobPeaks}: one entry per blob. */
export interface BlobPeaks {
  /** Distance in mm from the true centre to the statistic peak (NaN when nothing was searchable). */
  errorMm: Float64Array;
  /** The largest statistic within the search radius (-Infinity when nothing was searchable). */
  peakValue: Float64Array;
  /** The statistic at the true centre voxel. */
  centreValue: Float64Array;
}

/**
 * The statistic peak near each planted blob: the voxel with the largest statistic among voxels
 * within `searchRadiusMm` of the true centre (ties: first in NIfTI order), its value, and its world
 * distance (mm) from the centre, the peak-location error (0 when the peak sits on the centre voxel).
 * @param statistic - per-voxel statistic, length nx*ny*nz
 * @param dims - [nx, ny, nz]
 * @param affine - voxel -> world (mm)
 * @param centresVoxel - true centres in voxel indices (fractional ones are allowed: distances use them as
 *   they are, the centre value is read at the nearest voxel)
 * @param searchRadiusMm - how far from each centre to look for the peak
 * @param within - optional region (e.g. brain mask); voxels outside are not searched
 * @returns per blob: location error (mm), peak value and the value at the centre
 * @throws BoldsweepError INVALID_ARGUMENT on bad radius or lengths
 * @example blobPeaks(z.data, truth.dims, truth.affine, truth.centresVoxel, 6).errorMm
 */
export function blobPeaks(statistic: ArrayLike<number>, dims: readonly number[], affine: Affine, centresVoxel: readonly Vec3[], searchRadiusMm: number, within?: ArrayLike<number>): BlobPeaks {
  const [nx, ny, nz] = dims;
  if (statistic.length !== nx * ny * nz || (within && within.length !== statistic.length)) fail('INVALID_ARGUMENT', `statistic length ${statistic.length} does not match ${nx}x${ny}x${nz}`);
  if (!(searchRadiusMm >= 0) || !Number.isFinite(searchRadiusMm)) fail('INVALID_ARGUMENT', `searchRadiusMm must be >= 0, got ${searchRadiusMm}`);
  const ext = indexExtent(affine, searchRadiusMm);
  const a = affine;
  const r2 = searchRadiusMm * searchRadiusMm * (1 + 1e-12);
  const m = centresVoxel.length;
  const out: BlobPeaks = { errorMm: new Float64Array(m), peakValue: new Float64Array(m), centreValue: new Float64Array(m) };
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
    out.errorMm[b] = Math.sqrt(bestD2);
    out.peakValue[b] = best;
    // a centre between voxel centres (truth carried onto another grid) reads its nearest voxel
    const [ri, rj, rk] = [Math.min(nx - 1, Math.max(0, Math.round(ci))), Math.min(ny - 1, Math.max(0, Math.round(cj))), Math.min(nz - 1, Math.max(0, Math.round(ck)))];
    out.centreValue[b] = statistic[ri + nx * (rj + ny * rk)];
  });
  return out;
}
