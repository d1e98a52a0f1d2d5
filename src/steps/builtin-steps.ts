import { z } from 'zod';
import { BOUNDARY_MODES, type BoundaryMode } from '../core/boundary-mode.js';
import { dropInitialVolumesStep, type DropInitialVolumesParams } from './drop-initial-volumes.js';
import { grandMeanScaleStep, type GrandMeanScaleParams } from './grand-mean-scale.js';
import { percentSignalChangeStep, type PercentSignalChangeParams } from './percent-signal-change.js';
import type { StepDefinition } from './registry.js';
import { MAX_FWHM_MM, smoothStep, type SmoothStepParams } from './smooth-step.js';
import { INTERPOLATION_KERNELS, type InterpolationKernel } from '../resample/interpolation-kernel.js';
import { kernelSimplicity, resampleOutputFrame, resampleStep, type ResampleStepParams } from './resample-step.js';
import { motionCorrectEstimate, motionCorrectOutputFrame, motionCorrectSimplicity, motionCorrectStep, type MotionCorrectParams, type MotionEstimate } from './motion-correct-step.js';
import { REGISTRATION_COSTS, REGISTRATION_MODELS, type RegistrationCost, type RegistrationModel } from '../register/registration-types.js';
import { detrendStep, highpassStep, type DetrendParams, type HighpassParams } from './temporal-filter.js';
import { UNWARP_KERNELS, type UnwarpKernel } from '../acquire/plan-unwarp.js';
import { UNWARP_METHODS, unwarpEstimate, unwarpSimplicity, unwarpStep, type UnwarpEstimate, type UnwarpMethod, type UnwarpStepParams } from './unwarp-step.js';
import { SLICE_TIME_METHODS, sliceTimeStep, type SliceTimeMethod, type SliceTimeParams } from './slice-time-step.js';
import { SLICE_ORDERS, type SliceOrder } from '../acquire/slice-order-timing.js';
import { alignEstimate, alignSimplicity, alignStep, type AlignStepParams } from './align-step.js';
import type { AlignmentEstimate } from '../align/alignment-estimate.js';

// Schemas check types and fixed ranges; limits that depend on the run (FOV, number of volumes)
// are checked by the steps themselves.
const modes = BOUNDARY_MODES as unknown as [BoundaryMode, ...BoundaryMode[]];

const smooth: StepDefinition<SmoothStepParams> = {
  schema: z.object({
    fwhmMm: z.number().finite().min(0).max(MAX_FWHM_MM),
    mode: z.enum(modes).default('reflect'),
    withinMask: z.boolean().default(false),
  }).strict(),
  version: 1,
  kind: 'spatial-filter',
  // each volume smoothed on its own (smoothRun), the note from the parameters and the mask alone
  volumewise: true,
  apply: smoothStep,
  labels: { fwhmMm: { name: 'smoothing FWHM', unit: 'mm' }, mode: { name: 'smoothing boundary mode', unit: '' }, withinMask: { name: 'smoothing within the mask', unit: '' } },
  simplicity: (p) => p.fwhmMm,
  describe: (p) => `smooth ${p.fwhmMm} mm${p.withinMask ? ' in mask' : ''}${p.mode && p.mode !== 'reflect' ? ` (${p.mode})` : ''}`,
};

const kernels = INTERPOLATION_KERNELS as unknown as [InterpolationKernel, ...InterpolationKernel[]];
// a voxel size from 0.1 mm (finer than any fMRI grid) to 20 mm (coarser than any)
const voxelSize = z.number().finite().min(0.1).max(20);

const resample: StepDefinition<ResampleStepParams> = {
  schema: z.object({
    kernel: z.enum(kernels),
    voxelSizeMm: z.union([voxelSize, z.tuple([voxelSize, voxelSize, voxelSize])]).optional(),
    mode: z.enum(modes).default('constant'),
  }).strict(),
  version: 1,
  kind: 'geometric',
  outputFrame: resampleOutputFrame,
  apply: resampleStep,
  labels: { kernel: { name: 'interpolation kernel', unit: '' }, voxelSizeMm: { name: 'target voxel size', unit: 'mm' }, mode: { name: 'resampling boundary mode', unit: '' } },
  // nearest < linear < cubic < lanczos3 (taps per axis 1, 2, 4, 6)
  simplicity: (p) => kernelSimplicity(p.kernel),
  describe: (p) => `resample ${p.kernel}${p.voxelSizeMm === undefined ? '' : ` ${Array.isArray(p.voxelSizeMm) ? p.voxelSizeMm.join('x') : p.voxelSizeMm} mm`}${p.mode && p.mode !== 'constant' ? ` (${p.mode})` : ''}`,
};

const align: StepDefinition<AlignStepParams, AlignmentEstimate> = {
  schema: z.object({
    structural: z.string().min(1).optional(),
    template: z.string().min(1).optional(),
    concatenate: z.boolean().default(true),
    kernel: z.enum(kernels).default('cubic'),
    motion: z.enum(['estimate', 'none']).default('estimate'),
    voxelSizeMm: voxelSize.optional(),
    mode: z.enum(modes).default('constant'),
  }).strict(),
  version: 1,
  kind: 'geometric',
  estimate: alignEstimate,
  apply: alignStep,
  labels: {
    concatenate: { name: 'one concatenated resampling', unit: '' },
    kernel: { name: 'interpolation kernel', unit: '' },
    motion: { name: 'motion undone in the alignment', unit: '' },
    voxelSizeMm: { name: 'template voxel size', unit: 'mm' },
    structural: { name: 'structural image', unit: '' },
    template: { name: 'template', unit: '' },
    mode: { name: 'resampling boundary mode', unit: '' },
  },
  simplicity: alignSimplicity,
  describe: (p) => `align ${p.concatenate ? 'once' : 'per stage'} ${p.kernel}${p.motion === 'none' ? ' (no motion)' : ''}${p.voxelSizeMm === undefined ? '' : ` ${p.voxelSizeMm} mm`}`,
};

const registrationModels = REGISTRATION_MODELS as unknown as [RegistrationModel, ...RegistrationModel[]];
const registrationCosts = REGISTRATION_COSTS as unknown as [RegistrationCost, ...RegistrationCost[]];

const motionCorrect: StepDefinition<MotionCorrectParams, MotionEstimate> = {
  schema: z.object({
    model: z.enum(registrationModels).default('rigid'),
    cost: z.enum(registrationCosts).default('least-squares'),
    // a volume index is checked against the run by the step (MOTION_REFERENCE_INVALID)
    reference: z.union([z.enum(['first', 'middle', 'mean', 'least-moving']), z.number().int().min(0)]).default('first'),
    kernel: z.enum(kernels).default('linear'),
    mode: z.enum(modes).default('constant'),
    levels: z.array(z.number().int().min(1).max(32)).min(1).max(6).default([4, 2, 1]),
    withinMask: z.boolean().default(false),
  }).strict(),
  version: 2, // 2: the estimate carries framewise displacement before and after correction
  kind: 'geometric',
  outputFrame: motionCorrectOutputFrame,
  estimate: motionCorrectEstimate,
  apply: motionCorrectStep,
  labels: {
    model: { name: 'motion model', unit: '' }, cost: { name: 'registration cost', unit: '' }, reference: { name: 'motion reference volume', unit: '' },
    kernel: { name: 'interpolation kernel', unit: '' }, mode: { name: 'resampling boundary mode', unit: '' }, levels: { name: 'registration levels', unit: '' },
    withinMask: { name: 'registration within the mask', unit: '' },
  },
  simplicity: motionCorrectSimplicity,
  describe: (p) => `motion-correct ${p.model ?? 'rigid'} ${p.cost ?? 'least-squares'} to ${p.reference ?? 'first'}, ${p.kernel ?? 'linear'}`,
};

const percentSignalChange: StepDefinition<PercentSignalChangeParams> = {
  schema: z.object({
    minMeanFraction: z.number().min(0).lt(1).default(0.1),
    centred: z.boolean().default(false),
  }).strict(),
  version: 1,
  kind: 'temporal',
  apply: percentSignalChangeStep,
  labels: { minMeanFraction: { name: 'smallest mean kept (fraction of the brain mean)', unit: '' }, centred: { name: 'centred percent signal change', unit: '' } },
  describe: (p) => `percent signal change${p.centred ? ' (centred)' : ''}`,
};

const grandMeanScale: StepDefinition<GrandMeanScaleParams> = {
  schema: z.object({ target: z.number().finite().positive().default(10000) }).strict(),
  version: 1,
  kind: 'spatial-filter',
  apply: grandMeanScaleStep,
  labels: { target: { name: 'grand-mean target', unit: '' } },
  describe: (p) => `grand-mean scale to ${p.target}`,
};

const highpass: StepDefinition<HighpassParams> = {
  schema: z.object({ cutoffSec: z.number().positive().default(128) }).strict(),
  version: 1,
  kind: 'temporal',
  apply: highpassStep,
  labels: { cutoffSec: { name: 'high-pass cutoff', unit: 's' } },
  simplicity: (p) => -(p.cutoffSec ?? 128),
  describe: (p) => `high-pass ${p.cutoffSec} s`,
};

const detrend: StepDefinition<DetrendParams> = {
  schema: z.object({ order: z.number().int().min(0).default(2) }).strict(),
  version: 1,
  kind: 'temporal',
  apply: detrendStep,
  labels: { order: { name: 'detrending order', unit: '' } },
  simplicity: (p) => p.order ?? 2,
  describe: (p) => `detrend order ${p.order}`,
};

const dropInitialVolumes: StepDefinition<DropInitialVolumesParams> = {
  schema: z.object({ count: z.number().int().min(0) }).strict(),
  version: 1,
  kind: 'select-volumes',
  apply: dropInitialVolumesStep,
  labels: { count: { name: 'initial volumes dropped', unit: '' } },
  simplicity: (p) => p.count,
  describe: (p) => `drop ${p.count} volumes`,
};

const unwarp: StepDefinition<UnwarpStepParams, UnwarpEstimate> = {
  schema: z.object({
    method: z.enum(UNWARP_METHODS as unknown as [UnwarpMethod, ...UnwarpMethod[]]),
    kernel: z.enum(UNWARP_KERNELS as unknown as [UnwarpKernel, ...UnwarpKernel[]]).default('linear'),
    jacobian: z.boolean().default(true),
  }).strict(),
  version: 1,
  kind: 'geometric',
  // the output stays on the run's grid, undistorted: the frame's kind does not change
  estimate: unwarpEstimate,
  apply: unwarpStep,
  labels: { method: { name: 'distortion correction', unit: '' }, kernel: { name: 'unwarping interpolation', unit: '' }, jacobian: { name: 'Jacobian intensity correction', unit: '' } },
  simplicity: (p) => unwarpSimplicity(p.method),
  describe: (p) => (p.method === 'none' ? 'no unwarping' : `unwarp ${p.method}${p.kernel && p.kernel !== 'linear' ? ` ${p.kernel}` : ''}${p.jacobian === false ? ' (no Jacobian)' : ''}`),
};

const sliceTimeMethods = SLICE_TIME_METHODS as unknown as [SliceTimeMethod, ...SliceTimeMethod[]];
const sliceOrders = SLICE_ORDERS as unknown as [SliceOrder, ...SliceOrder[]];
// data left as acquired < two taps < four taps < every sample
const SLICE_TIME_SIMPLICITY: Record<SliceTimeMethod, number> = { model: 0, linear: 1, cubic: 2, fourier: 3 };

const sliceTime: StepDefinition<SliceTimeParams> = {
  schema: z.object({
    method: z.enum(sliceTimeMethods).default('fourier'),
    referenceSlice: z.number().int().min(0).optional(),
    referenceSec: z.number().finite().min(0).optional(),
    order: z.enum(sliceOrders).optional(),
    multibandFactor: z.number().int().min(1).default(1),
  }).strict(),
  version: 1,
  kind: 'temporal',
  apply: sliceTimeStep,
  labels: {
    method: { name: 'slice-timing method', unit: '' }, referenceSlice: { name: 'slice-timing reference slice', unit: '' },
    referenceSec: { name: 'slice-timing reference time', unit: 's' },
    order: { name: 'slice order', unit: '' }, multibandFactor: { name: 'multiband factor', unit: '' },
  },
  simplicity: (p) => SLICE_TIME_SIMPLICITY[p.method ?? 'fourier'],
  describe: (p) => {
    const ref = p.referenceSlice !== undefined ? ` to slice ${p.referenceSlice}` : p.referenceSec !== undefined ? ` to ${p.referenceSec} s` : '';
    return `slice-time ${p.method ?? 'fourier'}${ref}${p.order ? ` (${p.order}${(p.multibandFactor ?? 1) > 1 ? ` mb${p.multibandFactor}` : ''})` : ''}`;
  },
};

/**
 * Register the steps boldsweep ships with: smooth, percent-signal-change, grand-mean-scale,
 * highpass, detrend, drop-initial-volumes, resample, unwarp, slice-time, motion-correct, align (called once by the registry module).
 * @param register - the registry's registerStep
 * @returns nothing
 * @example registerBuiltinSteps(registerStep)
 */
export function registerBuiltinSteps(register: <P, E = unknown>(name: string, definition: StepDefinition<P, E>) => void): void {
  register('smooth', smooth);
  register('percent-signal-change', percentSignalChange);
  register('grand-mean-scale', grandMeanScale);
  register('highpass', highpass);
  register('detrend', detrend);
  register('drop-initial-volumes', dropInitialVolumes);
  register('resample', resample);
  register('unwarp', unwarp as StepDefinition<unknown>);
  register('slice-time', sliceTime);
  register('motion-correct', motionCorrect);
  register('align', align);
}
