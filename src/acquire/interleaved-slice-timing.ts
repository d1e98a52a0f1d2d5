import { fail } from '../core/fail.js';

/**
 * Slice acquisition times of an interleaved ascending order: the even-numbered slices (0-based
 * index 0, 2, 4, ...) first, from the bottom up, then the odd ones (1, 3, 5, ...), evenly spread
 * over one TR. Returned in slice order, as the BIDS SliceTiming field wants. (The digital phantom's
 * order; see {@link sequentialSliceTiming} for ascending and descending orders.)
 * @param nSlices - number of slices (third image dimension)
 * @param trSec - repetition time, seconds
 * @returns acquisition time of each slice relative to the start of the volume, seconds
 * @example interleavedSliceTiming(4, 2) // [0, 1, 0.5, 1.5]
 */
export function interleavedSliceTiming(nSlices: number, trSec: number): number[] {
  if (!Number.isInteger(nSlices) || nSlices < 1) fail('INVALID_ARGUMENT', `nSlices must be a positive integer, got ${nSlices}`);
  if (!(trSec > 0)) fail('INVALID_ARGUMENT', `trSec must be positive, got ${trSec}`);
  const times = new Array<number>(nSlices);
  const nEven = Math.ceil(nSlices / 2);
  for (let k = 0; k < nSlices; k++) {
    const position = k % 2 === 0 ? k / 2 : nEven + (k - 1) / 2;
    // rounded to microseconds so the sidecar shows clean numbers
    times[k] = Math.round(((position * trSec) / nSlices) * 1e6) / 1e6;
  }
  return times;
}
