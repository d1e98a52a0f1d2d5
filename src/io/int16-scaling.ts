import { fail } from '../core/fail.js';

/** scl_slope and scl_inter of an int16 NIfTI image: stored value q means q * slope + inter. */
export interface Int16Scaling {
  /** Step between neighbouring stored values (a float32 number, as the header holds it). */
  slope: number;
  /** Value of stored 0 (a float32 number, as the header holds it). */
  inter: number;
}

const fround = Math.fround;

/**
 * Choose scl_slope and scl_inter so int16 storage covers the data range with the finest step.
 * Integers already inside -32768..32767 are kept exactly (slope 1, inter 0). Otherwise inter is the
 * middle of the range and slope = range / 65534, both rounded to float32 (the header's type) and the
 * slope nudged up until the rounded extremes still land inside -32767..32767, so no value is clipped
 * and rounding to the nearest step errs by at most slope / 2.
 * @param data - voxel values (all finite)
 * @returns slope and inter, both exactly representable as float32
 * @throws BoldsweepError INVALID_ARGUMENT when a value is NaN or infinite (int16 cannot hold it)
 * @example int16Scaling(Float32Array.of(-1, 0.5, 3)) // { slope: ~6.1e-5, inter: 1 }
 */
export function int16Scaling(data: Float32Array): Int16Scaling {
  let min = Infinity;
  let max = -Infinity;
  let allIntegers = true;
  for (let i = 0; i < data.length; i++) {
    const v = data[i];
    if (!Number.isFinite(v)) fail('INVALID_ARGUMENT', `int16 storage cannot hold the non-finite value ${v} at index ${i}; write float32 or replace it`);
    if (v < min) min = v;
    if (v > max) max = v;
    if (allIntegers && v !== Math.round(v)) allIntegers = false;
  }
  if (data.length === 0) return { slope: 1, inter: 0 };
  if (allIntegers && min >= -32768 && max <= 32767) return { slope: 1, inter: 0 };
  if (max === min) return { slope: 1, inter: fround(min) };
  const inter = fround(min / 2 + max / 2);
  let slope = fround((max - min) / 65534);
  if (slope === 0) slope = 2 ** -149; // smallest float32 step, for ranges below float32 resolution
  // the float32 rounding of inter and slope can push an extreme past +-32767; widen the step until it fits
  while ((max - inter) / slope > 32767 || (min - inter) / slope < -32767) slope = nextFloat32Up(slope);
  return { slope, inter };
}

/** Next larger float32 after a positive float32 x. */
function nextFloat32Up(x: number): number {
  const f = new Float32Array([x]);
  const u = new Uint32Array(f.buffer);
  u[0] += 1;
  return f[0];
}
