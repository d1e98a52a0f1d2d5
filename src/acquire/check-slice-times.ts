import { fail } from '../core/fail.js';

/**
 * Check slice acquisition times against the run: one per slice along the slice axis, each a finite
 * number of seconds from the start of its volume, inside the repetition time.
 * @param times - acquisition time of each slice, seconds (not modified)
 * @param nSlices - slices along the slice axis
 * @param trSec - repetition time, seconds
 * @param source - where the times came from, for the message (e.g. 'the sidecar SliceTiming')
 * @returns the times as a new Float64Array
 * @throws BoldsweepError SLICE_TIMING_LENGTH for another count; SLICE_TIMING_INVALID for a
 *   non-finite, negative or too late time
 * @example checkSliceTimes(sidecar.SliceTiming, 34, 2, 'the sidecar SliceTiming')
 */
export function checkSliceTimes(times: ArrayLike<number>, nSlices: number, trSec: number, source: string): Float64Array {
  if (!times || times.length !== nSlices) {
    fail('SLICE_TIMING_LENGTH', `${source} has ${times ? times.length : 'no'} entries, the run has ${nSlices} slices along its slice axis`, { details: { entries: times ? times.length : 0, slices: nSlices } });
  }
  const out = new Float64Array(nSlices);
  for (let k = 0; k < nSlices; k++) {
    const t = times[k];
    if (typeof t !== 'number' || !Number.isFinite(t) || t < 0) fail('SLICE_TIMING_INVALID', `${source}[${k}] is ${String(t)}; slice times are seconds from the start of each volume, 0 or more`, { details: { slice: k } });
    if (t >= trSec) {
      const ms = t > 100 * trSec ? ' (it looks like milliseconds)' : '';
      fail('SLICE_TIMING_INVALID', `${source}[${k}] is ${t} s, not inside the repetition time ${trSec} s${ms}`, { details: { slice: k } });
    }
    out[k] = t;
  }
  return out;
}
