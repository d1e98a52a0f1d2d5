import { fail } from '../core/fail.js';
import type { Sidecar } from '../io/run-types.js';
import { phaseEncodeAxis } from './phase-encode-axis.js';
import { totalReadoutTimeSec } from './total-readout-time.js';

/** How an EPI readout turns a B0 field into a displacement: along which voxel axis, which way, for how long. */
export interface B0Readout {
  /** Phase-encode voxel axis: 0 = i, 1 = j, 2 = k. */
  phaseEncodeAxis: 0 | 1 | 2;
  /** +1 when the phase-encode direction runs along the axis, -1 when reversed ('j-'). */
  phaseEncodeSign: 1 | -1;
  /** Total readout time, seconds. */
  totalReadoutTimeSec: number;
}

/**
 * The phase-encode axis, its sense and the total readout time of an EPI image, from its BIDS sidecar
 * (PhaseEncodingDirection; TotalReadoutTime, else EffectiveEchoSpacing x (phase-encode lines - 1),
 * the BIDS definition, by {@link totalReadoutTimeSec}) or from values given directly.
 * @param sidecar - the image's sidecar (or null)
 * @param dims - the image's [nx, ny, nz] (the phase-encode lines for EffectiveEchoSpacing)
 * @param given - phaseEncodingDirection and totalReadoutTimeSec that override the sidecar
 * @param what - the image, for the messages. __Default value:__ 'the run'
 * @returns axis, sign and readout time
 * @throws BoldsweepError PHASE_ENCODE_MISSING, PHASE_ENCODE_INVALID (not i, j, k with an optional -),
 *   READOUT_TIME_MISSING, INVALID_ARGUMENT for a readout time that is not a positive number
 * @example b0Readout({ PhaseEncodingDirection: 'j-', TotalReadoutTime: 0.03 }, [64, 64, 36]) // { phaseEncodeAxis: 1, phaseEncodeSign: -1, totalReadoutTimeSec: 0.03 }
 */
export function b0Readout(
  sidecar: Sidecar | null,
  dims: readonly [number, number, number] | readonly number[],
  given: { phaseEncodingDirection?: string; totalReadoutTimeSec?: number } = {},
  what = 'the run',
): B0Readout {
  const s = sidecar ?? {};
  const direction = given.phaseEncodingDirection ?? s.PhaseEncodingDirection;
  if (direction === undefined || direction === null || direction === '') fail('PHASE_ENCODE_MISSING', `the phase-encode direction of ${what} is unknown (no PhaseEncodingDirection in its sidecar)`);
  if (typeof direction !== 'string' || !/^[ijk]-?$/.test(direction)) fail('PHASE_ENCODE_INVALID', `PhaseEncodingDirection of ${what} is '${String(direction)}', not one of i, j, k, i-, j-, k-`);
  const pe = phaseEncodeAxis(direction);
  let readout = given.totalReadoutTimeSec ?? s.TotalReadoutTime;
  if (readout === undefined && s.EffectiveEchoSpacing !== undefined) readout = totalReadoutTimeSec(s.EffectiveEchoSpacing, dims[pe.axis]);
  if (readout === undefined) fail('READOUT_TIME_MISSING', `the total readout time of ${what} is unknown (no TotalReadoutTime or EffectiveEchoSpacing in its sidecar)`);
  if (!(readout > 0) || !Number.isFinite(readout)) fail('INVALID_ARGUMENT', `the total readout time of ${what} must be a positive number of seconds, got ${readout}`);
  return { phaseEncodeAxis: pe.axis, phaseEncodeSign: pe.sign, totalReadoutTimeSec: readout };
}
