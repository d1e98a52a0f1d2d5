import { fail } from '../core/fail.js';
import { fieldMapShiftVoxels } from './field-map-shift-voxels.js';

/**
 * The voxel shift map of a field map: at every voxel, the displacement along the phase-encode axis
 * of the signal of the tissue there, sign x field (Hz) x total readout time (s) voxels
 * ({@link fieldMapShiftVoxels}; Jezzard & Balaban 1995). The map lives in the undistorted space:
 * the signal of position y appears at y + shift(y).
 * @param fieldHz - field offset, Hz, one 3D map
 * @param readout - total readout time (s) and the phase-encode sign (+1, or -1 for a reversed direction)
 * @param out - where to write (length of fieldHz); a new array when omitted
 * @returns `out`, voxels along the phase-encode axis
 * @throws BoldsweepError INVALID_ARGUMENT for a readout time that is not positive, a bad sign or length
 * @example shiftMapVoxels(fieldHz, { totalReadoutTimeSec: 0.0315, sign: 1 }) // 50 Hz -> 1.575 voxels
 */
export function shiftMapVoxels(fieldHz: ArrayLike<number>, readout: { totalReadoutTimeSec: number; sign: 1 | -1 }, out?: Float32Array): Float32Array {
  const n = fieldHz.length;
  if (!(readout.totalReadoutTimeSec > 0) || !Number.isFinite(readout.totalReadoutTimeSec)) fail('INVALID_ARGUMENT', `totalReadoutTimeSec must be a positive number of seconds, got ${readout.totalReadoutTimeSec}`);
  if (readout.sign !== 1 && readout.sign !== -1) fail('INVALID_ARGUMENT', `sign must be 1 or -1, got ${String(readout.sign)}`);
  const result = out ?? new Float32Array(n);
  if (result.length !== n) fail('INVALID_ARGUMENT', `out has ${result.length} values, the field map ${n}`);
  for (let v = 0; v < n; v++) result[v] = readout.sign * fieldMapShiftVoxels(fieldHz[v], readout.totalReadoutTimeSec);
  return result;
}
