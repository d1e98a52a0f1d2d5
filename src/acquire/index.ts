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
// the inverse of the B0 part: field maps, shift maps, unwarping, lost signal, reversed phase encoding
export { b0Readout, type B0Readout } from './b0-readout.js';
export { shiftMapVoxels } from './shift-map-voxels.js';
export { fieldMapFromPhaseDifference } from './field-map-from-phase-difference.js';
export { fieldMapOnGrid } from './field-map-on-grid.js';
export { planUnwarp, NO_TAP, UNWARP_KERNELS, type UnwarpKernel, type UnwarpPlan } from './plan-unwarp.js';
export { applyUnwarp } from './apply-unwarp.js';
export { intravoxelDephasing } from './intravoxel-dephasing.js';
export { unrecoverableSignal, DEPHASING_KEPT_BELOW, type UnrecoverableSignal } from './unrecoverable-signal.js';
export { reversedPhaseEncodeShift, type ReversedPhaseEncodeOptions, type ReversedPhaseEncodeShift } from './reversed-phase-encode-shift.js';
export { checkPhaseEncodePair, type PhaseEncodePair } from './phase-encode-pair.js';
export { imageAgreement } from './image-agreement.js';
export { sidecarBeside } from './sidecar-beside.js';
export { readFieldMapForRun } from './read-field-map-for-run.js';
export { readPhaseEncodePair } from './read-phase-encode-pair.js';
export { fieldFromPhaseEncodePair } from './field-from-phase-encode-pair.js';
export { unwarpPhaseEncodePair, type UnwarpedPair } from './unwarp-phase-encode-pair.js';
export { sliceOrderTiming, SLICE_ORDERS, type SliceOrder } from './slice-order-timing.js';
