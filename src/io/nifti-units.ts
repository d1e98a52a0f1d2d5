/** Spatial unit named by xyzt_units (bits 0-2); 'unknown' (code 0) is read as mm (common practice, no source). */
export type NiftiSpaceUnit = 'mm' | 'um' | 'm' | 'unknown';
/** Time unit named by xyzt_units (bits 3-5); 'unknown' (code 0) is read as s (common practice, no source); 'other' = Hz, ppm or rad/s. */
export type NiftiTimeUnit = 's' | 'ms' | 'us' | 'unknown' | 'other';

/** Decoded xyzt_units with the factors that bring values to mm and seconds. */
export interface NiftiUnits {
  space: NiftiSpaceUnit;
  time: NiftiTimeUnit;
  /** Multiply header lengths by this to get mm. */
  toMm: number;
  /** Multiply header times by this to get seconds; 0 when pixdim[4] is not a time (Hz, ppm, rad/s). */
  toSec: number;
}

/**
 * Decode the NIfTI-1 xyzt_units byte (nifti1.h: NIFTI_UNITS_METER 1, _MM 2, _MICRON 3 in bits 0-2;
 * _SEC 8, _MSEC 16, _USEC 24, _HZ 32, _PPM 40, _RADS 48 in bits 3-5).
 * @param xyztUnits - the header field
 * @returns unit names and the factors to mm and seconds
 * @example niftiUnits(2 | 16) // { space: 'mm', time: 'ms', toMm: 1, toSec: 0.001 }
 */
export function niftiUnits(xyztUnits: number): NiftiUnits {
  const spaceCode = xyztUnits & 0x07;
  const timeCode = xyztUnits & 0x38;
  const [space, toMm]: [NiftiSpaceUnit, number] =
    spaceCode === 1 ? ['m', 1000] : spaceCode === 3 ? ['um', 0.001] : spaceCode === 2 ? ['mm', 1] : ['unknown', 1];
  const [time, toSec]: [NiftiTimeUnit, number] =
    timeCode === 8 ? ['s', 1] : timeCode === 16 ? ['ms', 1e-3] : timeCode === 24 ? ['us', 1e-6] : timeCode === 0 ? ['unknown', 1] : ['other', 0];
  return { space, time, toMm, toSec };
}
