// acquire: public exports of this module (re-exports only; src/internals.ts re-exports this file).
// One acquisition forward model (head pose per volume, B0 displacement, slice times), shared by the
// digital phantom and planting.
export { acquisitionModel } from './acquisition-model.js';
export type { AcquisitionModel, AcquisitionOptions, B0Displacement } from './acquisition-model.js';
export { rigidMotionAffine, type MotionRow } from './rigid-motion-affine.js';
export { motionTablePoses } from './motion-table-poses.js';
export { gridCentreMm } from './grid-centre-mm.js';
export { phaseEncodeAxis, type SignedAxis } from './phase-encode-axis.js';
export { totalReadoutTimeSec } from './total-readout-time.js';
export { fieldMapShiftVoxels } from './field-map-shift-voxels.js';
export { headFieldShiftVoxels } from './head-field-shift-voxels.js';
export { distortAlongAxis } from './distort-along-axis.js';
export { distortLines } from './distort-lines.js';
export { interleavedSliceTiming } from './interleaved-slice-timing.js';
export { sequentialSliceTiming } from './sequential-slice-timing.js';
export { checkSliceTimes } from './check-slice-times.js';
export { sliceOrderTiming, SLICE_ORDERS, type SliceOrder } from './slice-order-timing.js';
