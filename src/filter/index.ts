// filter: public exports of this module (re-exports only; src/internals.ts re-exports this file).
export { FWHM_PER_SIGMA, DEFAULT_TRUNCATE, fwhmToSigma, sigmaToFwhm, sigmaVoxels, kernelRadius, gaussianKernel1d } from './gaussian-kernel.js';
export { type SmoothOptions, smoothVolume3d, planGaussianSmooth } from './gaussian-smooth.js';
export { type SmoothPlan, type SmoothScratch, makeSmoothPlan, makeSmoothScratch, applySmoothPlan } from './smooth-plan.js';
export { type SmoothRunOptions, smoothRun, SMOOTH_RUN_IN_THREAD_BELOW } from './smooth-run.js';
