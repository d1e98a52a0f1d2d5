import { fail } from '../core/fail.js';
import { volumeLike, voxelsPerVolume, type Volume } from '../core/volume.js';
import { meanImage } from '../look/mean-image.js';
import { requireMask } from './require-mask.js';
import type { StepFunction } from './step-types.js';

/** Parameters of {@link grandMeanScaleStep}. */
export interface GrandMeanScaleParams {
  /** Value the in-mask mean of the temporal mean image is scaled to. __Default value:__ 10000 (common practice, no source). */
  target?: number;
}

/** Result of {@link grandMeanScale}. */
export interface GrandMeanScaleResult {
  volume: Volume;
  /** In-mask mean of the temporal mean image before scaling. */
  grandMean: number;
  /** The single factor every voxel of every volume was multiplied by. */
  factor: number;
}

/**
 * Multiply the whole run by one factor so the in-mask mean of its temporal mean image equals
 * `target`: intensities become comparable across runs while contrasts within a run are untouched.
 * @param volume - the run (not modified)
 * @param mask - brain mask on the run's grid
 * @param target - the value to scale to (default 10000)
 * @returns the scaled run, the grand mean before scaling and the factor
 * @throws BoldsweepError INVALID_ARGUMENT for a non-positive target or grand mean
 * @example const { volume, factor } = grandMeanScale(run.volume, mask)
 */
export function grandMeanScale(volume: Volume, mask: Uint8Array, target = 10000): GrandMeanScaleResult {
  if (!(target > 0) || !Number.isFinite(target)) fail('INVALID_ARGUMENT', `grand-mean-scale: target must be a finite number > 0, got ${target}`);
  const n = voxelsPerVolume(volume);
  const mean = meanImage(volume);
  let sum = 0, count = 0;
  for (let v = 0; v < n; v++) if (mask[v]) { sum += mean[v]; count++; }
  const grandMean = sum / count;
  if (!(grandMean > 0)) fail('INVALID_ARGUMENT', `grand-mean-scale: the in-mask mean intensity is ${grandMean}; scaling needs positive intensities`);
  const factor = target / grandMean;
  const out = volumeLike(volume, volume.dims[3]);
  const src = volume.data;
  for (let i = 0; i < src.length; i++) out.data[i] = src[i] * factor;
  return { volume: out, grandMean, factor };
}

/**
 * Preprocessing step: grand-mean scaling (see {@link grandMeanScale}); needs `context.mask`.
 * @param volume - the run (not modified)
 * @param params - target (default 10000)
 * @param context - must hold the brain mask
 * @returns the scaled run and its step note
 * @throws BoldsweepError INVALID_ARGUMENT (no mask, bad target), GRID_MISMATCH (mask of another size)
 * @example const { volume, note } = grandMeanScaleStep(run.volume, { target: 10000 }, context)
 */
export const grandMeanScaleStep: StepFunction<GrandMeanScaleParams> = (volume, params, context) => {
  const mask = requireMask(volume, context, 'grand-mean-scale');
  const target = params.target ?? 10000;
  const r = grandMeanScale(volume, mask, target);
  return {
    volume: r.volume,
    note: {
      step: 'grand-mean-scale',
      params: { target },
      summary: `Grand-mean scaling to ${target} (factor ${r.factor.toPrecision(5)})`,
      diagnostics: { grandMeanBefore: r.grandMean, factor: r.factor, target },
      methodsText: `The run was multiplied by a single factor (${r.factor.toPrecision(5)}) so that the mean over brain voxels of the temporal mean image was ${target}.`,
      citations: [],
    },
  };
};
