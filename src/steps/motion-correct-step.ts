import type { Vec3 } from '../core/affine.js';
import { composeAffine, invertAffine } from '../core/affine.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import type { Frame } from '../core/grid-frame.js';
import type { Volume } from '../core/volume.js';
import { estimateRunMotion, type MotionReference } from '../register/estimate-run-motion.js';
import { motionParametersAffine } from '../register/motion-parameters-affine.js';
import type { RegistrationCost, RegistrationModel } from '../register/registration-types.js';
import { checkKernel, type InterpolationKernel } from '../resample/interpolation-kernel.js';
import { resampleRun } from '../resample/resample-run.js';
import { kernelSimplicity } from './resample-step.js';
import { framewiseDisplacement } from '../model/framewise-displacement.js';
import { isBoldsweepError } from '../core/errors.js';
import type { StepContext, StepFunction } from './step-types.js';

/** Parameters of {@link motionCorrectStep}. */
export interface MotionCorrectParams {
  /** 'rigid' (6 parameters) or 'affine' (12). __Default value:__ `'rigid'` */
  model?: RegistrationModel;
  /** Cost function. __Default value:__ `'least-squares'` */
  cost?: RegistrationCost;
  /** Volume registered to: 'first', 'middle', 'mean', 'least-moving' or an index. __Default value:__ `'first'` */
  reference?: MotionReference;
  /** Interpolation kernel of the one resampling per volume. __Default value:__ `'linear'` */
  kernel?: InterpolationKernel;
  /** Boundary mode of the resampling. __Default value:__ `'constant'` (no signal outside the acquired field of view) */
  mode?: BoundaryMode;
  /** Multi-resolution levels, coarse to fine. __Default value:__ `[4, 2, 1]` */
  levels?: number[];
  /** Weight the registration by the context's brain mask. __Default value:__ false (every voxel) */
  withinMask?: boolean;
}

/** What the step estimates from the unplanted run (plain data: cached as JSON, hashed into keys). */
export interface MotionEstimate {
  model: RegistrationModel;
  cost: RegistrationCost;
  /** The reference volume's index (null: the mean image). */
  referenceIndex: number | null;
  /** Centre (mm) the rotations turn about. */
  centreMm: Vec3;
  /** Per volume, the 6 or 12 motion parameters (the motion table's columns). */
  parameters: number[][];
  /** Final cost per volume. */
  costs: number[];
  /**
   * Framewise displacement (Power et al. 2012) of the run before correction (from the estimate) and
   * after it (the corrected unplanted run registered again at the coarse levels
   * {@link RESIDUAL_MOTION_LEVELS}); `after` is null, with the reason, when that check did not converge.
   */
  framewiseDisplacement: { before: FdSummary; after: FdSummary | null; afterNote: string };
}

/** Mean and largest framewise displacement over a run, mm, and the volumes above 0.5 mm. */
export interface FdSummary { meanMm: number; maxMm: number; above05: number }

/**
 * Levels of the check for motion left after correction: coarse (subsampling 4 and 2), as a screen;
 * residual motion below a quarter of a voxel is not what it is for.
 */
export const RESIDUAL_MOTION_LEVELS = [4, 2];

/**
 * Mean, largest and count above 0.5 mm (common practice; Power et al. 2012) of a run's framewise
 * displacement from its first six motion parameters per volume.
 * @param parameters - per volume, shifts (mm) then rotations (degrees), possibly followed by affine terms
 * @returns the summary
 * @example fdSummary([[0, 0, 0, 0, 0, 0], [1, 0, 0, 0, 0, 0]]) // { meanMm: 0.5, maxMm: 1, above05: 1 }
 */
export function fdSummary(parameters: readonly (readonly number[])[]): FdSummary {
  const fd = framewiseDisplacement(parameters.map((q) => ({ shiftXMm: q[0], shiftYMm: q[1], shiftZMm: q[2], rotXDeg: q[3], rotYDeg: q[4], rotZDeg: q[5] })));
  let sum = 0, max = 0, above = 0;
  for (const v of fd) { sum += v; if (v > max) max = v; if (v > 0.5) above++; }
  return { meanMm: fd.length ? sum / fd.length : 0, maxMm: max, above05: above };
}

function motionParameters(motion: { rows: readonly unknown[]; transforms: readonly unknown[] }, np: number): number[][] {
  return motion.transforms.map((_, t) => {
    const r = motion.rows[t] as Record<string, number>;
    return ['shiftXMm', 'shiftYMm', 'shiftZMm', 'rotXDeg', 'rotYDeg', 'rotZDeg', 'scaleX', 'scaleY', 'scaleZ', 'shearXY', 'shearXZ', 'shearYZ'].slice(0, np).map((c) => r[c]);
  });
}

/** The run resampled into volume 0's pose by the estimated poses (what the step's apply does). */
async function correctedRun(volume: Volume, parameters: readonly (readonly number[])[], centreMm: Vec3, kernel: InterpolationKernel, mode: BoundaryMode): Promise<Volume> {
  const poses = parameters.map((q) => motionParametersAffine([...q], centreMm));
  const back = invertAffine(poses[0]);
  return resampleRun(volume, { kernel, mode, perVolume: poses.map((pose) => composeAffine(pose, back)) });
}

const COST_TEXT: Record<RegistrationCost, string> = {
  'least-squares': 'least squares (Gauss-Newton)',
  'normalised-correlation': 'normalised correlation (Nelder-Mead)',
  'normalised-mutual-information': 'normalised mutual information (32 bins, cubic B-spline Parzen window; Nelder-Mead)',
};
const COST_CITATIONS: Record<RegistrationCost, string[]> = {
  'least-squares': ['Baker S, Matthews I (2004) Lucas-Kanade 20 years on: a unifying framework. Int J Comput Vis 56:221-255 [memory]'],
  'normalised-correlation': ['Nelder JA, Mead R (1965) A simplex method for function minimization. Comput J 7:308-313 [memory]'],
  'normalised-mutual-information': [
    'Studholme C, Hill DLG, Hawkes DJ (1999) An overlap invariant entropy measure of 3D medical image alignment. Pattern Recognit 32:71-86 [memory]',
    'Mattes D, Haynor DR, Vesselle H, Lewellen TK, Eubank W (2003) PET-CT image registration in the chest using free-form deformations. IEEE Trans Med Imaging 22:120-128 [memory]',
    'Nelder JA, Mead R (1965) A simplex method for function minimization. Comput J 7:308-313 [memory]',
  ],
};
const KERNEL_TEXT: Record<InterpolationKernel, string> = {
  nearest: 'nearest-neighbour', linear: 'trilinear', cubic: 'cubic B-spline', lanczos3: 'windowed-sinc (Lanczos, radius 3)',
};

/**
 * The step's parameters with their defaults filled in.
 * @param params - as given
 * @returns every field set
 * @example motionCorrectDefaults({}) // rigid, least-squares, first, linear, constant, [4, 2, 1], false
 */
export function motionCorrectDefaults(params: MotionCorrectParams): Required<MotionCorrectParams> {
  return {
    model: params.model ?? 'rigid', cost: params.cost ?? 'least-squares', reference: params.reference ?? 'first',
    kernel: checkKernel(params.kernel ?? 'linear'), mode: params.mode ?? 'constant', levels: params.levels ?? [4, 2, 1], withinMask: params.withinMask ?? false,
  };
}

/**
 * Estimate the run's motion for the step (estimateRunMotion with the step's settings); the value is
 * what the sweep caches and hands to {@link motionCorrectStep} for every planting.
 * @param volume - the (unplanted) run
 * @param params - the step's parameters
 * @param context - its mask is used with `withinMask`
 * @returns the estimate as plain data
 * @throws BoldsweepError as estimateRunMotion; INVALID_ARGUMENT for withinMask without a mask
 * @example const estimate = await motionCorrectEstimate(run.volume, { model: 'rigid' }, context)
 */
export async function motionCorrectEstimate(volume: Volume, params: MotionCorrectParams, context: Pick<StepContext, 'mask'>): Promise<MotionEstimate> {
  const p = motionCorrectDefaults(params);
  if (p.withinMask && !context.mask) fail('INVALID_ARGUMENT', 'motion-correct: withinMask needs a brain mask in the step context (set the sweep\'s mask, or withinMask: false)');
  const motion = await estimateRunMotion(volume, { model: p.model, cost: p.cost, reference: p.reference, levels: p.levels, mask: p.withinMask ? context.mask : null });
  const np = p.model === 'rigid' ? 6 : 12;
  const parameters = motionParameters(motion as unknown as { rows: unknown[]; transforms: unknown[] }, np);
  // the motion left after correction: the corrected run registered again (rigid least squares,
  // coarse levels) to the same reference; a check, so a failure to converge is reported, not thrown
  const corrected = await correctedRun(volume, parameters, motion.centreMm, p.kernel, p.mode);
  let after: FdSummary | null = null;
  let afterNote = `registered again after correction: rigid, least squares, levels ${RESIDUAL_MOTION_LEVELS.join(', ')}`;
  try {
    const residual = await estimateRunMotion(corrected, { model: 'rigid', cost: 'least-squares', reference: motion.referenceIndex ?? 'mean', levels: RESIDUAL_MOTION_LEVELS, mask: p.withinMask ? context.mask : null });
    after = fdSummary(motionParameters(residual as unknown as { rows: unknown[]; transforms: unknown[] }, 6));
  } catch (e) {
    if (!isBoldsweepError(e, 'REGISTRATION_NOT_CONVERGED')) throw e;
    afterNote = `not measured: the check after correction did not converge (${e.message})`;
  }
  return {
    model: p.model, cost: p.cost, referenceIndex: motion.referenceIndex, centreMm: motion.centreMm,
    parameters,
    costs: Array.from(motion.costs),
    framewiseDisplacement: { before: fdSummary(parameters), after, afterNote },
  };
}

/**
 * Output frame: the reference frame on the input's grid (a target grid stays that grid).
 * @param _params - unused
 * @param input - the input frame
 * @returns the output frame
 * @example motionCorrectOutputFrame({}, { kind: 'raw' }) // { kind: 'reference' }
 */
export function motionCorrectOutputFrame(_params: MotionCorrectParams, input: Frame): Frame {
  return input.kind === 'target' ? input : { kind: 'reference' };
}

/**
 * Preprocessing step: motion correction. Every volume's pose is estimated against the reference
 * (the estimate from the unplanted run when the sweep gives one, else from this run), then each
 * volume is resampled once, with the chosen kernel, into the pose of volume 0 (the reference frame
 * of the planted truth and of a motion table: transform T_t T_0^-1, where T_t is volume t's pose
 * relative to the chosen reference), so the choice of reference changes the registration but not
 * where the output lives. The grid stays the input's.
 * @param volume - the run (not modified)
 * @param params - model, cost, reference, kernel, mode, levels, withinMask
 * @param context - mask (withinMask), frame
 * @param estimate - the step's estimate (motionCorrectEstimate) from the unplanted run
 * @returns the corrected run, its note and frame
 * @throws BoldsweepError as estimateRunMotion and resampleRun; MOTION_TABLE_LENGTH for an estimate of another run length
 * @example const { volume } = await motionCorrectStep(run.volume, { model: 'rigid', kernel: 'cubic' }, context)
 */
export const motionCorrectStep: StepFunction<MotionCorrectParams, MotionEstimate> = async (volume, params, context, estimate) => {
  const p = motionCorrectDefaults(params);
  const est = estimate ?? await motionCorrectEstimate(volume, p, context);
  const nt = volume.dims[3];
  if (est.parameters.length !== nt) fail('MOTION_TABLE_LENGTH', `motion-correct: the estimate has ${est.parameters.length} volumes, the run ${nt}`);
  const out = await correctedRun(volume, est.parameters, est.centreMm, p.kernel, p.mode);
  const inputFrame: Frame = context.frame ?? { kind: 'raw' };
  const frame = motionCorrectOutputFrame(p, inputFrame);
  let maxShift = 0, maxRot = 0;
  for (const q of est.parameters) {
    for (let i = 0; i < 3; i++) maxShift = Math.max(maxShift, Math.abs(q[i]));
    for (let i = 3; i < 6; i++) maxRot = Math.max(maxRot, Math.abs(q[i]));
  }
  const ref = est.referenceIndex === null ? 'the mean image' : `volume ${est.referenceIndex}`;
  const fd = est.framewiseDisplacement;
  const fdText = fd ? `; framewise displacement mean ${fd.before.meanMm.toFixed(3)} mm, largest ${fd.before.maxMm.toFixed(2)} mm before, ${fd.after ? `mean ${fd.after.meanMm.toFixed(3)} mm, largest ${fd.after.maxMm.toFixed(2)} mm after (${fd.afterNote})` : fd.afterNote}` : '';
  const levels = p.levels.join(', ');
  const rest: StepContext = { ...context };
  delete rest.outputBuffer;
  return {
    volume: out,
    frame,
    context: { ...rest, frame },
    note: {
      step: 'motion-correct',
      params: { model: p.model, cost: p.cost, reference: p.reference, kernel: p.kernel, mode: p.mode, levels: p.levels, withinMask: p.withinMask },
      summary: `Motion corrected: ${p.model} to ${ref}, ${p.cost}, ${p.kernel}; largest shift ${maxShift.toFixed(2)} mm, rotation ${maxRot.toFixed(2)} deg${fdText}`,
      diagnostics: { referenceIndex: est.referenceIndex ?? -1, maxAbsShiftMm: maxShift, maxAbsRotationDeg: maxRot, meanCost: est.costs.reduce((a, b) => a + b, 0) / Math.max(1, est.costs.length),
        ...(fd ? { fdMeanBeforeMm: fd.before.meanMm, fdMaxBeforeMm: fd.before.maxMm, fdAbove05Before: fd.before.above05, ...(fd.after ? { fdMeanAfterMm: fd.after.meanMm, fdMaxAfterMm: fd.after.maxMm, fdAbove05After: fd.after.above05 } : {}), fdAfterNote: fd.afterNote } : {}) },
      methodsText: `Head motion was estimated by registering every volume to ${ref} with a ${p.model === 'rigid' ? 'rigid (6-parameter)' : 'affine (12-parameter)'} transform minimising ${COST_TEXT[p.cost]} over ${p.levels.length} resolution levels (subsampling ${levels}, Gaussian pre-smoothing)${p.withinMask ? ' within the brain mask' : ''}, and each volume was resampled once into the first volume's position by ${KERNEL_TEXT[p.kernel]} interpolation.`,
      citations: COST_CITATIONS[p.cost],
    },
  };
};

/**
 * Simplicity of a setting: rigid before affine, then the kernel's order (nearest < linear < cubic < lanczos3).
 * @param params - the step's parameters
 * @returns lower is simpler
 * @example motionCorrectSimplicity({ model: 'rigid', kernel: 'linear' }) // 1
 */
export function motionCorrectSimplicity(params: MotionCorrectParams): number {
  const p = motionCorrectDefaults(params);
  return (p.model === 'affine' ? 10 : 0) + kernelSimplicity(p.kernel);
}
