import { affineSpacing } from '../core/affine.js';
import type { ImageOnGrid } from './registration-types.js';

/**
 * Smoothing of a level: isotropic FWHM sqrt(f^2 - 1 + s^2) x the fixed grid's largest voxel size in
 * mm, where s is the finest level's FWHM in voxels (sqrt(f^2 - 1) voxels is the width that takes
 * one-voxel resolution to f voxels; with s = 1, level f is smoothed to f voxels).
 * @param factor - subsampling factor f >= 1
 * @param fixed - the fixed image
 * @param finestFwhmVoxels - s, the FWHM at f = 1 in voxels (0 = none)
 * @returns FWHM in mm
 * @example levelFwhmMm(4, fixed, 1) // 4 x voxel size
 */
export function levelFwhmMm(factor: number, fixed: Pick<ImageOnGrid, 'grid'>, finestFwhmVoxels: number): number {
  return Math.sqrt(Math.max(0, factor * factor - 1 + finestFwhmVoxels * finestFwhmVoxels)) * Math.max(...affineSpacing(fixed.grid.affine));
}
