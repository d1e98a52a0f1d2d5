import { fail } from '../core/fail.js';
import { interleavedSliceTiming } from './interleaved-slice-timing.js';
import { sequentialSliceTiming } from './sequential-slice-timing.js';

/**
 * Slice orders the tool can generate. 'interleaved-odd-first' and 'interleaved-even-first' count
 * slices from 1, as scanner consoles do: odd-first reads 0-based slices 0, 2, 4, ... first.
 */
export const SLICE_ORDERS = ['ascending', 'descending', 'interleaved-odd-first', 'interleaved-even-first'] as const;
/** One of {@link SLICE_ORDERS}. */
export type SliceOrder = (typeof SLICE_ORDERS)[number];

/**
 * Slice acquisition times of a generated order, single-band or multiband. With a multiband factor m
 * the nSlices slices form m bands of nSlices / m neighbouring slices; slice k is read together with
 * slices k +- nSlices/m, ... (one slice of each band at once), and the bands' slices follow `order`
 * over the whole TR: slice k gets the time the single-band order gives slice k mod (nSlices / m) of
 * nSlices / m slices (common practice for simultaneous multi-slice acquisition, no source).
 * Returned in slice order, as the BIDS SliceTiming field wants, rounded to microseconds.
 * @param nSlices - slices along the slice axis
 * @param trSec - repetition time, seconds
 * @param order - one of {@link SLICE_ORDERS}
 * @param options - `multibandFactor`: slices read at once, dividing nSlices. __Default value:__ 1
 * @returns acquisition time of each slice from the start of its volume, seconds
 * @throws BoldsweepError INVALID_ARGUMENT for a bad count, TR or order; SLICE_TIMING_MULTIBAND when
 *   the factor does not divide the slice count
 * @example sliceOrderTiming(6, 3, 'ascending', { multibandFactor: 2 }) // [0, 1, 2, 0, 1, 2]
 */
export function sliceOrderTiming(nSlices: number, trSec: number, order: SliceOrder, options: { multibandFactor?: number } = {}): number[] {
  if (!Number.isInteger(nSlices) || nSlices < 1) fail('INVALID_ARGUMENT', `nSlices must be a positive integer, got ${nSlices}`);
  const m = options.multibandFactor ?? 1;
  if (!Number.isInteger(m) || m < 1 || nSlices % m !== 0) {
    fail('SLICE_TIMING_MULTIBAND', `a multiband factor of ${String(m)} does not divide the ${nSlices} slices into bands of equal size`, { details: { factor: String(m), slices: nSlices } });
  }
  const perBand = nSlices / m;
  let band: number[];
  if (order === 'ascending' || order === 'descending') band = sequentialSliceTiming(perBand, trSec, order);
  else if (order === 'interleaved-odd-first') band = interleavedSliceTiming(perBand, trSec, { startAt: 0 });
  else if (order === 'interleaved-even-first') band = interleavedSliceTiming(perBand, trSec, { startAt: 1 });
  else return fail('INVALID_ARGUMENT', `slice order must be one of ${SLICE_ORDERS.join(', ')}, got '${String(order)}'`);
  return Array.from({ length: nSlices }, (_, k) => band[k % perBand]);
}
