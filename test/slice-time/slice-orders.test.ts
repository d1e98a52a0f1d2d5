import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { interleavedSliceTiming } from '../../src/acquire/interleaved-slice-timing.js';
import { sliceOrderTiming } from '../../src/acquire/slice-order-timing.js';

function codeOf(f: () => unknown): string {
  try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : `other: ${String(e)}`; }
  return 'none';
}

// Hand-written tables: slice k (0-based, bottom up) is read at position p of the TR, time p * TR / n.
// TR 6 s, 6 slices: one slice per second.
describe('generated slice orders against hand-written tables', () => {
  it('ascending and descending', () => {
    expect(sliceOrderTiming(6, 6, 'ascending')).toEqual([0, 1, 2, 3, 4, 5]);
    expect(sliceOrderTiming(6, 6, 'descending')).toEqual([5, 4, 3, 2, 1, 0]);
  });
  it('interleaved odd-first (counted from 1: 1, 3, 5, then 2, 4, 6)', () => {
    // 0-based slices 0, 2, 4 at 0, 1, 2 s; 1, 3, 5 at 3, 4, 5 s
    expect(sliceOrderTiming(6, 6, 'interleaved-odd-first')).toEqual([0, 3, 1, 4, 2, 5]);
    // odd count, 5 slices, TR 5 s: read 0, 2, 4, 1, 3
    expect(sliceOrderTiming(5, 5, 'interleaved-odd-first')).toEqual([0, 3, 1, 4, 2]);
  });
  it('interleaved even-first (counted from 1: 2, 4, 6, then 1, 3, 5)', () => {
    // 0-based slices 1, 3, 5 at 0, 1, 2 s; 0, 2, 4 at 3, 4, 5 s
    expect(sliceOrderTiming(6, 6, 'interleaved-even-first')).toEqual([3, 0, 4, 1, 5, 2]);
    // 5 slices: read 1, 3, then 0, 2, 4
    expect(sliceOrderTiming(5, 5, 'interleaved-even-first')).toEqual([2, 0, 3, 1, 4]);
    expect(interleavedSliceTiming(4, 2, { startAt: 1 })).toEqual([1, 0, 1.5, 0.5]);
  });
  it('the default interleaved order is unchanged (the phantom\'s)', () => {
    expect(interleavedSliceTiming(4, 2)).toEqual([0, 1, 0.5, 1.5]);
    expect(sliceOrderTiming(7, 2, 'interleaved-odd-first')).toEqual(interleavedSliceTiming(7, 2));
  });
  it('multiband: slices k and k + n/m read together, each band in the order', () => {
    // 6 slices, factor 2, TR 3 s: bands {0,1,2} and {3,4,5}, ascending within a band, one per second
    expect(sliceOrderTiming(6, 3, 'ascending', { multibandFactor: 2 })).toEqual([0, 1, 2, 0, 1, 2]);
    // 8 slices, factor 2, interleaved odd-first over 4 slices per band at TR 2 s: 0, 2 then 1, 3
    expect(sliceOrderTiming(8, 2, 'interleaved-odd-first', { multibandFactor: 2 })).toEqual([0, 1, 0.5, 1.5, 0, 1, 0.5, 1.5]);
    // factor 3, descending: bands of 2
    expect(sliceOrderTiming(6, 2, 'descending', { multibandFactor: 3 })).toEqual([1, 0, 1, 0, 1, 0]);
    // factor equal to the slice count: all at once
    expect(sliceOrderTiming(4, 2, 'ascending', { multibandFactor: 4 })).toEqual([0, 0, 0, 0]);
  });
  it('bad input: a factor that does not divide the slice count, an unknown order', () => {
    expect(codeOf(() => sliceOrderTiming(7, 2, 'ascending', { multibandFactor: 2 }))).toBe('SLICE_TIMING_MULTIBAND');
    expect(codeOf(() => sliceOrderTiming(6, 2, 'ascending', { multibandFactor: 0 }))).toBe('SLICE_TIMING_MULTIBAND');
    expect(codeOf(() => sliceOrderTiming(6, 2, 'spiral' as never))).toBe('INVALID_ARGUMENT');
    expect(codeOf(() => interleavedSliceTiming(6, 2, { startAt: 2 as never }))).toBe('INVALID_ARGUMENT');
  });
});
