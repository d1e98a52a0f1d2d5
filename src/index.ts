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
