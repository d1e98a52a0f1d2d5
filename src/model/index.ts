// model: public exports of this module (re-exports only; src/index.ts re-exports this file).
export { hrfValues, hrfKernel, GLOVER_DEFAULTS, type HrfShape, type HrfOptions, type HrfKernelOptions, type GloverParams } from './hrf.js';
export { dctBasis, dctRegressorCount, polynomialBasis } from './drift-basis.js';
