import { fail } from '../core/fail.js';
import { fourierShifter } from './fourier-shifter.js';
import { shiftSeriesCubic } from './shift-series-cubic.js';
import { shiftSeriesLinear } from './shift-series-linear.js';

/** Interpolations of a slice's time series: linear, cubic (Keys a = -1/2), Fourier (sinc). */
export const SHIFT_METHODS = ['linear', 'cubic', 'fourier'] as const;
/** One of {@link SHIFT_METHODS}. */
export type ShiftMethod = (typeof SHIFT_METHODS)[number];

/** Voxels gathered at once: consecutive voxels of a slice, so each volume is read in short runs. */
const BLOCK = 64;

/**
 * Shift every voxel's time series by its slice's shift (in samples), slices stacked along the third
 * image axis: out at volume n is the series read at n + shiftSamples[k] (see shiftSeriesLinear,
 * shiftSeriesCubic and fourierShifter for each method and its handling of the run's ends). Series
 * are gathered in blocks of consecutive voxels of one slice, shifted in Float64, written back as
 * Float32; a slice whose shift is 0 is copied.
 * @param data - run voxels, NIfTI order (x fastest, then y, z, t; not modified unless it is `out`)
 * @param dims - [nx, ny, nz, nt]
 * @param shiftSamples - shift of each slice along the third axis, in samples (volumes)
 * @param method - 'linear', 'cubic' or 'fourier'
 * @param out - output array of data's length; may be `data` itself (each block is read before it is written)
 * @returns out
 * @throws BoldsweepError INVALID_ARGUMENT for lengths that do not fit, a non-finite shift or an unknown method
 * @example shiftSliceSeries(run.data, run.dims, Float64Array.of(0.5, 0, -0.5), 'fourier', new Float32Array(run.data.length))
 */
export function shiftSliceSeries(data: Float32Array, dims: readonly [number, number, number, number] | readonly number[], shiftSamples: ArrayLike<number>, method: ShiftMethod, out: Float32Array): Float32Array {
  const [nx, ny, nz, nt] = dims;
  const nxy = nx * ny;
  const nvox = nxy * nz;
  if (data.length !== nvox * nt || out.length !== data.length) fail('INVALID_ARGUMENT', `run data (${data.length}) and output (${out.length}) must both hold ${nx}x${ny}x${nz}x${nt} values`);
  if (shiftSamples.length !== nz) fail('INVALID_ARGUMENT', `${shiftSamples.length} slice shifts for ${nz} slices`);
  for (let k = 0; k < nz; k++) if (!Number.isFinite(shiftSamples[k])) fail('INVALID_ARGUMENT', `slice ${k} has shift ${shiftSamples[k]}`);
  if (!(SHIFT_METHODS as readonly string[]).includes(method)) fail('INVALID_ARGUMENT', `shift method must be one of ${SHIFT_METHODS.join(', ')}, got '${String(method)}'`);
  const block = new Float64Array(BLOCK * nt);
  const shifted = new Float64Array(BLOCK * nt);
  const shifter = method === 'fourier' && nt >= 2 ? fourierShifter(nt) : null;
  for (let k = 0; k < nz; k++) {
    const delta = shiftSamples[k];
    for (let v0 = k * nxy; v0 < (k + 1) * nxy; v0 += BLOCK) {
      const m = Math.min(BLOCK, (k + 1) * nxy - v0);
      if (delta === 0 || nt < 2) {
        if (out !== data) for (let t = 0; t < nt; t++) out.set(data.subarray(t * nvox + v0, t * nvox + v0 + m), t * nvox + v0);
        continue;
      }
      for (let t = 0; t < nt; t++) {
        const o = t * nvox + v0;
        for (let j = 0; j < m; j++) block[j * nt + t] = data[o + j];
      }
      if (shifter) {
        for (let j = 0; j < m; j += 2) {
          const a = block.subarray(j * nt, (j + 1) * nt);
          const outA = shifted.subarray(j * nt, (j + 1) * nt);
          const pair = j + 1 < m;
          shifter.shiftPair(a, pair ? block.subarray((j + 1) * nt, (j + 2) * nt) : null, delta, outA, pair ? shifted.subarray((j + 1) * nt, (j + 2) * nt) : null);
        }
      } else {
        for (let j = 0; j < m; j++) {
          const y = block.subarray(j * nt, (j + 1) * nt);
          const z = shifted.subarray(j * nt, (j + 1) * nt);
          if (method === 'linear') shiftSeriesLinear(y, delta, z);
          else shiftSeriesCubic(y, delta, z);
        }
      }
      for (let t = 0; t < nt; t++) {
        const o = t * nvox + v0;
        for (let j = 0; j < m; j++) out[o + j] = shifted[j * nt + t];
      }
    }
  }
  return out;
}
