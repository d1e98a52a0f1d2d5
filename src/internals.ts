/**
 * boldsweep internals: every module's exports, for extending the engine and for tests
 * (`import { ... } from 'boldsweep/internals'`). Less stable than the curated API in index.ts.
 *
 *   open run -> look -> plant -> recipe -> model -> score -> sweep -> decide
 */
export { BoldsweepError, isBoldsweepError } from './core/errors.js';
export { ERROR_ADVICE, type ErrorCode } from './core/messages.js';
export {
  type Affine, type Vec3, type NiftiQuaternion, identityAffine, affineFromRows, composeAffine, invertAffine, applyAffine,
  affineDeterminant, affineSpacing, diagonalAffine, affineFromQuaternion, affineToQuaternion,
} from './core/affine.js';
export { type Volume, type Dims4, makeVolume, volumeLike, volumeAt, voxelsPerVolume, sameGrid, assertSameGrid, runBytes } from './core/volume.js';
export { type Rng, createRng, childSeed } from './core/random.js';
export { summariseVolume } from './core/summary.js';
export { type BoundaryMode, BOUNDARY_MODES, boundaryIndex } from './core/boundary-mode.js';
export { labelComponents, type Connectivity, type Components } from './core/components.js';
export type { Grid, Frame } from './core/grid-frame.js';
export type { Run, Sidecar, BoldEvent, NiftiReadInfo, TransformSource } from './io/run-types.js';

export * from './io/index.js';
export * from './look/index.js';
export * from './filter/index.js';
export * from './resample/index.js';
export * from './register/index.js';
export * from './align/index.js';
export * from './acquire/index.js';
export * from './plant/index.js';
export * from './steps/index.js';
export * from './model/index.js';
export * from './score/index.js';
export * from './sweep/index.js';
export * from './decide/index.js';
export * from './report/index.js';
export * from './simulate/index.js';
export * from './cluster/index.js';
