import { affineSpacing, invertAffine, type Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { smoothVolume3d } from '../filter/gaussian-smooth.js';
import type { ImageOnGrid } from './registration-types.js';

/** The moving image at one multi-resolution level, ready to be sampled. */
export interface MovingLevel {
  /** Smoothed voxel values. */
  data: Float32Array;
  dims: [number, number, number];
  /** World (mm) -> voxel index. */
  voxelFromWorld: Affine;
  /** [min, max] of the smoothed values (the moving histogram range). */
  range: [number, number];
}

/**
 * The moving image smoothed for a level (isotropic Gaussian of the level's FWHM in mm; none for 0).
 * @param moving - the moving image (not modified)
 * @param fwhmMm - the level's FWHM (see levelFwhmMm)
 * @returns the level's moving image
 * @throws BoldsweepError INVALID_ARGUMENT for a grid with fewer than 2 voxels along an axis or a data length that does not match
 * @example const m = movingLevel(volume, level.fwhmMm)
 */
export function movingLevel(moving: ImageOnGrid, fwhmMm: number): MovingLevel {
  const [nx, ny, nz] = moving.grid.dims;
  if (nx < 2 || ny < 2 || nz < 2) fail('INVALID_ARGUMENT', `the moving image needs at least 2 voxels along each axis for interpolation, got ${nx}x${ny}x${nz}`);
  if (moving.data.length !== nx * ny * nz) fail('INVALID_ARGUMENT', `the moving image has ${moving.data.length} values, its grid ${nx}x${ny}x${nz} needs ${nx * ny * nz}`);
  const data = fwhmMm > 0 ? smoothVolume3d(moving.data, [nx, ny, nz], affineSpacing(moving.grid.affine), fwhmMm, { mode: 'nearest' }) : moving.data;
  let lo = Infinity, hi = -Infinity;
  for (let p = 0; p < data.length; p++) { const v = data[p]; if (v < lo) lo = v; if (v > hi) hi = v; }
  return { data, dims: [nx, ny, nz], voxelFromWorld: invertAffine(moving.grid.affine), range: [lo, hi] };
}
