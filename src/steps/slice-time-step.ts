import { fail } from '../core/fail.js';
import { volumeLike } from '../core/volume.js';
import { checkSliceTimes } from '../acquire/check-slice-times.js';
import { sliceOrderTiming, type SliceOrder } from '../acquire/slice-order-timing.js';
import { shiftSliceSeries, type ShiftMethod } from './shift-slice-series.js';
import { sliceTimingGuidance } from '../model/slice-timing-guidance.js';
import type { StepContext, StepFunction } from './step-types.js';

/** Methods of the slice-time step: a shift by interpolation, or the model-based alternative. */
export const SLICE_TIME_METHODS = ['linear', 'cubic', 'fourier', 'model'] as const;
/** One of {@link SLICE_TIME_METHODS}. */
export type SliceTimeMethod = (typeof SLICE_TIME_METHODS)[number];


/** Parameters of {@link sliceTimeStep}. */
export interface SliceTimeParams {
  /**
   * 'linear', 'cubic' (Keys a = -1/2), 'fourier' (sinc, by the shift theorem) shift each slice's
   * series to the reference time; 'model' leaves the data as acquired and has the model sample each
   * slice's regressors at that slice's own time. __Default value:__ 'fourier'
   */
  method?: SliceTimeMethod;
  /**
   * Bring every slice to this slice's acquisition time (0-based index along the third axis); not
   * with referenceSec. __Default value:__ none (the middle of the TR, TR / 2)
   */
  referenceSlice?: number;
  /**
   * Bring every slice to this time, seconds from the start of each volume (0 to below TR); not with
   * referenceSlice. __Default value:__ none (the middle of the TR, TR / 2)
   */
  referenceSec?: number;
  /**
   * Generate the slice times in this order instead of reading the sidecar's SliceTiming.
   * __Default value:__ none (the slice times the run's context carries, from SliceTiming)
   */
  order?: SliceOrder;
  /** Slices read at once, with `order`. __Default value:__ 1 */
  multibandFactor?: number;
}

/** The reference time (s within the volume) the parameters name. */
function referenceTimeSec(params: SliceTimeParams, times: Float64Array, trSec: number): { timeSec: number; label: string } {
  if (params.referenceSlice !== undefined && params.referenceSec !== undefined) fail('SLICE_TIME_REFERENCE_INVALID', `give referenceSlice (${params.referenceSlice}) or referenceSec (${params.referenceSec}), not both`);
  if (params.referenceSlice === undefined && params.referenceSec === undefined) return { timeSec: trSec / 2, label: `the middle of the TR (${trSec / 2} s)` };
  if (params.referenceSlice !== undefined) {
    const k = params.referenceSlice;
    if (!Number.isInteger(k) || k < 0 || k >= times.length) fail('SLICE_TIME_REFERENCE_INVALID', `reference slice ${String(k)} is not a slice of this run (0 to ${times.length - 1})`);
    return { timeSec: times[k], label: `the acquisition time of slice ${k} (${times[k]} s)` };
  }
  const t = params.referenceSec as number;
  if (!(t >= 0 && t < trSec)) fail('SLICE_TIME_REFERENCE_INVALID', `reference time ${String(t)} s is not inside the TR of ${trSec} s`);
  return { timeSec: t, label: `${t} s after the start of each volume` };
}

/** Slice times the step works with: generated from `order`, else the context's, else the sidecar's (checked). */
function sliceTimes(params: SliceTimeParams, context: StepContext, nz: number, trSec: number): { times: Float64Array; source: string } {
  if (params.order !== undefined) {
    const m = params.multibandFactor ?? 1;
    return { times: Float64Array.from(sliceOrderTiming(nz, trSec, params.order, { multibandFactor: m })), source: `generated (${params.order}${m > 1 ? `, multiband factor ${m}` : ''})` };
  }
  const given = context.sliceTimesSec ?? context.sidecar?.SliceTiming ?? null;
  if (!given) fail('SLICE_TIMING_MISSING', `the run's sidecar has no SliceTiming and the step was given no order`);
  const direction = context.sidecar?.SliceEncodingDirection;
  if (direction !== undefined && direction !== 'k' && direction !== 'k-') fail('SLICE_AXIS_UNSUPPORTED', `the sidecar's SliceEncodingDirection is '${String(direction)}'`);
  const times = checkSliceTimes(given, nz, trSec, 'the sidecar SliceTiming');
  // BIDS: with a reversed slice-encode direction SliceTiming lists the slices from the last index
  // (as acquisitionModel reads it); aligned times (all equal) are the same either way
  if (direction === 'k-') times.reverse();
  return { times, source: 'the sidecar SliceTiming' };
}

const METHOD_WORDS: Record<SliceTimeMethod, string> = {
  linear: 'linear interpolation',
  cubic: 'cubic convolution interpolation (Keys, a = -1/2)',
  fourier: 'Fourier (sinc) interpolation',
  model: 'slice-specific model timing',
};

/**
 * Preprocessing step: slice-timing correction. Each slice (along the third image axis) was read at
 * its own time within the volume; a shift method moves every slice's time series to the reference
 * time (out[n] = series at n + (reference - slice time) / TR, by linear, cubic or Fourier
 * interpolation: see shiftSliceSeries for each and for the handling of the run's ends) and hands on
 * slice times that are all the reference. Method 'model' leaves the data as acquired and marks the
 * context (`modelAtSliceTimes`) so the model samples each slice's regressors at its own time (one
 * design per slice time). The note carries the guidance for the run's TR (sliceTimingGuidance): at
 * long TR shifting is advised against, and aliased physiological rhythms are named.
 * @param volume - the run (not modified); slices along the third axis; needs trSec > 0
 * @param params - method, referenceSlice or referenceSec, order, multibandFactor
 * @param context - slice times (sliceTimesSec, else the sidecar's SliceTiming); the frame must not be a target grid
 * @returns the shifted run (or the run itself for 'model'), the note and the updated context
 * @throws BoldsweepError TR_MISSING; SLICE_AXIS_UNSUPPORTED for slices along another axis; SLICE_TIMING_MISSING, SLICE_TIMING_LENGTH, SLICE_TIMING_INVALID,
 *   SLICE_TIMING_MULTIBAND for slice times that are absent or do not fit the run;
 *   SLICE_TIME_REFERENCE_INVALID; INVALID_ARGUMENT on a resampled grid or for an unknown method
 * @example const { volume, note } = sliceTimeStep(run.volume, { method: 'fourier' }, context)
 */
export const sliceTimeStep: StepFunction<SliceTimeParams> = (volume, params, context) => {
  const method = params.method ?? 'fourier';
  if (!(SLICE_TIME_METHODS as readonly string[]).includes(method)) fail('INVALID_ARGUMENT', `slice-time: method must be one of ${SLICE_TIME_METHODS.join(', ')}, got '${String(method)}'`);
  const trSec = volume.trSec;
  if (!(trSec > 0)) fail('TR_MISSING', 'slice-time: the run has no repetition time (trSec is 0)');
  if (context.frame?.kind === 'target') fail('INVALID_ARGUMENT', 'slice-time: the run was resampled onto another grid, where voxels no longer belong to one acquired slice; put slice-time before geometric steps');
  const [, , nz, nt] = volume.dims;
  const { times, source } = sliceTimes(params, context, nz, trSec);
  const ref = referenceTimeSec(params, times, trSec);
  const reference = params.referenceSlice !== undefined ? { referenceSlice: params.referenceSlice } : params.referenceSec !== undefined ? { referenceSec: params.referenceSec } : {};
  const guidance = sliceTimingGuidance(trSec);
  const shifts = Float64Array.from(times, (t) => (ref.timeSec - t) / trSec);
  let maxShift = 0;
  for (const d of shifts) maxShift = Math.max(maxShift, Math.abs(d));
  const advisedAgainst = method !== 'model' && guidance.longTr;
  const diagnostics: Record<string, number | string | boolean | number[]> = {
    method, referenceSec: ref.timeSec, trSec, largestShiftVolumes: maxShift, largestShiftSec: maxShift * trSec,
    sliceTimesSource: source, longTr: guidance.longTr, advisedMethod: guidance.advised, shiftAdvisedAgainst: advisedAgainst,
    nyquistHz: guidance.nyquistHz,
  };
  for (const r of guidance.rhythms) {
    diagnostics[`${r.name}AliasedHz`] = r.aliasedHz;
    diagnostics[`${r.name}Aliases`] = r.aliases;
  }
  diagnostics.guidance = guidance.lines.join(' ');
  const citations = method === 'model'
    ? ['Henson RNA, Buechel C, Josephs O, Friston KJ (1999) NeuroImage 9:S125', 'Sladky R et al. (2011) NeuroImage 58:588-594']
    : ['Sladky R et al. (2011) NeuroImage 58:588-594', ...(method === 'cubic' ? ['Keys RG (1981) IEEE Trans Acoust Speech Signal Process 29:1153-1160'] : method === 'fourier' ? ['Shannon CE (1949) Proc IRE 37:10-21'] : [])];
  if (method === 'model') {
    return {
      volume,
      note: {
        step: 'slice-time', params: { method, ...reference, ...(params.order ? { order: params.order, multibandFactor: params.multibandFactor ?? 1 } : {}) },
        summary: `Slice timing in the model: each slice's regressors sampled at its own acquisition time (${source}); data not shifted`,
        diagnostics,
        methodsText: `Slice timing was accounted for in the model rather than by shifting the data: the task regressors of each slice were sampled at that slice's acquisition time (from ${source}; TR ${trSec} s).`,
        citations,
      },
      context: { ...context, sliceTimesSec: times, modelAtSliceTimes: true },
    };
  }
  const out = volumeLike(volume, nt, context.outputBuffer?.(volume.data.length) ?? new Float32Array(volume.data.length));
  shiftSliceSeries(volume.data, volume.dims, shifts, method, out.data);
  const ends = method === 'fourier'
    ? 'after removing each series\' least-squares line and extending it by its mirror image at both ends, tapered to zero'
    : 'extending each series by its end values';
  return {
    volume: out,
    note: {
      step: 'slice-time', params: { method, ...reference, ...(params.order ? { order: params.order, multibandFactor: params.multibandFactor ?? 1 } : {}) },
      summary: `Slice timing by ${METHOD_WORDS[method]} to ${ref.label}; largest shift ${(maxShift * trSec).toFixed(3)} s${advisedAgainst ? ` (advised against at TR ${trSec} s: consider method 'model')` : ''}`,
      diagnostics,
      methodsText: `Each slice's time series was shifted by ${METHOD_WORDS[method]} to ${ref.label} of each ${trSec} s volume (slice times from ${source}; largest shift ${(maxShift * trSec).toFixed(3)} s), ${ends}.`,
      citations,
    },
    context: { ...context, sliceTimesSec: new Float64Array(nz).fill(ref.timeSec), modelAtSliceTimes: false },
  };
};
