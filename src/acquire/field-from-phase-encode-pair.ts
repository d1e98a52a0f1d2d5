import { checkPhaseEncodePair, type PhaseEncodePair } from './phase-encode-pair.js';
import { reversedPhaseEncodeShift } from './reversed-phase-encode-shift.js';

/**
 * The field (Hz) a reversed phase-encode pair implies: A's displacement by
 * {@link reversedPhaseEncodeShift} (2-voxel FWHM regularisation) over (sign of A x readout time).
 * @param pair - the pair on the run's grid
 * @param dims - the run's [nx, ny, nz]
 * @returns field offset, Hz
 * @throws BoldsweepError PHASE_ENCODE_PAIR_INVALID
 * @example const hz = fieldFromPhaseEncodePair(pair, [64, 64, 36])
 */
export function fieldFromPhaseEncodePair(pair: PhaseEncodePair, dims: readonly [number, number, number]): Float32Array {
  const a = checkPhaseEncodePair(pair, dims[0] * dims[1] * dims[2]);
  const { shiftVoxels } = reversedPhaseEncodeShift(pair.imageA, pair.imageB, dims, a.axis);
  const out = new Float32Array(shiftVoxels.length);
  for (let v = 0; v < out.length; v++) out[v] = shiftVoxels[v] / (a.sign * pair.totalReadoutTimeSec);
  return out;
}
