import { describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume } from '../../src/core/volume.js';
import { makeDesignMatrix } from '../../src/model/design-matrix.js';
import { fdCensorVolumes } from '../../src/model/fd-censor-volumes.js';
import { framewiseDisplacement, type MotionParameters } from '../../src/model/framewise-displacement.js';
import { fitGlm } from '../../src/model/glm-ols.js';
import { motionExpansion } from '../../src/model/motion-expansion.js';
import { motionRegressors } from '../../src/model/motion-regressors.js';

function row(shiftXMm: number, shiftYMm: number, shiftZMm: number, rotXDeg: number, rotYDeg: number, rotZDeg: number): MotionParameters {
  return { shiftXMm, shiftYMm, shiftZMm, rotXDeg, rotYDeg, rotZDeg };
}

const RAD = 180 / Math.PI; // degrees per radian

describe('framewiseDisplacement: Power et al. (2012, NeuroImage 59:2142-2154), REFERENCES.md §3', () => {
  it('a worked example computed by hand from the definition', () => {
    // volume 0 -> 1: shifts (0.1, -0.2, 0.05) mm, rotations (0.002, -0.001, 0.0005) rad (the
    // REFERENCES.md §3 example): |0.1| + |-0.2| + |0.05| = 0.35 mm; 50 mm x (0.002 + 0.001 + 0.0005) rad
    // = 50 x 0.0035 = 0.175 mm; FD_1 = 0.35 + 0.175 = 0.525 mm.
    // volume 1 -> 2: x back by 0.3 mm (0.1 -> -0.2), rotation about z by 1 degree:
    // |-0.3| = 0.3 mm; 1 deg = pi/180 rad = 0.0174533 rad, on 50 mm: 0.872665 mm; FD_2 = 1.172665 mm.
    // volume 2 -> 3: no change, FD_3 = 0. The first volume has no volume before it: FD_0 = 0.
    const table = [
      row(0, 0, 0, 0, 0, 0),
      row(0.1, -0.2, 0.05, 0.002 * RAD, -0.001 * RAD, 0.0005 * RAD),
      row(-0.2, -0.2, 0.05, 0.002 * RAD, -0.001 * RAD, 0.0005 * RAD + 1),
      row(-0.2, -0.2, 0.05, 0.002 * RAD, -0.001 * RAD, 0.0005 * RAD + 1),
    ];
    const fd = framewiseDisplacement(table);
    // sums of a few doubles: 1e-12 mm allows their rounding
    expect(fd[0]).toBe(0);
    expect(Math.abs(fd[1] - 0.525)).toBeLessThan(1e-12);
    expect(Math.abs(fd[2] - (0.3 + (50 * Math.PI) / 180))).toBeLessThan(1e-12);
    expect(Math.abs(fd[2] - 1.172665)).toBeLessThan(1e-6); // the hand value above, to its 7 digits
    expect(fd[3]).toBe(0);
    // the radius scales only the rotation part: 80 mm gives 0.35 + 80 x 0.0035 = 0.63 mm
    expect(Math.abs(framewiseDisplacement(table, 80)[1] - 0.63)).toBeLessThan(1e-12);
  });

  it('NaN in the table and a radius of 0 are typed errors', () => {
    expect(() => framewiseDisplacement([row(0, 0, 0, 0, 0, 0), row(NaN, 0, 0, 0, 0, 0)])).toThrow(expect.objectContaining({ code: 'MOTION_TABLE_INVALID' }));
    try { framewiseDisplacement([row(0, 0, 0, 0, 0, 0)], 0); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'INVALID_ARGUMENT')).toBe(true); }
  });

  it('censoring by FD takes the volumes strictly above the threshold', () => {
    expect(fdCensorVolumes(Float64Array.from([0, 0.2, 0.5, 0.51, 3]), 0.5)).toEqual([3, 4]);
    expect(() => fdCensorVolumes([0, 1], -1)).toThrow(expect.objectContaining({ code: 'INVALID_ARGUMENT' }));
  });

  it('censoring can reach neighbours: one before and two after each flagged volume (Power et al. 2014, NeuroImage 84:320-341 [memory]), clipped to the run', () => {
    // flagged by hand: volumes 1 (0.6 mm) and 6 (0.9 mm) of 8; 1 -> 0..3, 6 -> 5..7 (8 is past the end)
    const fd = Float64Array.from([0, 0.6, 0.1, 0.2, 0.1, 0.3, 0.9, 0.1]);
    expect(fdCensorVolumes(fd, 0.5, { before: 1, after: 2 })).toEqual([0, 1, 2, 3, 5, 6, 7]);
    // overlapping reaches give each volume once
    expect(fdCensorVolumes(Float64Array.from([0, 1, 1, 0, 0]), 0.5, { after: 1 })).toEqual([1, 2, 3]);
    expect(fdCensorVolumes(fd, 0.5, {})).toEqual([1, 6]);
    expect(() => fdCensorVolumes(fd, 0.5, { before: 1.5 })).toThrow(expect.objectContaining({ code: 'INVALID_ARGUMENT' }));
    expect(() => fdCensorVolumes(fd, 0.5, { after: -1 })).toThrow(expect.objectContaining({ code: 'INVALID_ARGUMENT' }));
  });
});

describe('motionExpansion: the 24 regressors of Friston et al. (1996, Magn Reson Med 35:346-355), REFERENCES.md §16', () => {
  // three volumes, each parameter with its own values so a column mix-up shows
  const table = [row(1, 2, 3, 4, 5, 6), row(-1, 0.5, 3, 2, 0, 7), row(2, 0, -3, 1, 1, 1)];

  it('24: the 6 parameters, their values one volume earlier (the first volume repeats its own), and the squares of both', () => {
    const { names, columns } = motionExpansion(table, 24);
    expect(names.length).toBe(24);
    expect(names.slice(0, 7)).toEqual(['motion_shiftXMm', 'motion_shiftYMm', 'motion_shiftZMm', 'motion_rotXDeg', 'motion_rotYDeg', 'motion_rotZDeg', 'motion_shiftXMm_lag1']);
    expect(names[12]).toBe('motion_shiftXMm_sq');
    expect(names[18]).toBe('motion_shiftXMm_lag1_sq');
    const col = (name: string) => Array.from(columns[names.indexOf(name)]);
    // parameters: as in the table
    expect(col('motion_shiftXMm')).toEqual([1, -1, 2]);
    expect(col('motion_rotZDeg')).toEqual([6, 7, 1]);
    // lag by one volume: x(t-1), with x(-1) := x(0)
    expect(col('motion_shiftXMm_lag1')).toEqual([1, 1, -1]);
    expect(col('motion_shiftYMm_lag1')).toEqual([2, 2, 0.5]);
    expect(col('motion_rotYDeg_lag1')).toEqual([5, 5, 0]);
    // squares of the parameters and of their lags
    expect(col('motion_shiftXMm_sq')).toEqual([1, 1, 4]);
    expect(col('motion_shiftZMm_sq')).toEqual([9, 9, 9]);
    expect(col('motion_rotXDeg_sq')).toEqual([16, 4, 1]);
    expect(col('motion_shiftXMm_lag1_sq')).toEqual([1, 1, 1]);
    expect(col('motion_rotZDeg_lag1_sq')).toEqual([36, 36, 49]);
  });

  it('6 and 12: the parameters, and for 12 their backward differences (0 at the first volume)', () => {
    expect(motionExpansion(table, 6).names.length).toBe(6);
    const { names, columns } = motionExpansion(table, 12);
    expect(names.length).toBe(12);
    expect(Array.from(columns[names.indexOf('motion_shiftXMm_diff')])).toEqual([0, -2, 3]);
    expect(Array.from(columns[names.indexOf('motion_rotXDeg_diff')])).toEqual([0, -2, -1]);
    expect(motionExpansion(table, 0).names).toEqual([]);
    expect(() => motionExpansion(table, 7 as never)).toThrow(expect.objectContaining({ code: 'INVALID_ARGUMENT' }));
  });

  it('motionRegressors mean-centres over the uncensored volumes, zeroes censored rows and leaves out constant columns', () => {
    const regs = motionRegressors(table, 6, [2]);
    // kept volumes 0 and 1: shiftX (1, -1) has mean 0; shiftZ (3, 3) is constant there: left out
    expect(regs.map((r) => r.name)).toEqual(['motion_shiftXMm', 'motion_shiftYMm', 'motion_rotXDeg', 'motion_rotYDeg', 'motion_rotZDeg']);
    expect(Array.from(regs[0].values)).toEqual([1, -1, 0]);
    expect(Array.from(regs[1].values)).toEqual([0.75, -0.75, 0]);
    // without censoring every column is centred over all three volumes
    for (const r of motionRegressors(table, 24)) {
      const s = Array.from(r.values).reduce((a, b) => a + b, 0);
      expect(Math.abs(s)).toBeLessThan(1e-12); // three doubles summed
    }
  });
});

describe('censoring by indicator regressors removes a volume from the fit', () => {
  it('a spiked volume censored by its indicator gives the betas and residual variance of the fit without that row', () => {
    // 40 volumes, 3 voxels: a task column, a motion column and noise; volume 17 carries a large spike
    const nt = 40;
    const task = Float64Array.from({ length: nt }, (_, t) => (Math.floor(t / 5) % 2 === 0 ? 0 : 1));
    const motion = Float64Array.from({ length: nt }, (_, t) => Math.sin(t / 3));
    const noise = (t: number, v: number) => Math.sin(12.9898 * (t + 1) * (v + 2)) * 0.7;
    const nvox = 3;
    const data = new Float32Array(nt * nvox);
    for (let t = 0; t < nt; t++) for (let v = 0; v < nvox; v++) data[t * nvox + v] = 100 + (v + 1) * task[t] + 0.5 * motion[t] + noise(t, v) + (t === 17 ? 40 : 0);
    const run = makeVolume({ dims: [nvox, 1, 1, nt], spacingMm: [2, 2, 2], trSec: 2, affine: identityAffine(), data });
    const censor = Float64Array.from({ length: nt }, (_, t) => (t === 17 ? 1 : 0));
    const ones = new Float64Array(nt).fill(1);
    const withIndicator = makeDesignMatrix(['task', 'motion', 'censor_17', 'intercept'], [task, motion, censor, ones]);
    const plain = makeDesignMatrix(['task', 'motion', 'intercept'], [task, motion, ones]);
    // the same data and design with row 17 removed
    const keep = Array.from({ length: nt }, (_, t) => t).filter((t) => t !== 17);
    const dropped = makeVolume({ dims: [nvox, 1, 1, nt - 1], spacingMm: [2, 2, 2], trSec: 2, affine: identityAffine(), data: Float32Array.from(keep.flatMap((t) => Array.from(data.subarray(t * nvox, (t + 1) * nvox)))) });
    const droppedDesign = makeDesignMatrix(['task', 'motion', 'intercept'], [keep.map((t) => task[t]), keep.map((t) => motion[t]), keep.map(() => 1)]);
    // betas: column j of fitted voxel v at j * nvox + v
    const a = fitGlm(run, withIndicator);
    const b = fitGlm(dropped, droppedDesign);
    const c = fitGlm(run, plain);
    expect(a.dof).toBe(b.dof); // nt - 4 = (nt - 1) - 3
    for (let v = 0; v < nvox; v++) {
      for (const [ja, jb] of [[0, 0], [1, 1], [3, 2]]) {
        // two float64 least-squares solutions of the same problem (condition number ~ 10): 1e-9 relative
        expect(Math.abs(a.betas[ja * nvox + v] - b.betas[jb * nvox + v])).toBeLessThan(1e-9 * Math.max(1, Math.abs(b.betas[jb * nvox + v])));
      }
      expect(Math.abs(a.sigma2[v] - b.sigma2[v])).toBeLessThan(1e-9 * b.sigma2[v]);
      // without the indicator the spike moves the task estimate (so the check above has teeth)
      expect(Math.abs(c.betas[v] - b.betas[v])).toBeGreaterThan(0.1);
    }
  });
});
