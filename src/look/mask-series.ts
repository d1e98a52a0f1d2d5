import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';

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
 * Global mean, DVARS and per-slice means of the voxels in a mask, one pass over the run: each
 * volume's mask voxels are visited once; the previous volume (for DVARS) is still in cache.
 * @param run - the run (not modified)
 * @param mask - nonzero = in, length nx*ny*nz; voxels must be finite in every volume
 * @param options - minSliceVoxels (default 10): slices with fewer mask voxels are not summarised
 * @returns the per-volume traces
 * @throws BoldsweepError INVALID_ARGUMENT when the mask is empty or of the wrong length
 * @example const { globalMean, dvars } = maskSeries(run.volume, brain.mask)
 */
export function maskSeries(run: Volume, mask: ArrayLike<number>, options: { minSliceVoxels?: number } = {}): MaskSeries {
  const n = voxelsPerVolume(run);
  const [nx, ny, nz, nt] = run.dims;
  if (mask.length !== n) fail('INVALID_ARGUMENT', `mask length ${mask.length} does not match the run's ${nx}x${ny}x${nz} grid`);
  const minSliceVoxels = options.minSliceVoxels ?? 10;
  let m = 0;
  for (let v = 0; v < n; v++) if (mask[v]) m++;
  if (m === 0) fail('INVALID_ARGUMENT', 'the mask is empty');
  const index = new Int32Array(m);
  const sliceOf = new Int32Array(m);
  const sliceVoxels = new Int32Array(nz);
  const nxy = nx * ny;
  for (let v = 0, i = 0; v < n; v++) {
    if (!mask[v]) continue;
    index[i] = v;
    sliceOf[i] = Math.floor(v / nxy);
    sliceVoxels[sliceOf[i]]++;
    i++;
  }
  const globalMean = new Float64Array(nt);
  const dvars = new Float64Array(nt);
  const sliceMean = new Float64Array(nz * nt);
  const sliceAcc = new Float64Array(nz);
  const data = run.data;
  dvars[0] = NaN;
  for (let t = 0; t < nt; t++) {
    const base = t * n;
    const prevBase = base - n;
    sliceAcc.fill(0);
    let s = 0, d2 = 0;
    for (let i = 0; i < m; i++) {
      const v = index[i];
      const y = data[base + v];
      s += y;
      sliceAcc[sliceOf[i]] += y;
      if (t > 0) { const d = y - data[prevBase + v]; d2 += d * d; }
    }
    globalMean[t] = s / m;
    if (t > 0) dvars[t] = Math.sqrt(d2 / m);
    for (let z = 0; z < nz; z++) sliceMean[z * nt + t] = sliceVoxels[z] >= minSliceVoxels ? sliceAcc[z] / sliceVoxels[z] : NaN;
  }
  return { globalMean, dvars, sliceMean, sliceVoxels, minSliceVoxels };
}
