// model: public exports of this module (re-exports only; src/index.ts re-exports this file).
export { hrfValues, hrfKernel, hrfPeak, GLOVER_DEFAULTS, type HrfShape, type HrfOptions, type HrfKernelOptions, type GloverParams } from './hrf.js';
export { dctBasis, dctRegressorCount, polynomialBasis } from './drift-basis.js';
export { eventRegressors, type EventRegressorOptions, type EventRegressors } from './event-regressors.js';
export { buildDesign, type DesignOptions, type DriftModel, type NuisanceRegressor } from './design.js';
export { makeDesignMatrix, designPseudoInverse, type DesignMatrix, type DesignColumnKind, type DesignSolve } from './design-matrix.js';
export { svdJacobi, type Svd } from './svd-jacobi.js';
export { fitGlm } from './glm-ols.js';
export { fitGlmAr1, type GlmAr1Options } from './glm-ar1.js';
export { fittedVoxels, type GlmFit, type GlmOptions } from './glm-fit.js';
export { lag1Autocorrelation, ar1BiasTraces, correctAr1, prewhitenAr1 } from './ar1.js';
export { contrastMaps, contrastWeights, type Contrast, type ContrastMaps } from './contrast.js';
export { tToZ, Z_LIMIT } from './t-to-z.js';
