// plant: public exports of this module (re-exports only; src/internals.ts re-exports this file).
export { plantActivations } from './plant-activations.js';
export type { PlantOptions, PlantTruth, PlantedBlob } from './plant-activations.js';
export { blobProfile, blobWeight, blobSizeMm, blobSupportMm, checkBlobShape } from './plant-profile.js';
export type { BlobShapeSpec, SparseProfile } from './plant-profile.js';
export { placeCentres, interiorVoxels } from './plant-placement.js';
export type { PlacementOptions } from './plant-placement.js';
export { plantTimeCourse, type PlantTimeCourseOptions } from './plant-time-course.js';
