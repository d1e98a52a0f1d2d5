// io: public exports of this module (re-exports only; src/index.ts re-exports this file).
export { writeFileAtomic, writeFileAtomicSync, type AtomicWriteData } from './atomic-write.js';
export { writeNifti, niftiHeaderBytes, niftiVoxelBytes, type WriteNiftiOptions } from './nifti-write.js';
export { int16Scaling, type Int16Scaling } from './int16-scaling.js';
export type { Run, Sidecar, BoldEvent, NiftiReadInfo, TransformSource } from './run-types.js';
