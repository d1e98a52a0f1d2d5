// align: public exports of this module (re-exports only; src/internals.ts re-exports this file).
// transforms between images, stored in boldsweep's own JSON format, composed into one resampling
export { storedTransform, checkMatrix, checkSpace, type StoredTransform, type TransformSpace } from './stored-transform.js';
export { invertTransform } from './invert-transform.js';
export { composeTransforms } from './compose-transforms.js';
export { sameGrid } from './same-grid.js';
export { resampleAffineOf } from './resample-affine-of.js';
export { TRANSFORM_FORMAT_VERSION, transformFileSchema, type TransformJson } from './transform-schema.js';
export { transformToJson } from './transform-to-json.js';
export { transformFromJson } from './transform-from-json.js';
export { writeTransformFile } from './write-transform-file.js';
export { readTransformFile } from './read-transform-file.js';
export { concatenatedResampleAffines } from './concatenated-resample-affines.js';
export { plainGrid, type AlignmentEstimate } from './alignment-estimate.js';
export { alignRun, type AlignRunOptions, type AlignedRun } from './align-run.js';
export { estimateAlignment, type AlignmentOptions } from './estimate-alignment.js';
export { readAnatomyImage } from './read-anatomy-image.js';
export { demoAnatomyPaths, DEMO_ANATOMY_FILES } from './demo-anatomy-paths.js';
export { oneResamplingSaving, type OneResamplingSaving, type AlignedSharpness } from './one-resampling-saving.js';
