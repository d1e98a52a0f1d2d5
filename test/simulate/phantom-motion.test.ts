import { describe, expect, it } from 'vitest';
import { applyAffine } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { rigidMotionAffine } from '../../src/acquire/rigid-motion-affine.js';
import { simulatedMotionTable } from '../../src/simulate/simulated-motion-table.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { demoPhantomSpec } from '../../src/simulate/phantom-spec.js';
import { centreOfMass, quietSpec } from './phantom-helpers.js';

describe('rigid motion convention', () => {
  it('R = Rz Ry Rx matches scipy Rotation.from_euler("xyz", (10, 20, 30), degrees=True) (REFERENCES.md §14)', () => {
    const m = rigidMotionAffine({ shiftXMm: 0, shiftYMm: 0, shiftZMm: 0, rotXDeg: 10, rotYDeg: 20, rotZDeg: 30 }, [0, 0, 0]);
    // check values printed to 6 decimals: half a unit in the last place
    [0.813798, -0.440970, 0.378522].forEach((v, c) => expect(Math.abs(m[c] - v)).toBeLessThan(5e-7));
  });
  it('rotation turns about the given centre and the shift adds after it', () => {
    const m = rigidMotionAffine({ shiftXMm: 1, shiftYMm: 2, shiftZMm: 3, rotXDeg: 0, rotYDeg: 0, rotZDeg: 90 }, [10, 0, 0]);
    const c = applyAffine(m, [10, 0, 0]);
    const p = applyAffine(m, [11, 0, 0]);
    // exact up to rounding of cos(90 deg) ~ 6e-17
    [11, 2, 3].forEach((v, i) => expect(c[i]).toBeCloseTo(v, 12));
    [11, 3, 3].forEach((v, i) => expect(p[i]).toBeCloseTo(v, 12));
  });
});

describe('motion table', () => {
  it('is zero at volume 0 and holds the jerk as a step at its volume', () => {
    const rows = simulatedMotionTable(10, { wanderStepMm: 0, wanderStepDeg: 0, jerk: { volume: 4, shiftMm: [0.5, -1, 2], rotationDeg: [1, 0, -0.5] } }, createRng(1));
    expect(rows).toHaveLength(10);
    for (const r of rows.slice(0, 4)) expect([r.shiftXMm, r.shiftYMm, r.shiftZMm, r.rotXDeg, r.rotYDeg, r.rotZDeg]).toEqual([0, 0, 0, 0, 0, 0]);
    for (const r of rows.slice(4)) expect([r.shiftXMm, r.shiftYMm, r.shiftZMm, r.rotXDeg, r.rotYDeg, r.rotZDeg]).toEqual([0.5, -1, 2, 1, 0, -0.5]);
  });
  it('a transient jerk holds its step for durationVolumes, then the head is back where it was', () => {
    const rows = simulatedMotionTable(10, { wanderStepMm: 0, wanderStepDeg: 0, jerk: { volume: 4, durationVolumes: 2, shiftMm: [0.5, -1, 2], rotationDeg: [1, 0, -0.5] } }, createRng(1));
    const pose = (r: (typeof rows)[number]) => [r.shiftXMm, r.shiftYMm, r.shiftZMm, r.rotXDeg, r.rotYDeg, r.rotZDeg];
    for (const v of [0, 1, 2, 3, 6, 7, 8, 9]) expect(pose(rows[v])).toEqual([0, 0, 0, 0, 0, 0]);
    for (const v of [4, 5]) expect(pose(rows[v])).toEqual([0.5, -1, 2, 1, 0, -0.5]);
    expect(() => simulatedMotionTable(10, { wanderStepMm: 0, wanderStepDeg: 0, jerk: { volume: 4, durationVolumes: 0, shiftMm: [1, 0, 0], rotationDeg: [0, 0, 0] } }, createRng(1))).toThrow(/durationVolumes/);
  });
  it('the demo jerk stands out of the slow wander in the truth table', () => {
    const spec = demoPhantomSpec();
    const rows = simulatedMotionTable(spec.nVolumes, spec.motion!, createRng(7));
    const jerk = spec.motion!.jerk!;
    const keys = ['shiftXMm', 'shiftYMm', 'shiftZMm', 'rotXDeg', 'rotYDeg', 'rotZDeg'] as const;
    const step = [...jerk.shiftMm, ...jerk.rotationDeg];
    keys.forEach((k, a) => {
      const d = rows[jerk.volume][k] - rows[jerk.volume - 1][k];
      // the wander adds one normal step of SD 0.01 (mm or deg); 6 SD is a bound it essentially never passes
      expect(Math.abs(d - step[a])).toBeLessThan(0.06);
    });
  });
  it('rejects a jerk outside the run', () => {
    expect(() => simulatedMotionTable(5, { wanderStepMm: 0, wanderStepDeg: 0, jerk: { volume: 5, shiftMm: [1, 0, 0], rotationDeg: [0, 0, 0] } }, createRng(1))).toThrow(/jerk volume/);
  });
});

describe('the phantom moves as the motion table says', () => {
  // noise-free and past steady state (volumes 10, 11: excess below 1e-8) so only the motion differs
  it('a pure x shift moves the centre of mass by exactly that shift', () => {
    const run = simulatePhantomRun(quietSpec({ nVolumes: 12, motion: { wanderStepMm: 0, wanderStepDeg: 0, jerk: { volume: 11, shiftMm: [4.2, 0, 0], rotationDeg: [0, 0, 0] } } }));
    const before = centreOfMass(run.volume.data, run.volume.dims, 10);
    const after = centreOfMass(run.volume.data, run.volume.dims, 11);
    expect(run.truth.motionTable[11].shiftXMm).toBe(4.2);
    // trilinear interpolation of a translation along x keeps each line's sum and first moment
    // exactly (the head stays inside the grid); float32 voxel values leave ~1e-6 voxel
    expect(Math.abs(after[0] - before[0] - 4.2 / 7)).toBeLessThan(1e-4);
    expect(Math.abs(after[1] - before[1])).toBeLessThan(1e-4);
    expect(Math.abs(after[2] - before[2])).toBeLessThan(1e-4);
  });
  it('a jerk with rotation moves the centre of mass as the rigid transform of the table predicts', () => {
    const jerk = { volume: 11, shiftMm: [1, -2, 3] as [number, number, number], rotationDeg: [3, -2, 1] as [number, number, number] };
    const run = simulatePhantomRun(quietSpec({ nVolumes: 12, motion: { wanderStepMm: 0, wanderStepDeg: 0, jerk } }));
    const v = run.volume;
    const toWorld = (c: [number, number, number]) => applyAffine(v.affine, c);
    const before = toWorld(centreOfMass(v.data, v.dims, 10));
    const after = toWorld(centreOfMass(v.data, v.dims, 11));
    const row = run.truth.motionTable[11];
    const predicted = applyAffine(rigidMotionAffine(row, run.truth.rotationCentreMm), before);
    // a rotated grid samples the trilinear interpolant off the lattice, so the first moment is kept
    // only up to discretisation error (about 0.003 mm seen here); 0.02 mm is 1/350 of a voxel
    for (let a = 0; a < 3; a++) expect(Math.abs(after[a] - predicted[a])).toBeLessThan(0.02);
    // and the move itself is several millimetres, so the check is not trivially met
    expect(Math.hypot(after[0] - before[0], after[1] - before[1], after[2] - before[2])).toBeGreaterThan(3);
  });
});
