// steps: public exports of this module (re-exports only; src/index.ts re-exports this file).
export type { StepNote, StepContext, StepResult, StepFunction } from './step-types.js';
export { FWHM_PER_SIGMA, DEFAULT_TRUNCATE, fwhmToSigma, sigmaToFwhm, sigmaVoxels, kernelRadius, gaussianKernel1d } from './gaussian-kernel.js';
export { type BoundaryMode, BOUNDARY_MODES, boundaryIndex } from './boundary-index.js';
export { type SmoothOptions, smoothVolume3d, planGaussianSmooth } from './gaussian-smooth.js';
export { type SmoothPlan, type SmoothScratch, makeSmoothPlan, makeSmoothScratch, applySmoothPlan } from './smooth-plan.js';
export { type SmoothRunOptions, smoothRun, SMOOTH_RUN_IN_THREAD_BELOW } from './smooth-run.js';
export { type SmoothStepParams, smoothStep, maxFwhmMm, MAX_FWHM_MM } from './smooth-step.js';
export { type PercentSignalChangeParams, type PercentSignalChangeResult, percentSignalChange, percentSignalChangeStep } from './percent-signal-change.js';
export { type GrandMeanScaleParams, type GrandMeanScaleResult, grandMeanScale, grandMeanScaleStep } from './grand-mean-scale.js';
export { orthonormalSpan, projectOutBasis } from './project-out-basis.js';
export { type HighpassParams, type DetrendParams, highpassStep, detrendStep } from './temporal-filter.js';
export { type DropInitialVolumesParams, type ShiftedEvents, shiftEvents, dropInitialVolumesStep } from './drop-initial-volumes.js';
export { requireMask } from './require-mask.js';
export { type StepDefinition, registerStep, getStep, listSteps, parseStepParams, applyStep, describeStep } from './registry.js';
