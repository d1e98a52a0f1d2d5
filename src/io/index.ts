// io: public exports of this module (re-exports only; src/index.ts re-exports this file).
export { writeFileAtomic, writeFileAtomicSync, type AtomicWriteData } from './atomic-write.js';
export { writeNifti, niftiHeaderBytes, niftiVoxelBytes, type WriteNiftiOptions } from './nifti-write.js';
export { int16Scaling, type Int16Scaling } from './int16-scaling.js';
export type { Run, Sidecar, BoldEvent, NiftiReadInfo, TransformSource } from './run-types.js';
export { readNifti, type ReadNiftiOptions } from './nifti-read.js';
export { parseNiftiHeader, MAX_DIM, MAX_VOXELS, type NiftiHeaderFacts } from './nifti-header.js';
export { readNiftiHeaderFacts, type NiftiHeaderOnly } from './read-nifti-header-facts.js';
export { NIFTI_DATATYPES, niftiDatatypeName, type NiftiDatatype } from './nifti-datatypes.js';
export { convertVoxels } from './convert-voxels.js';
export { niftiTransform, usableAffine } from './nifti-transform.js';
export { niftiUnits, type NiftiUnits, type NiftiSpaceUnit, type NiftiTimeUnit } from './nifti-units.js';
export { scanNonFinite, type NonFiniteScan } from './non-finite.js';
export { readSidecar, writeSidecar, sidecarSchema, sidecarProblems, orderSidecar, SIDECAR_FIELD_ORDER } from './sidecar.js';
export { readEvents, writeEvents, parseEvents, formatEvents, eventRowSchema, DEFAULT_TRIAL_TYPE } from './events.js';
export { openRun, type OpenRunOptions } from './open-run.js';
export { findRunSiblings, siblingCandidates, type RunSiblings } from './run-siblings.js';
export { hashFile } from './hash-file.js';
export { OUTPUT_MARKER, checkOutputFolder, claimOutputFolder, addOutputFiles, prepareOutputFiles, settleOutputSet, readOutputMarker, type OutputMarker, type ClaimOptions } from './output-folder.js';
