/**
 * boldsweep public API. Re-exports only; every export is documented where it is defined.
 *
 *   open run -> look -> plant -> recipe -> model -> score -> sweep -> decide
 */

// core
export { BoldsweepError, isBoldsweepError } from './core/errors.js';
export { ERROR_ADVICE, type ErrorCode } from './core/messages.js';
export {
  type Affine, type Vec3, type NiftiQuaternion, identityAffine, affineFromRows, composeAffine, invertAffine, applyAffine,
  affineDeterminant, affineSpacing, diagonalAffine, affineFromQuaternion, affineToQuaternion,
} from './core/affine.js';
export { type Volume, type Dims4, makeVolume, volumeLike, volumeAt, voxelsPerVolume, sameGrid, assertSameGrid, runBytes } from './core/volume.js';
export { type Rng, createRng, childSeed } from './core/random.js';
export { summariseVolume } from './core/summary.js';

// io
export type { Run, Sidecar, BoldEvent, NiftiReadInfo, TransformSource } from './io/run-types.js';
export { labelComponents, type Connectivity, type Components } from './core/components.js';

// each module's public API (each module's index.ts lists its exports)
export * from './io/index.js';
export * from './look/index.js';
export * from './resample/index.js';
export * from './register/index.js';
export * from './steps/index.js';
export * from './model/index.js';
export * from './simulate/index.js';
export * from './sweep/index.js';
export * from './report/index.js';
export * from './notebook/index.js';
