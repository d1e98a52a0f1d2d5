// The dephasing model lives with the acquisition model (src/acquire), which the phantom and the
// unwarping step's signal-loss map share; this file keeps the phantom's import path.
export { intravoxelDephasing } from '../acquire/intravoxel-dephasing.js';
