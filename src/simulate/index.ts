// simulate: public exports of this module (re-exports only; src/index.ts re-exports this file).
export { plantActivations } from './plant.js';
export type { PlantOptions, PlantTruth, PlantedBlob } from './plant.js';
export { blobProfile, blobWeight, blobSizeMm, blobSupportMm, checkBlobShape } from './plant-profile.js';
export type { BlobShapeSpec, SparseProfile } from './plant-profile.js';
export { placeCentres, interiorVoxels } from './plant-placement.js';
export type { PlacementOptions } from './plant-placement.js';
