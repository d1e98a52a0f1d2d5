// plant: public exports of this module (re-exports only; src/internals.ts re-exports this file).
export { plantActivations } from './plant-activations.js';
export type { PlantOptions, PlantTruth, PlantedBlob, PlantedSeries } from './plant-activations.js';
export { blobProfile, blobWeight, blobSizeMm, blobSupportMm, checkBlobShape } from './plant-profile.js';
export type { BlobShapeSpec, SparseProfile } from './plant-profile.js';
export { placeCentres, interiorVoxels } from './plant-placement.js';
export type { PlacementOptions } from './plant-placement.js';
export { plantTimeCourse, type PlantTimeCourseOptions } from './plant-time-course.js';
export { plantTimeCourses, type PlantTimeCourses, type PlantTimeCoursesOptions } from './plant-time-courses.js';
export { posedBlobWeights } from './posed-blob-weights.js';
export { posedBlobBox, type VoxelBox } from './posed-blob-box.js';
export { truthOnGrid } from './truth-on-grid.js';
export { blobTruth } from './blob-truth.js';
