import { fail } from '../core/fail.js';
import { volumeLike, voxelsPerVolume } from '../core/volume.js';
import { dctBasis, dctRegressorCount, polynomialBasis } from '../model/drift-basis.js';
import { projectOutBasis } from './project-out-basis.js';
import type { StepFunction } from './step-types.js';

/** Parameters of {@link highpassStep}. */
export interface HighpassParams {
  /** Cutoff period in seconds: slower fluctuations are removed. __Default value:__ 128 (common practice, no source). */
  cutoffSec?: number;
}

/** Parameters of {@link detrendStep}. */
export interface DetrendParams {
  /** Highest Legendre polynomial order removed (0 = mean only, 1 = linear, 2 = quadratic ...). __Default value:__ 2. */
  order?: number;
}

/**
 * Preprocessing step: high-pass filter each voxel's time series by removing its least-squares fit
 * on the discrete cosine drift basis (see dctBasis in src/model/drift-basis.ts:
 * floor(2 nt TR / cutoffSec) + 1 columns, constant included) and keeping its mean.
 * @param volume - the run (not modified); needs trSec > 0
 * @param params - cutoffSec (default 128)
 * @returns the filtered run and its step note
 * @throws BoldsweepError TR_MISSING without a TR; INVALID_ARGUMENT for a cutoff that is not positive or would remove everything
 * @example const { volume, note } = highpassStep(run.volume, { cutoffSec: 128 }, context)
 */
export const highpassStep: StepFunction<HighpassParams> = (volume, params) => {
  const cutoffSec = params.cutoffSec ?? 128;
  const nt = volume.dims[3];
  if (!(volume.trSec > 0)) fail('TR_MISSING', 'highpass: the run has no repetition time (trSec is 0)');
  if (!(cutoffSec > 0)) fail('INVALID_ARGUMENT', `highpass: cutoffSec must be > 0 seconds, got ${cutoffSec}`);
  const basis = dctBasis(nt, volume.trSec, cutoffSec);
  const out = volumeLike(volume, nt);
  projectOutBasis(volume.data, voxelsPerVolume(volume), nt, basis, out.data);
  const k = dctRegressorCount(nt, volume.trSec, cutoffSec);
  const cutoffHz = 1 / cutoffSec;
  return {
    volume: out,
    note: {
      step: 'highpass',
      params: { cutoffSec },
      summary: `High-pass filter, cutoff ${cutoffSec} s (${k - 1} cosine regressors removed, mean kept)`,
      diagnostics: { cutoffSec, cutoffHz, cosineRegressors: k - 1, regressorsWithConstant: k, runDurationSec: nt * volume.trSec },
      methodsText: k === 1
        ? `No drift was removed: a ${cutoffSec} s high-pass cutoff is longer than twice the run (${(2 * nt * volume.trSec).toFixed(0)} s), so no cosine regressor fits below it.`
        : `Slow signal drifts were removed with a high-pass filter of ${cutoffSec} s cutoff (${cutoffHz.toFixed(4)} Hz): each voxel's least-squares fit on ` +
          `${k - 1} discrete cosine regressors (periods from ${(2 * nt * volume.trSec).toFixed(0)} s down to ${((2 * nt * volume.trSec) / (k - 1)).toFixed(0)} s) was subtracted and its mean kept.`,
      citations: [],
    },
  };
};

/**
 * Preprocessing step: remove a Legendre polynomial trend of the given order from each voxel's time
 * series by least squares, keeping its mean.
 * @param volume - the run (not modified)
 * @param params - order (default 2)
 * @returns the detrended run and its step note
 * @throws BoldsweepError INVALID_ARGUMENT for an order that is not an integer in 0..nt-2
 * @example const { volume, note } = detrendStep(run.volume, { order: 2 }, context)
 */
export const detrendStep: StepFunction<DetrendParams> = (volume, params) => {
  const order = params.order ?? 2;
  const nt = volume.dims[3];
  if (!Number.isInteger(order) || order < 0 || order > nt - 2) fail('INVALID_ARGUMENT', `detrend: order must be an integer from 0 to ${nt - 2} (volumes - 2), got ${order}`);
  const out = volumeLike(volume, nt);
  projectOutBasis(volume.data, voxelsPerVolume(volume), nt, polynomialBasis(nt, order), out.data);
  const names = ['constant', 'linear', 'quadratic', 'cubic'];
  const what = order < names.length ? names[order] : `order-${order}`;
  return {
    volume: out,
    note: {
      step: 'detrend',
      params: { order },
      summary: `Polynomial detrending, order ${order} (${what}), mean kept`,
      diagnostics: { order, regressors: order + 1 },
      methodsText: order === 0
        ? 'No trend was removed (polynomial order 0 keeps the mean only).'
        : `A Legendre polynomial trend of order ${order} was removed from each voxel's time series by least squares, keeping its mean.`,
      citations: [],
    },
  };
};
