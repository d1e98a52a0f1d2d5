import { fail } from '../core/fail.js';

/**
 * Slice acquisition times of an interleaved ascending order, evenly spread over one TR. With
 * `startAt` 0 (the default, the digital phantom's order) the slices of 0-based index 0, 2, 4, ...
 * are read first, from the bottom up, then 1, 3, 5, ...: counted from 1, as scanner consoles count,
 * this is the "odd-first" order (1, 3, 5, ... then 2, 4, ...). With `startAt` 1 the 0-based odd
 * slices come first ("even-first" counted from 1); some scanners use that order when the slice count
 * is even (a stated option, not guessed: pass it when the protocol says so). Returned in slice order,
 * as the BIDS SliceTiming field wants. See {@link sequentialSliceTiming} for ascending and descending
 * orders and `sliceOrderTiming` for multiband.
 * @param nSlices - number of slices (third image dimension)
 * @param trSec - repetition time, seconds
 * @param options - `startAt`: 0-based index of the first slice read, 0 or 1. __Default value:__ 0
 * @returns acquisition time of each slice relative to the start of the volume, seconds
 * @example interleavedSliceTiming(4, 2) // [0, 1, 0.5, 1.5]
 * @example interleavedSliceTiming(4, 2, { startAt: 1 }) // [1, 0, 1.5, 0.5]
 */
export function interleavedSliceTiming(nSlices: number, trSec: number, options: { startAt?: 0 | 1 } = {}): number[] {
  if (!Number.isInteger(nSlices) || nSlices < 1) fail('INVALID_ARGUMENT', `nSlices must be a positive integer, got ${nSlices}`);
  if (!(trSec > 0)) fail('INVALID_ARGUMENT', `trSec must be positive, got ${trSec}`);
  const startAt = options.startAt ?? 0;
  if (startAt !== 0 && startAt !== 1) fail('INVALID_ARGUMENT', `startAt must be 0 or 1, got ${String(startAt)}`);
  const times = new Array<number>(nSlices);
  // slices of the first parity (k % 2 === startAt) are read first
  const nFirst = startAt === 0 ? Math.ceil(nSlices / 2) : Math.floor(nSlices / 2);
  for (let k = 0; k < nSlices; k++) {
    const position = k % 2 === startAt ? (k - startAt) / 2 : nFirst + (k - (1 - startAt)) / 2;
    // rounded to microseconds so the sidecar shows clean numbers
    times[k] = Math.round(((position * trSec) / nSlices) * 1e6) / 1e6;
  }
  return times;
}
