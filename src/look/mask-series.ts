import type { Volume } from '../core/volume.js';
import { maskSeriesPass } from './mask-series-pass.js';

/** Per-volume traces inside a mask, from {@link maskSeries}. */
export interface MaskSeries {
  /** Mean signal in the mask per volume (signal units). */
  globalMean: Float64Array;
  /**
   * DVARS per volume: sqrt(mean over mask voxels of (I_t - I_{t-1})^2), signal units (Smyser et al.
   * 2010 Cereb Cortex 20:2852; Power et al. 2012 NeuroImage 59:2142). NaN for volume 0.
   */
  dvars: Float64Array;
  /** Mean signal of the mask voxels of slice z in volume t at [z * nt + t]; NaN for slices with too few mask voxels. */
  sliceMean: Float64Array;
  /** Mask voxels in each slice. */
  sliceVoxels: Int32Array;
  /** Slices with fewer mask voxels than this get NaN slice means. */
  minSliceVoxels: number;
}

/**
 * Global mean, DVARS and per-slice means of the voxels in a mask, one pass over the run in memory
 * order: the mask voxels are visited as contiguous runs, slice by slice, four volumes at a time with
 * the sums in registers (each value is read once; see maskSeriesPass, which the look also has compute
 * the motion edge signature's changes from the same reads).
 * @param run - the run (not modified)
 * @param mask - nonzero = in, length nx*ny*nz; voxels must be finite in every volume
 * @param options - minSliceVoxels (default 10): slices with fewer mask voxels are not summarised
 * @returns the per-volume traces
 * @throws BoldsweepError INVALID_ARGUMENT when the mask is empty or of the wrong length
 * @example const { globalMean, dvars } = maskSeries(run.volume, brain.mask)
 */
export function maskSeries(run: Volume, mask: ArrayLike<number>, options: { minSliceVoxels?: number } = {}): MaskSeries {
  return maskSeriesPass(run, mask, options.minSliceVoxels ?? 10, null).series;
}
