import { fail } from '../core/fail.js';

/**
 * A B0 field map in Hz from a phase-difference map of two gradient echoes:
 * field (Hz) = dphi (rad) / (2 pi dTE (s)), the phase a spin gains per second at that frequency
 * (standard MR physics, e.g. Jezzard & Balaban 1995; the BIDS `phasediff` field-map case, with
 * dTE = EchoTime2 - EchoTime1). The phase difference must already be unwrapped.
 * @param phaseDifferenceRad - phase of echo 2 minus echo 1, radians, one 3D map
 * @param deltaTeSec - echo-time difference EchoTime2 - EchoTime1, seconds (non-zero)
 * @returns field offset, Hz
 * @throws BoldsweepError INVALID_ARGUMENT for a zero or non-finite echo-time difference or a non-finite phase
 * @example fieldMapFromPhaseDifference(Float32Array.of(Math.PI), 0.00246) // [203.25...] Hz
 */
export function fieldMapFromPhaseDifference(phaseDifferenceRad: ArrayLike<number>, deltaTeSec: number): Float32Array {
  if (!Number.isFinite(deltaTeSec) || deltaTeSec === 0) fail('INVALID_ARGUMENT', `the echo-time difference (EchoTime2 - EchoTime1) must be a non-zero number of seconds, got ${deltaTeSec}`);
  const out = new Float32Array(phaseDifferenceRad.length);
  const k = 1 / (2 * Math.PI * deltaTeSec);
  for (let v = 0; v < out.length; v++) {
    const p = phaseDifferenceRad[v];
    if (!Number.isFinite(p)) fail('INVALID_ARGUMENT', `phase difference at voxel ${v} is ${p}`);
    out[v] = p * k;
  }
  return out;
}
