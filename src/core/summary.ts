import type { Volume } from './volume.js';

/**
 * One line describing an image: grid, voxel size, volumes, TR and duration.
 * @param v - the volume
 * @returns e.g. "64x64x36 voxels of 3.00x3.00x3.50 mm, 200 volumes, TR 2.000 s (400.0 s)"
 * @example console.log(summariseVolume(run.volume))
 */
export function summariseVolume(v: Volume): string {
  const [nx, ny, nz, nt] = v.dims;
  const grid = `${nx}x${ny}x${nz} voxels of ${v.spacingMm.map((s) => s.toFixed(2)).join('x')} mm`;
  if (nt === 1) return `${grid}, 3D`;
  const tr = v.trSec > 0 ? `, TR ${v.trSec.toFixed(3)} s (${(v.trSec * nt).toFixed(1)} s)` : ', TR unknown';
  return `${grid}, ${nt} volumes${tr}`;
}
