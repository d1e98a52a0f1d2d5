// steps: public exports of this module (re-exports only; src/index.ts re-exports this file).
export type { StepNote, StepContext, StepResult, StepFunction } from './step-types.js';
export { FWHM_PER_SIGMA, DEFAULT_TRUNCATE, fwhmToSigma, sigmaToFwhm, sigmaVoxels, kernelRadius, gaussianKernel1d } from './gaussian-kernel.js';
export { type BoundaryMode, BOUNDARY_MODES, boundaryIndex } from './boundary-index.js';
export { type SmoothOptions, smoothVolume3d, planGaussianSmooth } from './gaussian-smooth.js';
export { type SmoothPlan, type SmoothScratch, makeSmoothPlan, makeSmoothScratch, applySmoothPlan } from './smooth-plan.js';
