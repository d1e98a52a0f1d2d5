// steps: public exports of this module (re-exports only; src/index.ts re-exports this file).
export type { StepNote, StepContext, StepResult, StepFunction, StepKind, ParameterLabel } from './step-types.js';
export { type SmoothStepParams, smoothStep, maxFwhmMm, MAX_FWHM_MM } from './smooth-step.js';
export { type PercentSignalChangeParams, type PercentSignalChangeResult, percentSignalChange, percentSignalChangeStep } from './percent-signal-change.js';
export { type GrandMeanScaleParams, type GrandMeanScaleResult, grandMeanScale, grandMeanScaleStep } from './grand-mean-scale.js';
export { orthonormalSpan, projectOutBasis } from './project-out-basis.js';
export { type HighpassParams, type DetrendParams, highpassStep, detrendStep } from './temporal-filter.js';
export { type DropInitialVolumesParams, type ShiftedEvents, shiftEvents, dropInitialVolumesStep } from './drop-initial-volumes.js';
export { requireMask } from './require-mask.js';
export { type StepDefinition, type RegisterStepOptions, registerStep, getStep, listSteps, parseStepParams, applyStep, describeStep, stepModules, stepVersion } from './registry.js';
export { type ResampleStepParams, kernelSimplicity, resampleOutputFrame, resampleStep, resampleTargetGrid } from './resample-step.js';
export { type UnwarpStepParams, type UnwarpEstimate, type UnwarpMethod, UNWARP_METHODS, UNWARP_PAIR_SMOOTH_FWHM_VOXELS, unwarpEstimate, unwarpStep, unwarpSimplicity } from './unwarp-step.js';
export { type SliceTimeParams, type SliceTimeMethod, SLICE_TIME_METHODS, sliceTimeStep } from './slice-time-step.js';
export { type ShiftMethod, SHIFT_METHODS, shiftSliceSeries } from './shift-slice-series.js';
export { shiftSeriesLinear } from './shift-series-linear.js';
export { shiftSeriesCubic } from './shift-series-cubic.js';
export { type FourierShifter, fourierShifter } from './fourier-shifter.js';
export { type AlignStepParams, alignStep, alignEstimate, alignInputPaths, alignOutputGrids, alignSimplicity } from './align-step.js';
export { type MotionCorrectParams, type MotionEstimate, motionCorrectStep, motionCorrectEstimate, motionCorrectOutputFrame, motionCorrectDefaults, motionCorrectSimplicity } from './motion-correct-step.js';
