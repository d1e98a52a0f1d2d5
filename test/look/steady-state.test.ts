import { describe, expect, it } from 'vitest';
import { steadyStateExcess, steadyStateModelCount } from '../../src/look/steady-state-model.js';
import { steadyStateOnset } from '../../src/look/steady-state-onset.js';
import { steadyStateFromFirstVolume } from '../../src/look/steady-state-per-voxel.js';
import { lookAtRun } from '../../src/look/look-at-run.js';
import { createRng } from '../../src/core/random.js';
import { syntheticRun } from './synthetic-run.js';

// Ernst RR & Anderson WA (1966) Rev Sci Instrum 37:93-102 closed form; check values computed with
// numpy in REFERENCES.md §6: TR 2 s, T1 1.33 s, flip 77 deg -> excess 22.153 %, 1.1078 %, 0.05539 %.
const gm = { trSec: 2, flipAngleDeg: 77, t1Sec: 1.33 };

describe('approach to steady state (spoiled gradient echo)', () => {
  it('matches the closed-form excess per volume', () => {
    expect(steadyStateExcess(1, gm) * 100).toBeCloseTo(22.153, 3);
    expect(steadyStateExcess(2, gm) * 100).toBeCloseTo(1.1078, 4);
    expect(steadyStateExcess(3, gm) * 100).toBeCloseTo(0.05539, 5);
  });

  it('counts volumes above 1 % as in REFERENCES.md §6 (first within 1 %: vol 3; T1 0.832 -> 2, 1.82 -> 3, 4.2 -> 4)', () => {
    expect(steadyStateModelCount(gm, 0.01)).toBe(2);
    expect(steadyStateModelCount({ ...gm, t1Sec: 0.832 }, 0.01)).toBe(1);
    expect(steadyStateModelCount({ ...gm, t1Sec: 1.82 }, 0.01)).toBe(2);
    expect(steadyStateModelCount({ ...gm, t1Sec: 4.2 }, 0.01)).toBe(3);
  });

  it('finds the same count in data as the closed form at the same threshold (within one volume)', () => {
    for (const t1Sec of [0.832, 1.33, 1.82, 4.2]) {
      const p = { ...gm, t1Sec };
      const excess = Array.from({ length: 10 }, (_, i) => steadyStateExcess(i + 1, p));
      const rng = createRng(Math.round(t1Sec * 1000));
      const g = Array.from({ length: 120 }, (_, t) => 1000 * (1 + (excess[t] ?? 0)) + rng.normal(0, 0.5));
      const onset = steadyStateOnset(g);
      const model = steadyStateModelCount(p, (onset.cutoffZ * onset.scale) / 1000);
      expect(Math.abs(onset.count - model), `T1 ${t1Sec}: data ${onset.count}, model ${model}`).toBeLessThanOrEqual(1);
    }
  });

  it('recovers each voxel\'s T1 from the first volume and counts the slowest tissue', () => {
    // two tissues: T1 1.33 s (count 2 at 1 %) and 4.2 s (count 3 at 1 %), 10 % of voxels the slow one
    const n = 1000;
    const first = new Float64Array(n), mean = new Float64Array(n).fill(1000), mask = new Uint8Array(n).fill(1);
    for (let v = 0; v < n; v++) first[v] = 1000 * (1 + steadyStateExcess(1, { ...gm, t1Sec: v < 100 ? 4.2 : 1.33 }));
    const r = steadyStateFromFirstVolume(first, mean, mask, { trSec: 2, flipAngleDeg: 77 });
    expect(r.count).toBe(3);
    expect(r.medianT1Sec).toBeCloseTo(1.33, 6); // exact inversion of the closed form
    expect(r.fractionNeeding[3]).toBeCloseTo(0.1, 10);
  });

  it('recommends dropping the planted bright volumes of a synthetic run', () => {
    const excess = Array.from({ length: 6 }, (_, i) => steadyStateExcess(i + 1, gm));
    const look = lookAtRun(syntheticRun({ dims: [20, 20, 10, 60], excess, noiseSd: 5 }), { flipAngleDeg: 77 });
    expect(look.recommendation.dropInitialVolumes).toBeGreaterThanOrEqual(2);
    expect(look.recommendation.dropInitialVolumes).toBeLessThanOrEqual(3);
    expect(look.findings[0].kind).toBe('non-steady-start');
    expect(look.findings[0].verdict).toMatch(/brighter than steady state: drop them/);
  });
});
