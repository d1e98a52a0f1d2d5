import { describe, expect, it } from 'vitest';
import type { MotionRow } from '../../src/acquire/rigid-motion-affine.js';
import type { BoldEvent } from '../../src/io/run-types.js';
import { plantTimeCourse } from '../../src/plant/plant-time-course.js';
import { parseSweepSpec } from '../../src/sweep/parse-sweep-spec.js';
import { plantDesignNorm } from '../../src/sweep/plant-design-norm.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';

// The theory's design norm sqrt(p' M p) (residualNorm, checked by hand in test/model/predict-detection)
// with the model's motion terms: invariants that hold whatever the numbers.
const NT = 120;
const TR = 2;
const events: BoldEvent[] = Array.from({ length: 6 }, (_, k) => ({ onsetSec: 20 + 40 * k, durationSec: 20, trialType: 'task', modulation: 1 }));
const still = (t: number): MotionRow => ({ volume: t, shiftXMm: 0, shiftYMm: 0, shiftZMm: 0, rotXDeg: 0, rotYDeg: 0, rotZDeg: 0 });
const spec = (model: SweepSpecInput['model'] = {}) => parseSweepSpec({
  recipe: [{ step: 'smooth', params: { fwhmMm: 6 } }], plant: { sizesFwhmMm: [8], amplitudesPct: [1], count: 2 }, repeats: 1, threshold: { kind: 'fwe-rft' }, seed: 1, model,
});

describe('plantDesignNorm with the model\'s motion terms', () => {
  it('a motion table changes nothing when the model uses none of it', () => {
    const table = Array.from({ length: NT }, (_, t) => ({ ...still(t), shiftXMm: Math.sin(t / 7) }));
    const plain = plantDesignNorm(events, NT, TR, spec(), null);
    expect(plain).toBeGreaterThan(1);
    expect(plantDesignNorm(events, NT, TR, spec(), table)).toBe(plain);
  });

  it('censoring by framewise displacement costs what censoring the same volume by index costs', () => {
    // one jump out at volume 50 and back at 51: FD 2 mm at both
    const table = Array.from({ length: NT }, (_, t) => ({ ...still(t), shiftXMm: t === 50 ? 2 : 0 }));
    const byFd = plantDesignNorm(events, NT, TR, spec({ censorFdMm: 0.5 }), table)!;
    const byIndex = plantDesignNorm(events, NT, TR, spec({ censorVolumes: [50, 51] }), null)!;
    expect(byFd).toBeCloseTo(byIndex, 12);
    expect(byFd).toBeLessThan(plantDesignNorm(events, NT, TR, spec(), null)!);
  });

  it('task-correlated motion takes the task\'s norm with it: a motion column close to the planted time course leaves little', () => {
    // an exact copy would make the design singular (a typed error in the model), so the copy carries a
    // small wobble of its own: what is left is about the wobble's share, 0.05 x sqrt(60) = 0.39 (measured 0.385 of 4.75)
    const p = plantTimeCourse(events, NT, TR, { condition: 'task' });
    const table = Array.from({ length: NT }, (_, t) => ({ ...still(t), shiftZMm: p[t] + 0.05 * Math.sin(1.3 * t) }));
    const free = plantDesignNorm(events, NT, TR, spec(), table)!;
    expect(free).toBeGreaterThan(1);
    const taken = plantDesignNorm(events, NT, TR, spec({ motionRegressors: 6 }), table)!;
    expect(taken).toBeGreaterThan(0);
    expect(taken).toBeLessThan(0.15 * free);
    // unrelated motion costs little: one smooth drift column against a block design
    const drift = Array.from({ length: NT }, (_, t) => ({ ...still(t), shiftYMm: t / NT }));
    const withDrift = plantDesignNorm(events, NT, TR, spec({ motionRegressors: 6 }), drift)!;
    expect(withDrift).toBeLessThanOrEqual(free + 1e-12);
    expect(withDrift).toBeGreaterThan(0.9 * free);
  });
});
