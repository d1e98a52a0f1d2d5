import { applyUnwarp } from '../acquire/apply-unwarp.js';
import { b0Readout } from '../acquire/b0-readout.js';
import { imageAgreement } from '../acquire/image-agreement.js';
import { checkPhaseEncodePair } from '../acquire/phase-encode-pair.js';
import { planUnwarp, UNWARP_KERNELS, type UnwarpKernel } from '../acquire/plan-unwarp.js';
import { unwarpPhaseEncodePair } from '../acquire/unwarp-phase-encode-pair.js';
import { shiftMapVoxels } from '../acquire/shift-map-voxels.js';
import { unrecoverableSignal } from '../acquire/unrecoverable-signal.js';
import { fail } from '../core/fail.js';
import { dilateMask } from '../look/binary-morphology.js';
import { SIGNAL_LOSS_NEAR_MASK_VOXELS } from '../look/signal-loss-look.js';
import { makeVolume, voxelsPerVolume, type Volume } from '../core/volume.js';
import type { StepContext, StepFunction } from './step-types.js';

/** Where the unwarping step takes the B0 field from. */
export type UnwarpMethod = 'none' | 'field-map' | 'reversed-pe';

/** The unwarping methods, simplest first. */
export const UNWARP_METHODS: readonly UnwarpMethod[] = ['none', 'field-map', 'reversed-pe'];

/** Parameters of {@link unwarpStep}. */
export interface UnwarpStepParams {
  /** 'field-map' (the context's field map in Hz), 'reversed-pe' (the context's reversed phase-encode pair) or 'none'. */
  method: UnwarpMethod;
  /** Interpolation along the phase-encode lines. __Default value:__ 'linear' */
  kernel?: UnwarpKernel;
  /** Intensity (Jacobian) correction. __Default value:__ true */
  jacobian?: boolean;
}

/** What the step estimates once from the unplanted run: the shift map of the run and what it says. */
export interface UnwarpEstimate {
  method: UnwarpMethod;
  /** Shift of the run's signal along phase encode, voxels, in the undistorted space; null for 'none'. */
  shiftVoxels: Float32Array | null;
  /** Phase-encode voxel axis of the run. */
  axis: 0 | 1 | 2;
  /** The field, Hz, on the run's grid the shift came from (given, or estimated from the pair); null for 'none'. */
  fieldHz: Float32Array | null;
  /** Numbers for the step note. */
  diagnostics: Record<string, number>;
}

const METHOD_CITATIONS: Record<UnwarpMethod, string[]> = {
  'none': [],
  'field-map': ['Jezzard P, Balaban RS (1995) Correction for geometric distortion in echo planar images from B0 field variations. Magn Reson Med 34:65-73 [memory]'],
  'reversed-pe': [
    'Chang H, Fitzpatrick JM (1992) A technique for accurate magnetic resonance imaging in the presence of field inhomogeneities. IEEE Trans Med Imaging 11:319-329 [memory]',
    'Jezzard P, Balaban RS (1995) Correction for geometric distortion in echo planar images from B0 field variations. Magn Reson Med 34:65-73 [memory]',
  ],
};

/** FWHM (voxels) of the regularisation of a reversed phase-encode estimate across lines. */
export const UNWARP_PAIR_SMOOTH_FWHM_VOXELS = 2;

/**
 * What the unwarping step estimates from the run (not planted): the shift map of the run's signal
 * along its phase-encode axis, from the field map (`field-map`) or from the reversed phase-encode
 * pair (`reversed-pe`: the pair's displacement by {@link unwarpPhaseEncodePair}, turned into Hz
 * with the pair's readout and into the run's shift with the run's), plus the voxels whose signal is
 * lost ({@link unrecoverableSignal}) inside the brain mask and within 2 voxels of it.
 * @param volume - the run (its grid and TR only)
 * @param params - method
 * @param context - sidecar (PhaseEncodingDirection, TotalReadoutTime or EffectiveEchoSpacing, EchoTime), fieldMapHz or phaseEncodePair, mask
 * @returns the estimate
 * @throws BoldsweepError UNWARP_INPUT_MISSING without the field map or pair the method needs;
 *   PHASE_ENCODE_MISSING, PHASE_ENCODE_INVALID, READOUT_TIME_MISSING for a sidecar without them;
 *   GRID_MISMATCH for a field map of another size; PHASE_ENCODE_PAIR_INVALID
 * @example const e = unwarpEstimate(run.volume, { method: 'field-map' }, { ...context, fieldMapHz })
 */
export function unwarpEstimate(volume: Volume, params: UnwarpStepParams, context: StepContext): UnwarpEstimate {
  const method = checkMethod(params.method);
  const dims: [number, number, number] = [volume.dims[0], volume.dims[1], volume.dims[2]];
  const n = voxelsPerVolume(volume);
  if (method === 'none') return { method, shiftVoxels: null, axis: 1, fieldHz: null, diagnostics: {} };
  const readout = b0Readout(context.sidecar, dims);
  const diagnostics: Record<string, number> = {};
  let fieldHz: Float32Array;
  if (method === 'field-map') {
    const f = context.fieldMapHz;
    if (!f) fail('UNWARP_INPUT_MISSING', 'unwarp method field-map: no field map was given');
    if (f.length !== n) fail('GRID_MISMATCH', `the field map has ${f.length} voxels, the run's grid ${n}`);
    fieldHz = Float32Array.from(f);
  } else {
    const pair = context.phaseEncodePair;
    if (!pair) fail('UNWARP_INPUT_MISSING', 'unwarp method reversed-pe: no reversed phase-encode pair was given');
    const a = checkPhaseEncodePair(pair, n);
    if (a.axis !== readout.phaseEncodeAxis) fail('PHASE_ENCODE_PAIR_INVALID', `the pair is phase-encoded along voxel axis ${a.axis}, the run along ${readout.phaseEncodeAxis}`);
    const u = unwarpPhaseEncodePair(pair, dims, UNWARP_PAIR_SMOOTH_FWHM_VOXELS);
    fieldHz = u.fieldHz;
    // the pair's agreement inside the mask before and after unwarping each image with its half
    const before = imageAgreement(pair.imageA, pair.imageB, context.mask);
    const after = imageAgreement(u.unwarpedA, u.unwarpedB, context.mask);
    Object.assign(diagnostics, {
      pairLinesMatched: u.linesMatched,
      pairCorrelationBefore: round(before.correlation, 4), pairCorrelationAfter: round(after.correlation, 4),
      pairMeanAbsDifferenceBefore: round(before.meanAbsDifference, 2), pairMeanAbsDifferenceAfter: round(after.meanAbsDifference, 2),
    });
  }
  const shiftVoxels = shiftMapVoxels(fieldHz, { totalReadoutTimeSec: readout.totalReadoutTimeSec, sign: readout.phaseEncodeSign });
  const te = typeof context.sidecar?.EchoTime === 'number' ? context.sidecar.EchoTime : null;
  const loss = unrecoverableSignal(fieldHz, dims, shiftVoxels, readout.phaseEncodeAxis, te);
  let maxShift = 0, lostInMask = 0, inMask = 0, lostNearMask = 0;
  // a mask from the mean image leaves out the voids dephasing makes at its edge: count those too
  let near: Uint8Array | null = context.mask ? Uint8Array.from(context.mask, (x) => (x ? 1 : 0)) : null;
  for (let r = 0; near && r < SIGNAL_LOSS_NEAR_MASK_VOXELS; r++) near = dilateMask(near, dims);
  for (let v = 0; v < n; v++) {
    if (loss.lost[v] && (!near || near[v])) lostNearMask++;
    if (context.mask && !context.mask[v]) continue;
    inMask++;
    maxShift = Math.max(maxShift, Math.abs(shiftVoxels[v]));
    if (loss.lost[v]) lostInMask++;
  }
  Object.assign(diagnostics, {
    totalReadoutTimeSec: readout.totalReadoutTimeSec, maxAbsShiftVoxels: round(maxShift, 3),
    lostVoxelsInMask: lostInMask, lostVoxelsNearMask: lostNearMask, lostPercentOfMask: inMask > 0 ? round((100 * lostInMask) / inMask, 2) : 0,
  });
  return { method, shiftVoxels, axis: readout.phaseEncodeAxis, fieldHz, diagnostics };
}

/**
 * Preprocessing step: undo the geometric distortion of an EPI run along its phase-encode axis. Every
 * volume is read along its phase-encode lines at y + shift(y) (the shift map from the field map or
 * the reversed phase-encode pair, {@link unwarpEstimate}) and, with `jacobian`, multiplied by
 * 1 + d(shift)/dy so each line keeps its signal ({@link planUnwarp}, {@link applyUnwarp}). The
 * output stays on the run's grid, in the undistorted space (the frame's kind does not change). The
 * field is taken as fixed to the scanner grid: with a moving head, unwarp after motion correction.
 * @param volume - the run (not modified)
 * @param params - method, kernel, jacobian
 * @param context - as for {@link unwarpEstimate}; outputBuffer used
 * @param estimate - the estimate from the unplanted run (computed here when absent)
 * @returns the unwarped run and its note
 * @throws BoldsweepError as {@link unwarpEstimate}; INVALID_ARGUMENT for a kernel or an estimate that does not fit
 * @example const { volume } = await unwarpStep(run.volume, { method: 'field-map' }, { ...context, fieldMapHz })
 */
export const unwarpStep: StepFunction<UnwarpStepParams, UnwarpEstimate> = (volume, params, context, estimate) => {
  const method = checkMethod(params.method);
  const kernel = params.kernel ?? 'linear';
  if (!UNWARP_KERNELS.includes(kernel)) fail('INVALID_ARGUMENT', `unwarp kernel must be one of ${UNWARP_KERNELS.join(', ')}, got '${String(kernel)}'`);
  const jacobian = params.jacobian ?? true;
  const e = estimate ?? unwarpEstimate(volume, params, context);
  const n = voxelsPerVolume(volume);
  const data = context.outputBuffer?.(volume.data.length) ?? new Float32Array(volume.data.length);
  const rest: StepContext = { ...context };
  delete rest.outputBuffer;
  const applied = { method, kernel, jacobian };
  if (method === 'none' || !e.shiftVoxels) {
    if (data !== volume.data) data.set(volume.data);
    return {
      volume: makeVolume({ dims: [...volume.dims], spacingMm: [...volume.spacingMm], trSec: volume.trSec, affine: new Float64Array(volume.affine), data }),
      context: rest,
      note: { step: 'unwarp', params: applied, summary: 'No distortion correction', diagnostics: {}, methodsText: 'Images were not corrected for geometric distortion.', citations: [] },
    };
  }
  if (e.shiftVoxels.length !== n) fail('INVALID_ARGUMENT', `the unwarp estimate has ${e.shiftVoxels.length} voxels, the run's grid ${n}`);
  const plan = planUnwarp(e.shiftVoxels, [volume.dims[0], volume.dims[1], volume.dims[2]], e.axis, { kernel, jacobian });
  applyUnwarp(volume.data, plan, data);
  const axisName = ['i', 'j', 'k'][e.axis];
  const source = method === 'field-map' ? 'a B0 field map (Hz)' : `a pair of images with opposite phase-encode directions (displacement by line-by-line matching of cumulative intensity, regularised by a ${UNWARP_PAIR_SMOOTH_FWHM_VOXELS}-voxel FWHM Gaussian across lines)`;
  const kernelText = kernel === 'linear' ? 'linear interpolation' : 'cubic B-spline interpolation';
  const d = e.diagnostics;
  return {
    volume: makeVolume({ dims: [...volume.dims], spacingMm: [...volume.spacingMm], trSec: volume.trSec, affine: new Float64Array(volume.affine), data }),
    context: rest,
    note: {
      step: 'unwarp',
      params: applied,
      summary: `Unwarped along ${axisName} from ${method === 'field-map' ? 'the field map' : 'the reversed phase-encode pair'} (largest shift ${d.maxAbsShiftVoxels} voxels; signal lost to dephasing or folding in ${d.lostVoxelsNearMask} voxels in or next to the mask), ${kernel}${jacobian ? ', Jacobian' : ''}`,
      diagnostics: { ...d },
      methodsText: `Geometric distortion along the phase-encode axis (${axisName}) was corrected with ${source}: each voxel's shift was the field (Hz) times the total readout time (${round(d.totalReadoutTimeSec * 1000, 2)} ms), and each volume was resampled along the phase-encode lines by ${kernelText}${jacobian ? ', with the intensity multiplied by the Jacobian of the shift' : ', without intensity correction'}; ${d.lostVoxelsNearMask} voxels in or within ${SIGNAL_LOSS_NEAR_MASK_VOXELS} voxels of the brain mask (${d.lostVoxelsInMask} inside it, ${d.lostPercentOfMask} % of it) lie where the signal is lost to dephasing or folding and cannot be restored.`,
      citations: METHOD_CITATIONS[method],
    },
  };
};

/**
 * Simplicity of an unwarping method: none < field-map < reversed-pe.
 * @param method - the method
 * @returns 0, 1 or 2
 * @example unwarpSimplicity('field-map') // 1
 */
export function unwarpSimplicity(method: UnwarpMethod): number {
  return UNWARP_METHODS.indexOf(method);
}

function checkMethod(method: UnwarpMethod): UnwarpMethod {
  if (!UNWARP_METHODS.includes(method)) fail('INVALID_ARGUMENT', `unwarp method must be one of ${UNWARP_METHODS.join(', ')}, got '${String(method)}'`);
  return method;
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
