import type { Volume } from '../core/volume.js';
import { highFrequencyEnergy } from '../resample/high-frequency-energy.js';
import { imageFwhmMm } from '../resample/image-fwhm.js';
import type { InterpolationKernel } from '../resample/interpolation-kernel.js';
import { alignRun } from './align-run.js';
import type { AlignmentEstimate } from './alignment-estimate.js';

/** Sharpness of one way of aligning (see {@link oneResamplingSaving}). */
export interface AlignedSharpness {
  /** Resamplings each voxel went through. */
  resamplings: number;
  /** Image FWHM (Kiebel et al. 1999 derivative-variance formula over space) of each axis, mm, averaged over the volumes. */
  fwhmMm: [number, number, number];
  /** Geometric mean of the three, mm. */
  fwhmMeanMm: number;
  /** Spectral energy above half Nyquist of the mean aligned image, inside the region (same units for both routes). */
  highFrequencyAbove: number;
}

/** What one concatenated resampling saves against one resampling per stage. */
export interface OneResamplingSaving {
  concatenated: AlignedSharpness;
  staged: AlignedSharpness;
  /** How much wider the staged route's image FWHM is, percent of the concatenated one's. */
  fwhmIncreasePercent: number;
  /** Share of the concatenated route's high-frequency energy the staged route loses, percent. */
  highFrequencyLostPercent: number;
  /** Voxels measured (inside the head on both routes). */
  regionVoxels: number;
}

/**
 * Measure the blur that resampling at every stage adds, on a run: align it to the template both
 * ways (one concatenated resampling; one per stage) with the same kernel and the same estimate, then
 * compare the image FWHM (imageFwhmMm, per volume, averaged) and the spectral energy above half
 * Nyquist of the mean image (highFrequencyEnergy) inside the head, where both routes have data
 * (mean of the concatenated route above a fifth of its 99th percentile, staged route above zero).
 * @param run - the run on its raw grid (a few volumes are enough; not modified)
 * @param estimate - the alignment (estimated, or the phantom's truth)
 * @param kernel - interpolation kernel of every resampling
 * @returns both routes' sharpness and the differences
 * @example const s = await oneResamplingSaving(run.volume, estimate, 'linear'); s.fwhmIncreasePercent
 */
export async function oneResamplingSaving(run: Volume, estimate: AlignmentEstimate, kernel: InterpolationKernel): Promise<OneResamplingSaving> {
  const once = await alignRun(run, estimate, { concatenate: true, kernel });
  const staged = await alignRun(run, estimate, { concatenate: false, kernel });
  const dims = [once.volume.dims[0], once.volume.dims[1], once.volume.dims[2]] as [number, number, number];
  const n = dims[0] * dims[1] * dims[2];
  const nt = run.dims[3];
  const mean = (v: Volume) => {
    const m = new Float64Array(n);
    for (let t = 0; t < nt; t++) for (let p = 0; p < n; p++) m[p] += v.data[t * n + p] / nt;
    return m;
  };
  const meanOnce = mean(once.volume), meanStaged = mean(staged.volume);
  const sorted = Float64Array.from(meanOnce).sort();
  const high = sorted[Math.floor(0.99 * (n - 1))];
  const region = new Uint8Array(n);
  let regionVoxels = 0;
  for (let p = 0; p < n; p++) if (meanOnce[p] > 0.2 * high && meanStaged[p] > 0) { region[p] = 1; regionVoxels++; }
  const spacing = once.volume.spacingMm;
  const measure = (v: Volume, m: Float64Array, resamplings: number): AlignedSharpness => {
    const sum = [0, 0, 0];
    for (let t = 0; t < nt; t++) imageFwhmMm(v.data.subarray(t * n, (t + 1) * n), dims, spacing, region).forEach((f, a) => { sum[a] += f / nt; });
    const fwhmMm = sum as [number, number, number];
    return { resamplings, fwhmMm, fwhmMeanMm: Math.cbrt(fwhmMm[0] * fwhmMm[1] * fwhmMm[2]), highFrequencyAbove: highFrequencyEnergy(m, dims, region).above };
  };
  const a = measure(once.volume, meanOnce, once.resamplings);
  const b = measure(staged.volume, meanStaged, staged.resamplings);
  return {
    concatenated: a,
    staged: b,
    fwhmIncreasePercent: 100 * (b.fwhmMeanMm / a.fwhmMeanMm - 1),
    highFrequencyLostPercent: 100 * (1 - b.highFrequencyAbove / a.highFrequencyAbove),
    regionVoxels,
  };
}
