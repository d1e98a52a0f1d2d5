import { fail } from '../core/fail.js';

/**
 * Slice acquisition times of a sequential order, evenly spread over one TR: 'ascending' reads slice
 * 0 first and the last slice last, 'descending' the reverse. Returned in slice order, as the BIDS
 * SliceTiming field wants, rounded to microseconds as a sidecar shows them.
 * @param nSlices - number of slices along the slice axis
 * @param trSec - repetition time, seconds
 * @param order - 'ascending' or 'descending'
 * @returns acquisition time of each slice relative to the start of the volume, seconds
 * @throws BoldsweepError INVALID_ARGUMENT for a bad count, TR or order
 * @example sequentialSliceTiming(4, 2, 'descending') // [1.5, 1, 0.5, 0]
 */
export function sequentialSliceTiming(nSlices: number, trSec: number, order: 'ascending' | 'descending'): number[] {
  if (!Number.isInteger(nSlices) || nSlices < 1) fail('INVALID_ARGUMENT', `nSlices must be a positive integer, got ${nSlices}`);
  if (!(trSec > 0) || !Number.isFinite(trSec)) fail('INVALID_ARGUMENT', `trSec must be positive, got ${trSec}`);
  if (order !== 'ascending' && order !== 'descending') fail('INVALID_ARGUMENT', `order must be 'ascending' or 'descending', got '${String(order)}'`);
  return Array.from({ length: nSlices }, (_, k) => {
    const position = order === 'ascending' ? k : nSlices - 1 - k;
    return Math.round(((position * trSec) / nSlices) * 1e6) / 1e6;
  });
}
