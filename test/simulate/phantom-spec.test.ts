import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { defaultPhantomSpec, demoPhantomSpec, resolvePhantomSpec } from '../../src/simulate/phantom-spec.js';

describe('phantom spec', () => {
  it('fills defaults, merges nested groups one level deep, and leaves the input alone', () => {
    const input = { nVolumes: 20, acquisition: { trSec: 1.5 }, physio: null };
    const copy = structuredClone(input);
    const spec = resolvePhantomSpec(input);
    expect(input).toEqual(copy);
    expect(spec.nVolumes).toBe(20);
    expect(spec.acquisition.trSec).toBe(1.5);
    expect(spec.acquisition.flipAngleDeg).toBe(77);
    expect(spec.physio).toBeNull();
    expect(spec.dims).toEqual([44, 52, 34]);
  });
  it('the demo spec adds a jerk, field inhomogeneity, spikes and a dropout to the defaults', () => {
    const d = demoPhantomSpec(), base = defaultPhantomSpec();
    expect(base.motion?.jerk).toBeNull();
    expect(d.motion?.jerk?.volume).toBe(83);
    expect(d.b0).not.toBeNull();
    expect(d.spikes).toHaveLength(3);
    expect(d.dropouts).toHaveLength(1);
    expect(d.nVolumes).toBe(150);
  });
  it.each([
    [{ seed: -1 }, /seed/],
    [{ dims: [44, 52] as unknown as [number, number, number] }, /dims/],
    [{ nVolumes: 0 }, /nVolumes/],
    [{ acquisition: { teSec: 3 } }, /teSec/],
    [{ acquisition: { flipAngleDeg: 200 } }, /flipAngleDeg/],
    [{ spikes: [{ volume: 500, amplitude: 10 }] }, /spikes\[0\]/],
    [{ dropouts: [{ volume: 1, slice: 99, keptFraction: 0.1 }] }, /dropouts\[0\]/],
    [{ greyMatterSignal: 50000 }, /int16/],
    [{ colour: 'red' } as never, /no field 'colour'/],
  ])('rejects %j with INVALID_ARGUMENT', (input, message) => {
    try {
      resolvePhantomSpec(input);
      expect.fail('no error');
    } catch (e) {
      expect(isBoldsweepError(e) && e.code).toBe('INVALID_ARGUMENT');
      expect(String((e as Error).message)).toMatch(message);
    }
  });
});
