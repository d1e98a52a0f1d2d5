import type { Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { trilinearAt, trilinearResample } from '../resample/trilinear-resample.js';
import { fieldMapShiftVoxels } from './field-map-shift-voxels.js';

/**
 * The phase-encode displacement at each scanner voxel of one volume, from a field map fixed to the
 * head: the field (Hz, in the head's reference position) is carried to the volume's pose by
 * trilinear interpolation at `fieldFromOut * [i, j, k, 1]` (outside its grid: 0 Hz), rounded to
 * float32, and turned into voxels by {@link fieldMapShiftVoxels} with the direction's sign.
 * @param fieldHz - field map, Hz, NIfTI order on its own grid
 * @param fieldDims - [nx, ny, nz] of the field map's grid
 * @param fieldFromOut - output voxel index -> field-map voxel index at this volume (through the inverse pose)
 * @param outDims - [nx, ny, nz] of the output (the run's grid)
 * @param readout - total readout time (s) and the phase-encode sign (+1, or -1 for a reversed direction)
 * @param out - shift in voxels along the phase-encode axis, length of outDims
 * @param voxels - only these output voxels (others of `out` are left as they are); __Default value:__ all
 * @param scratch - a float32 array of out's length for the moved field when `voxels` is not given (saves an allocation)
 * @returns `out`
 * @throws BoldsweepError INVALID_ARGUMENT for mismatched lengths or a non-finite readout time
 * @example headFieldShiftVoxels(field, dims, fieldFromOut, dims, { totalReadoutTimeSec: 0.0179, sign: 1 }, shift)
 */
export function headFieldShiftVoxels(
  fieldHz: ArrayLike<number>,
  fieldDims: readonly [number, number, number],
  fieldFromOut: Affine,
  outDims: readonly [number, number, number],
  readout: { totalReadoutTimeSec: number; sign: 1 | -1 },
  out: Float32Array,
  voxels?: ArrayLike<number>,
  scratch?: Float32Array,
): Float32Array {
  const nOut = outDims[0] * outDims[1] * outDims[2];
  if (out.length !== nOut) fail('INVALID_ARGUMENT', `out has ${out.length} values, the output grid ${nOut}`);
  if (!(readout.totalReadoutTimeSec > 0) || !Number.isFinite(readout.totalReadoutTimeSec)) fail('INVALID_ARGUMENT', `totalReadoutTimeSec must be a positive number of seconds, got ${readout.totalReadoutTimeSec}`);
  const { totalReadoutTimeSec: readoutSec, sign } = readout;
  if (!voxels) {
    const moved = trilinearResample(fieldHz, fieldDims, fieldFromOut, outDims, scratch && scratch.length === nOut ? scratch : undefined);
    for (let v = 0; v < nOut; v++) out[v] = sign * fieldMapShiftVoxels(moved[v], readoutSec);
    return out;
  }
  const m = fieldFromOut;
  const nx = outDims[0], nxy = outDims[0] * outDims[1];
  for (let q = 0; q < voxels.length; q++) {
    const v = voxels[q];
    const k = Math.floor(v / nxy), j = Math.floor((v - k * nxy) / nx), i = v - k * nxy - j * nx;
    const x = m[0] * i + m[1] * j + m[2] * k + m[3];
    const y = m[4] * i + m[5] * j + m[6] * k + m[7];
    const z = m[8] * i + m[9] * j + m[10] * k + m[11];
    out[v] = sign * fieldMapShiftVoxels(Math.fround(trilinearAt(fieldHz, fieldDims, x, y, z, 'constant', 0)), readoutSec);
  }
  return out;
}
