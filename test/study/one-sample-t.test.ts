import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { oneSampleT } from '../../src/model/one-sample-t.js';
import { tToZ } from '../../src/model/t-to-z.js';
import { groupLevelTest } from '../../src/sweep/group-level-test.js';
import { createRng } from '../../src/core/random.js';

// scipy.stats.ttest_1samp on the same effect estimates: test/reference/make_group_t_fixture.py
type Case = { subjects: number; voxels: number; effects: number[][]; t: number[]; dof: number; pUpper: number[]; z: number[]; mean: number[]; sd: number[] };
const fx = JSON.parse(readFileSync(new URL('../reference/group_t_fixture.json', import.meta.url), 'utf8')) as Record<'twelve' | 'three' | 'offset', Case> & { bonferroni: { threshold: number } };
const code = (f: () => unknown): string | undefined => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : String(e); } return undefined; };

describe('second-level one-sample t (Holmes & Friston 1998, NeuroImage 7:S754; REFERENCES.md §18)', () => {
  for (const name of ['twelve', 'three', 'offset'] as const) {
    it(`${name}: t, mean and SD match scipy.stats.ttest_1samp voxel for voxel`, () => {
      const c = fx[name];
      const mask = new Uint8Array(c.voxels).fill(1);
      const g = oneSampleT(c.effects, mask);
      expect(g.dof).toBe(c.subjects - 1);
      // the maps are float32: 2e-7 relative (float32 has 24 bits, 6e-8 relative rounding) plus 1e-9 absolute near 0
      c.t.forEach((t, v) => expect(Math.abs(g.t[v] - t), `t voxel ${v}`).toBeLessThanOrEqual(2e-7 * Math.abs(t) + 1e-9));
      c.mean.forEach((m, v) => expect(Math.abs(g.mean[v] - m)).toBeLessThanOrEqual(2e-7 * Math.abs(m) + 1e-12));
      c.sd.forEach((sd, v) => expect(Math.abs(g.sd[v] - sd)).toBeLessThanOrEqual(2e-7 * sd + 1e-12));
    });
  }
  it('t to z at S - 1 degrees of freedom gives scipy\'s norm.isf(t.sf(t, dof))', () => {
    for (const name of ['twelve', 'three'] as const) {
      const c = fx[name];
      // tToZ is Float64 from the float32 t; 1e-6 absolute covers the float32 rounding of t times dz/dt (< 2 here)
      c.t.forEach((t, v) => expect(Math.abs(tToZ(t, c.dof) - c.z[v]), `${name} voxel ${v}`).toBeLessThan(1e-6));
    }
  });
  it('residuals are the deviations from the mean, subjects along the fourth axis, zero outside the mask', () => {
    const c = fx.twelve;
    const mask = new Uint8Array(c.voxels).fill(1);
    mask[3] = 0;
    const g = oneSampleT(c.effects, mask);
    const n = c.voxels;
    // float32 storage of a Float64 difference: 1e-6 absolute for values of order 1
    expect(Math.abs(g.residuals[5 + n * 7] - (c.effects[7][5] - c.mean[5]))).toBeLessThan(1e-6);
    expect(g.t[3]).toBe(0);
    expect(g.residuals[3 + n * 2]).toBe(0);
  });
  it('bad input: fewer than 3 subjects, maps of another length, NaN inside the mask', () => {
    const mask = new Uint8Array(4).fill(1);
    expect(code(() => oneSampleT([[1, 2, 3, 4], [1, 2, 3, 4]], mask))).toBe('TOO_FEW_SUBJECTS');
    expect(code(() => oneSampleT([[1, 2, 3, 4], [1, 2, 3], [1, 2, 3, 4]], mask))).toBe('GRID_MISMATCH');
    expect(code(() => oneSampleT([[1, 2, 3, 4], [1, NaN, 3, 4], [1, 2, 3, 4]], mask))).toBe('NON_FINITE_VOXELS');
  });
});

describe('group-level thresholding with the first level\'s rules', () => {
  const dims = [12, 12, 8];
  const n = 12 * 12 * 8;
  const mask = new Uint8Array(n).fill(1);
  const effects = (s: number, seed: number) => Array.from({ length: s }, (_, i) => createRng(seed + i).fillNormal(new Float32Array(n)) as Float32Array);
  it('Bonferroni on the group t map: the threshold is the t quantile at alpha / voxels with S - 1 dof', () => {
    const g = groupLevelTest(effects(10, 1), mask, dims, [3, 3, 3], { kind: 'bonferroni', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 });
    expect(g.dof).toBe(9);
    // scipy.stats.t.isf(0.05 / 1152, 9) from the fixture; 1e-6 relative for the root finder's tolerance
    expect(Math.abs(g.threshold - fx.bonferroni.threshold)).toBeLessThan(1e-6 * fx.bonferroni.threshold);
    let survivors = 0;
    for (let v = 0; v < n; v++) { survivors += g.survivors[v]; if (g.survivors[v]) expect(g.t[v]).toBeGreaterThanOrEqual(g.threshold); }
    expect(survivors).toBe(Array.from(g.t).filter((t) => t >= g.threshold).length);
  });
  it('random-field rule: smoothness from the second-level residuals (white noise: about one voxel spacing or less)', () => {
    const g = groupLevelTest(effects(12, 50), mask, dims, [3, 3, 3], { kind: 'fwe-rft', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 });
    // white noise has lag-1 correlation 0: the derivative-variance FWHM is sqrt(4 ln2 / 2) = 1.18 voxels = 3.5 mm;
    // 15 % covers the estimate's spread on 1152 voxels x 12 subjects
    for (const f of g.fwhmMm) expect(Math.abs(f - 3 * Math.sqrt(2 * Math.LN2))).toBeLessThan(0.15 * 3.5);
    expect(g.threshold).toBeGreaterThan(3);
  });
  it('fwe-calibrated is refused for a group map; a random-field rule needs 5 subjects', () => {
    expect(code(() => groupLevelTest(effects(5, 1), mask, dims, [3, 3, 3], { kind: 'fwe-calibrated', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 }))).toBe('STUDY_RULE_UNSUPPORTED');
    expect(code(() => groupLevelTest(effects(4, 1), mask, dims, [3, 3, 3], { kind: 'fwe-rft', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 }))).toBe('TOO_FEW_SUBJECTS');
    expect(groupLevelTest(effects(3, 1), mask, dims, [3, 3, 3], { kind: 'fdr', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 }).dof).toBe(2);
  });
});
