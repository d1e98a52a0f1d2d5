import { fail } from '../core/fail.js';
import { volumeLike, voxelsPerVolume, type Volume } from '../core/volume.js';
import { meanImage } from '../look/mean-image.js';
import { medianOf } from '../look/median-of.js';
import { requireMask } from './require-mask.js';
import type { StepFunction } from './step-types.js';

/** Parameters of {@link percentSignalChangeStep}. */
export interface PercentSignalChangeParams {
  /**
   * Brain voxels whose temporal mean is below this fraction of the robust brain mean (the median of
   * the temporal means inside the mask) are excluded: set to 0 and counted, never divided.
   * __Default value:__ 0.1 (far below any tissue's mean, so only signal dropout and stray mask voxels go).
   */
  minMeanFraction?: number;
  /**
   * false: 100 y / mean (each voxel's mean becomes 100, so a fitted effect reads directly as percent);
   * true: 100 (y - mean) / mean (mean 0). __Default value:__ false.
   */
  centred?: boolean;
}

/** Result of {@link percentSignalChange}. */
export interface PercentSignalChangeResult {
  volume: Volume;
  /** Median temporal mean inside the mask. */
  robustBrainMean: number;
  /** Smallest temporal mean scaled: minMeanFraction x robustBrainMean. */
  minMeanAllowed: number;
  maskVoxels: number;
  scaledVoxels: number;
  /** Mask voxels set to 0 because their mean was below minMeanAllowed. */
  excludedVoxels: number;
}

/**
 * Convert each brain voxel's time series to percent of its own temporal mean. Outside the mask and
 * for excluded voxels the output is 0. Arithmetic in Float64, stored as Float32.
 * @param volume - the run (not modified)
 * @param mask - brain mask on the run's grid
 * @param params - minMeanFraction (default 0.1), centred (default false)
 * @returns the scaled run and the counts
 * @throws BoldsweepError INVALID_ARGUMENT for a fraction outside [0, 1) or a non-positive robust brain mean
 * @example const { volume, excludedVoxels } = percentSignalChange(run.volume, mask, {})
 */
export function percentSignalChange(volume: Volume, mask: Uint8Array, params: PercentSignalChangeParams = {}): PercentSignalChangeResult {
  const fraction = params.minMeanFraction ?? 0.1;
  if (!(fraction >= 0 && fraction < 1)) fail('INVALID_ARGUMENT', `percent-signal-change: minMeanFraction must be in [0, 1), got ${fraction}`);
  const n = voxelsPerVolume(volume);
  const nt = volume.dims[3];
  const mean = meanImage(volume);
  const inMask: number[] = [];
  for (let v = 0; v < n; v++) if (mask[v]) inMask.push(mean[v]);
  const robust = medianOf(inMask);
  if (!(robust > 0)) fail('INVALID_ARGUMENT', `percent-signal-change: the median temporal mean inside the mask is ${robust}; percent signal change needs positive intensities`);
  const minMean = fraction * robust;
  // per voxel: multiplier 100/mean (0 when excluded) and offset (100 when centred)
  const gain = new Float64Array(n);
  let scaled = 0, excluded = 0;
  for (let v = 0; v < n; v++) {
    if (!mask[v]) continue;
    // a mean of exactly minMean is kept; below it (including <= 0) the voxel is excluded, never divided
    if (mean[v] >= minMean && mean[v] > 0) {
      gain[v] = 100 / mean[v];
      scaled++;
    } else excluded++;
  }
  const offset = params.centred ? 100 : 0;
  const out = volumeLike(volume, nt);
  const src = volume.data;
  const dst = out.data;
  for (let t = 0; t < nt; t++) {
    const o = t * n;
    for (let v = 0; v < n; v++) {
      const g = gain[v];
      dst[o + v] = g === 0 ? 0 : g * src[o + v] - offset;
    }
  }
  return { volume: out, robustBrainMean: robust, minMeanAllowed: minMean, maskVoxels: scaled + excluded, scaledVoxels: scaled, excludedVoxels: excluded };
}

/**
 * Preprocessing step: percent signal change per voxel inside the brain mask (see
 * {@link percentSignalChange}); needs `context.mask`.
 * @param volume - the run (not modified)
 * @param params - minMeanFraction, centred
 * @param context - must hold the brain mask
 * @returns the scaled run and its step note
 * @throws BoldsweepError INVALID_ARGUMENT (no mask, bad fraction), GRID_MISMATCH (mask of another size)
 * @example const { volume, note } = percentSignalChangeStep(run.volume, {}, { sidecar, events, mask })
 */
export const percentSignalChangeStep: StepFunction<PercentSignalChangeParams> = (volume, params, context) => {
  const mask = requireMask(volume, context, 'percent-signal-change');
  const r = percentSignalChange(volume, mask, params);
  const fraction = params.minMeanFraction ?? 0.1;
  const centred = params.centred ?? false;
  const formula = centred ? '100 (y - m) / m' : '100 y / m';
  return {
    volume: r.volume,
    note: {
      step: 'percent-signal-change',
      params: { minMeanFraction: fraction, centred },
      summary: `Percent signal change (${formula}) in ${r.scaledVoxels} brain voxels; ${r.excludedVoxels} excluded for a mean below ${(fraction * 100).toFixed(0)}% of the brain median`,
      diagnostics: { robustBrainMean: r.robustBrainMean, minMeanAllowed: r.minMeanAllowed, maskVoxels: r.maskVoxels, scaledVoxels: r.scaledVoxels, excludedVoxels: r.excludedVoxels, centred },
      methodsText: `Each brain voxel's time series y was expressed as percent signal change, ${formula}, with m its temporal mean` +
        `${centred ? ' (so the series has mean 0)' : ' (so the series has mean 100)'}; voxels whose mean was below ${fraction} times the median brain mean ` +
        `(${r.excludedVoxels} of ${r.maskVoxels}) and voxels outside the brain mask were set to zero.`,
      citations: [],
    },
  };
};
