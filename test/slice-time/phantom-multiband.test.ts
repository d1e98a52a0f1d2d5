import { describe, expect, it } from 'vitest';
import { interleavedSliceTiming } from '../../src/acquire/interleaved-slice-timing.js';
import { sliceOrderTiming } from '../../src/acquire/slice-order-timing.js';
import { demoPhantomSpec, resolvePhantomSpec } from '../../src/simulate/phantom-spec.js';
import { phantomAcquisitionModel } from '../../src/simulate/phantom-acquisition-model.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { quietSpec } from '../simulate/phantom-helpers.js';

describe('phantom multiband slice timing', () => {
  it('a factor of 3 on 21 slices: bands of 7 slices read at once, in the sidecar and the acquisition model', () => {
    const run = simulatePhantomRun(resolvePhantomSpec(quietSpec({ nVolumes: 3, acquisition: { multibandFactor: 3 } })));
    const expected = sliceOrderTiming(21, 2, 'interleaved-odd-first', { multibandFactor: 3 });
    expect(run.sidecar!.SliceTiming).toEqual(expected);
    expect(run.sidecar!.MultibandAccelerationFactor).toBe(3);
    // slices k, k + 7, k + 14 share a time; 7 distinct times
    for (let k = 0; k < 7; k++) expect([expected[k + 7], expected[k + 14]]).toEqual([expected[k], expected[k]]);
    expect(new Set(expected).size).toBe(7);
    expect(Array.from(phantomAcquisitionModel(run).sliceTimesSec!)).toEqual(expected);
  });
  it('without the option the slice times and sidecar are as before (the demo spec has no such field)', () => {
    const run = simulatePhantomRun(resolvePhantomSpec(quietSpec({ nVolumes: 2 })));
    expect(run.sidecar!.SliceTiming).toEqual(interleavedSliceTiming(21, 2));
    expect('MultibandAccelerationFactor' in run.sidecar!).toBe(false);
    expect('multibandFactor' in demoPhantomSpec().acquisition).toBe(false);
  });
  it('refuses a factor that does not divide the slice count', () => {
    expect(() => resolvePhantomSpec(quietSpec({ acquisition: { multibandFactor: 4 } }))).toThrow(/multibandFactor/);
  });
});
