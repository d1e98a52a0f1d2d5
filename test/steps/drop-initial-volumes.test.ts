import { describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume } from '../../src/core/volume.js';
import type { BoldEvent } from '../../src/io/run-types.js';
import { dropInitialVolumesStep, shiftEvents } from '../../src/steps/drop-initial-volumes.js';
import type { StepResult } from '../../src/steps/step-types.js';

const ev = (onsetSec: number, durationSec: number, trialType = 'task'): BoldEvent => ({ onsetSec, durationSec, trialType, modulation: 1 });

describe('drop-initial-volumes', () => {
  const nt = 10;
  const data = Float32Array.from({ length: 2 * nt }, (_, i) => i);
  const run = makeVolume({ dims: [2, 1, 1, nt], spacingMm: [3, 3, 3], trSec: 2, affine: identityAffine(), data });

  it('removes the first volumes and shifts, trims or removes events', () => {
    const events = [ev(0, 4), ev(4, 4), ev(2, 10), ev(10, 5)];
    const res = dropInitialVolumesStep(run, { count: 3 }, { sidecar: { RepetitionTime: 2 }, events, mask: null }) as StepResult;
    expect(res.volume.dims).toEqual([2, 1, 1, 7]);
    expect(Array.from(res.volume.data)).toEqual(Array.from(data.subarray(6)));
    // new time zero at 6 s: [0,4) removed; [4,8) -> [0,2) trimmed; [2,12) -> [0,6) trimmed; 10 -> 4
    expect(res.context?.events).toEqual([ev(0, 2), ev(0, 6), ev(4, 5)]);
    expect(res.note.diagnostics).toMatchObject({ eventsTrimmed: 2, eventsRemoved: 1, shiftSec: 6, volumesAfter: 7 });
    expect(res.context?.sidecar?.NumberOfVolumesDiscardedByUser).toBe(3);
    expect(events[1].onsetSec).toBe(4); // input events untouched
    expect(Array.from(run.data)).toEqual(Array.from({ length: 2 * nt }, (_, i) => i));
    // the kept volumes are a view of the input (no copy)
    expect(res.volume.data.buffer).toBe(run.data.buffer);
    expect(res.volume.data.byteOffset).toBe(run.data.byteOffset + 6 * 4);
  });
  it('keeps events unchanged for count 0', () => {
    expect(shiftEvents([ev(1, 1)], 0)).toEqual({ events: [ev(1, 1)], trimmed: 0, removed: 0 });
  });
  it('rejects counts that leave fewer than two volumes, and shifting events without a TR', () => {
    for (const count of [-1, 1.5, 9]) {
      try { dropInitialVolumesStep(run, { count }, { sidecar: null, events: null, mask: null }); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'INVALID_ARGUMENT')).toBe(true); }
    }
    const noTr = makeVolume({ ...run, trSec: 0 });
    try { dropInitialVolumesStep(noTr, { count: 2 }, { sidecar: null, events: [ev(5, 1)], mask: null }); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'TR_MISSING')).toBe(true); }
  });
});
