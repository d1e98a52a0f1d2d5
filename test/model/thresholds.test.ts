import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { thresholdBonferroni } from '../../src/model/threshold-bonferroni.js';
import { thresholdRft } from '../../src/model/threshold-rft.js';
import { upperCriticalValue, upperTailP } from '../../src/model/threshold-statistic.js';
import { thresholdUncorrected } from '../../src/model/threshold-uncorrected.js';

const fx = JSON.parse(readFileSync(new URL('../reference/rft_fixture.json', import.meta.url), 'utf8')) as {
  thresholds: Array<{ case: string; dof: number | null; alpha: number; u: number }>;
  tails: { zSf: number[][]; zIsf: number[][]; tSf: number[][]; tIsf: number[][] };
};
const code = (f: () => unknown): string | undefined => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; } return undefined; };

describe('tail probabilities and critical values (scipy values, REFERENCES.md §R)', () => {
  it('norm.isf(.05), t.isf(.001, 20), t.sf(2, 10), t.sf(3, 20)', () => {
    // quoted to 8 significant digits
    expect(Math.abs(upperCriticalValue(0.05, { kind: 'z' }) - 1.6448536)).toBeLessThan(1e-7);
    expect(Math.abs(upperCriticalValue(0.001, { kind: 't', dof: 20 }) - 3.5518083)).toBeLessThan(1e-7);
    expect(Math.abs(upperTailP(2, { kind: 't', dof: 10 }) - 0.036694017)).toBeLessThan(1e-9);
    expect(Math.abs(upperTailP(3, { kind: 't', dof: 20 }) - 0.0035379494)).toBeLessThan(1e-10);
  });
  it('match scipy norm/t sf and isf across the tail (rft_fixture.json "tails")', () => {
    // 1e-9 relative: stdlib and scipy both evaluate erfc / incomplete beta to near machine precision; cdf(-x)
    // keeps that precision at p ~ 1e-33 where 1 - cdf(x) would be 0.
    const rel = (a: number, b: number): number => Math.abs(a / b - 1);
    for (const [u, p] of fx.tails.zSf) expect(rel(upperTailP(u, { kind: 'z' }), p), `z sf ${u}`).toBeLessThan(1e-9);
    for (const [p, u] of fx.tails.zIsf) expect(rel(upperCriticalValue(p, { kind: 'z' }), u), `z isf ${p}`).toBeLessThan(1e-9);
    for (const [u, dof, p] of fx.tails.tSf) expect(rel(upperTailP(u, { kind: 't', dof }), p), `t sf ${u} ${dof}`).toBeLessThan(1e-9);
    // scipy's own t.isf is the looser side here: its t.sf at its isf(1e-6, 40) returns 1.0000000375e-6, an error of
    // ~2e-9 relative in u; hence 1e-8 against scipy, and the round trip below to 1e-12.
    for (const [p, dof, u] of fx.tails.tIsf) expect(rel(upperCriticalValue(p, { kind: 't', dof }), u), `t isf ${p} ${dof}`).toBeLessThan(1e-8);
  });
  it('critical values invert the tail probability to near machine precision', () => {
    // 1e-12 relative in p: two Newton steps on an accurately computed tail converge to ~1e-15
    for (const stat of [{ kind: 'z' }, { kind: 't', dof: 7 }, { kind: 't', dof: 40 }, { kind: 't', dof: 400 }] as const) {
      for (const p of [0.3, 0.05, 1e-3, 1e-6, 1e-9, 1e-12]) {
        const back = upperTailP(upperCriticalValue(p, stat), stat);
        expect(Math.abs(back / p - 1), `${JSON.stringify(stat)} p ${p}`).toBeLessThan(1e-12);
      }
    }
  });
});

function linearMap(n: number): { map: Float64Array; mask: Uint8Array } {
  const map = new Float64Array(n), mask = new Uint8Array(n);
  for (let i = 0; i < n; i++) { map[i] = (8 * i) / (n - 1) - 1; mask[i] = i % 5 === 0 ? 0 : 1; }
  return { map, mask };
}

describe('voxelwise thresholds', () => {
  const { map, mask } = linearMap(1000);
  const inMask = mask.reduce((a, b) => a + b, 0);
  it('uncorrected: threshold = critical value at alpha, survivors = in-mask voxels at or above it', () => {
    const r = thresholdUncorrected(map, mask, { alpha: 0.001, stat: { kind: 'z' } });
    expect(r.rule).toBe('uncorrected');
    expect(r.threshold).toBeCloseTo(fx.tails.zIsf[1][1], 8); // scipy norm.isf(0.001)
    let count = 0;
    for (let i = 0; i < map.length; i++) {
      expect(r.survivors[i]).toBe(mask[i] && map[i] >= r.threshold ? 1 : 0);
      count += r.survivors[i];
    }
    expect(r.details.survivorCount).toBe(count);
    expect(count).toBeGreaterThan(0);
  });
  it('Bonferroni: alpha / m over in-mask voxels only', () => {
    const r = thresholdBonferroni(map, mask, { alpha: 0.05, stat: { kind: 't', dof: 30 } });
    expect(r.details.voxels).toBe(inMask);
    expect(r.details.pCutoff).toBeCloseTo(0.05 / inMask, 15);
    // definition: P(T >= threshold) = alpha / m
    expect(upperTailP(r.threshold, { kind: 't', dof: 30 }) / (0.05 / inMask)).toBeCloseTo(1, 9);
    for (let i = 0; i < map.length; i++) expect(r.survivors[i]).toBe(mask[i] && map[i] >= r.threshold ? 1 : 0);
  });
  it('inputs are not modified', () => {
    const copy = Float64Array.from(map), maskCopy = Uint8Array.from(mask);
    thresholdBonferroni(map, mask, { alpha: 0.05, stat: { kind: 'z' } });
    thresholdUncorrected(map, mask, { alpha: 0.05, stat: { kind: 'z' } });
    expect(map).toEqual(copy);
    expect(mask).toEqual(maskCopy);
  });
  it('errors: alpha outside (0, 1) -> INVALID_ARGUMENT; lengths differ -> GRID_MISMATCH; NaN in mask -> NON_FINITE_VOXELS; empty mask -> INVALID_ARGUMENT', () => {
    const z = { kind: 'z' } as const;
    expect(code(() => thresholdUncorrected(map, mask, { alpha: 0, stat: z }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdBonferroni(map, mask, { alpha: 1, stat: z }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdBonferroni(map, mask, { alpha: Number.NaN, stat: z }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdUncorrected(map, mask.subarray(1), { alpha: 0.05, stat: z }))).toBe('GRID_MISMATCH');
    const withNan = Float64Array.from(map); withNan[1] = Number.NaN;
    expect(code(() => thresholdUncorrected(withNan, mask, { alpha: 0.05, stat: z }))).toBe('NON_FINITE_VOXELS');
    withNan[1] = 0;
    withNan[0] = Number.NaN; // index 0 is outside the mask (0 % 5 === 0): ignored
    expect(thresholdUncorrected(withNan, mask, { alpha: 0.05, stat: z }).survivors[0]).toBe(0);
    expect(code(() => thresholdUncorrected(map, new Uint8Array(map.length), { alpha: 0.05, stat: z }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdUncorrected(map, mask, { alpha: 0.05, stat: { kind: 't', dof: 0 } }))).toBe('INVALID_ARGUMENT');
  });
});

describe('thresholdRft', () => {
  it('on a 1e6 mm^3 cube at 10 mm FWHM uses resels (1, 30, 300, 1000) and gives the scipy threshold', () => {
    const d = [53, 53, 53];
    const n = d[0] * d[1] * d[2];
    const mask = new Uint8Array(n), map = new Float32Array(n);
    for (let z = 1; z <= 51; z++) for (let y = 1; y <= 51; y++) for (let x = 1; x <= 51; x++) mask[x + 53 * (y + 53 * z)] = 1;
    map[26 + 53 * (26 + 53 * 26)] = 5; // one strong voxel
    map[27 + 53 * (26 + 53 * 26)] = 4.6; // one just below the threshold
    for (const dof of [null, 40]) {
      const stat = dof === null ? ({ kind: 'z' } as const) : ({ kind: 't', dof } as const);
      const r = thresholdRft(map, mask, d, { alpha: 0.05, stat, fwhmMm: 10, spacingMm: [2, 2, 2] });
      const ref = fx.thresholds.find((c) => c.case === 'box 100 mm F 10' && c.dof === dof && c.alpha === 0.05)!;
      expect(r.rule).toBe('rft-fwe');
      expect(Math.abs(r.threshold - ref.u)).toBeLessThan(1e-8); // same root as scipy brentq
      expect(r.details.resels[3]).toBeCloseTo(1000, 9);
      expect(r.details.survivorCount).toBe(dof === null ? 1 : 0); // 5 > 4.667 (z); 5 < 5.578 (t, 40 dof)
    }
  });
  it('errors: dims that do not match the map -> GRID_MISMATCH; FWHM <= 0 -> INVALID_ARGUMENT', () => {
    const map = new Float32Array(27), mask = new Uint8Array(27).fill(1);
    expect(code(() => thresholdRft(map, mask, [3, 3, 2], { alpha: 0.05, stat: { kind: 'z' }, fwhmMm: 6, spacingMm: [2, 2, 2] }))).toBe('GRID_MISMATCH');
    expect(code(() => thresholdRft(map, mask, [3, 3, 3], { alpha: 0.05, stat: { kind: 'z' }, fwhmMm: 0, spacingMm: [2, 2, 2] }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdRft(map, mask, [3, 3, 3], { alpha: 1.5, stat: { kind: 'z' }, fwhmMm: 6, spacingMm: [2, 2, 2] }))).toBe('INVALID_ARGUMENT');
  });
});
