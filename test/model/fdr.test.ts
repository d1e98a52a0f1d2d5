import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { fdrBhAdjust, fdrBhCutoff } from '../../src/model/fdr-bh.js';
import { thresholdFdr } from '../../src/model/threshold-fdr.js';

// test/reference/make_fdr_fixture.py writes the rule out by its definition in numpy (scipy 1.10 lacks it).
const fx = JSON.parse(readFileSync(new URL('../reference/fdr_fixture.json', import.meta.url), 'utf8')) as {
  example: { p: number[]; q: number; k: number; adjusted: number[] };
  mixture: { z: number[]; p: number[]; k: Record<string, number>; adjusted: number[] };
};
const code = (f: () => unknown): string | undefined => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; } return undefined; };

describe('Benjamini-Hochberg (1995, J R Stat Soc B 57:289-300)', () => {
  it('worked example of REFERENCES.md §9: k = 2 and the adjusted p-values', () => {
    const p = [0.001, 0.008, 0.039, 0.041, 0.042, 0.06, 0.074, 0.205, 0.212, 0.216];
    expect(fdrBhCutoff(p, 0.05)).toEqual({ k: 2, pCutoff: 0.008, m: 10 });
    const expected = [0.01, 0.04, 0.084, 0.084, 0.084, 0.1, 0.1057143, 0.216, 0.216, 0.216];
    // quoted to 7 significant digits
    fdrBhAdjust(p).forEach((a, i) => expect(Math.abs(a - expected[i])).toBeLessThan(1e-7));
    expect(fx.example.k).toBe(2);
  });
  it('500 mixed p-values: k at four q levels and every adjusted value match the numpy fixture', () => {
    for (const [q, k] of Object.entries(fx.mixture.k)) expect(fdrBhCutoff(fx.mixture.p, Number(q)).k, `q ${q}`).toBe(k);
    const adj = fdrBhAdjust(fx.mixture.p);
    // same divisions m p / j in both; 1e-15 relative covers rounding order
    adj.forEach((a, i) => expect(Math.abs(a - fx.mixture.adjusted[i])).toBeLessThanOrEqual(1e-15 * Math.max(1, fx.mixture.adjusted[i])));
  });
  it('adjusted p <= q exactly for the k discoveries (the two forms agree)', () => {
    const adj = fdrBhAdjust(fx.mixture.p);
    for (const q of [0.01, 0.05, 0.1, 0.2]) expect(Array.from(adj).filter((a) => a <= q).length).toBe(fdrBhCutoff(fx.mixture.p, q).k);
  });
  it('no discovery gives k = 0 and a null cut-off; the input is not modified', () => {
    const p = [0.5, 0.9, 0.3];
    const copy = [...p];
    expect(fdrBhCutoff(p, 0.05)).toEqual({ k: 0, pCutoff: null, m: 3 });
    fdrBhAdjust(p);
    expect(p).toEqual(copy);
  });
  it('errors: q outside (0, 1) and p outside [0, 1] -> INVALID_ARGUMENT', () => {
    expect(code(() => fdrBhCutoff([0.1], 0))).toBe('INVALID_ARGUMENT');
    expect(code(() => fdrBhCutoff([0.1], 1.2))).toBe('INVALID_ARGUMENT');
    expect(code(() => fdrBhCutoff([0.1, 1.5], 0.05))).toBe('INVALID_ARGUMENT');
    expect(code(() => fdrBhAdjust([Number.NaN]))).toBe('INVALID_ARGUMENT');
  });
});

describe('thresholdFdr on a z map', () => {
  const z = Float64Array.from(fx.mixture.z);
  it('survivors are the BH discoveries among in-mask voxels, and the threshold is the weakest survivor', () => {
    const mask = new Uint8Array(z.length).fill(1);
    const r = thresholdFdr(z, mask, { q: 0.05, stat: { kind: 'z' } });
    expect(r.rule).toBe('fdr-bh');
    expect(r.details.k).toBe(fx.mixture.k['0.05']);
    expect(r.details.survivorCount).toBe(fx.mixture.k['0.05']); // continuous z: no ties
    let minSurvivor = Infinity;
    for (let i = 0; i < z.length; i++) {
      if (r.survivors[i]) minSurvivor = Math.min(minSurvivor, z[i]);
      expect(r.survivors[i] === 1).toBe(z[i] >= r.threshold);
      // adjusted p from norm.sf of the same z values (the fixture's p came from scipy): 1e-12 relative
      expect(Math.abs(r.details.adjustedP[i] - fx.mixture.adjusted[i])).toBeLessThanOrEqual(1e-12 * fx.mixture.adjusted[i]);
    }
    expect(r.threshold).toBe(minSurvivor);
  });
  it('voxels outside the mask neither count in m nor survive, and get NaN adjusted p', () => {
    const mask = new Uint8Array(z.length);
    for (let i = 0; i < 250; i++) mask[i] = 1;
    const r = thresholdFdr(z, mask, { q: 0.05, stat: { kind: 'z' } });
    expect(r.details.voxels).toBe(250);
    expect(fdrBhCutoff(fx.mixture.p.slice(0, 250), 0.05).k).toBe(r.details.k);
    for (let i = 250; i < z.length; i++) { expect(r.survivors[i]).toBe(0); expect(Number.isNaN(r.details.adjustedP[i])).toBe(true); }
  });
  it('nothing surviving gives threshold Infinity', () => {
    const r = thresholdFdr(new Float32Array([0.1, -0.3, 0.2]), new Uint8Array([1, 1, 1]), { q: 0.05, stat: { kind: 'z' } });
    expect(r.threshold).toBe(Number.POSITIVE_INFINITY);
    expect(r.survivors.every((s) => s === 0)).toBe(true);
  });
  it('errors: q outside (0, 1) -> INVALID_ARGUMENT; map and mask of different lengths -> GRID_MISMATCH', () => {
    expect(code(() => thresholdFdr(z, new Uint8Array(z.length).fill(1), { q: 1, stat: { kind: 'z' } }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdFdr(z, new Uint8Array(z.length).fill(1), { q: -0.1, stat: { kind: 'z' } }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdFdr(z, new Uint8Array(10).fill(1), { q: 0.05, stat: { kind: 'z' } }))).toBe('GRID_MISMATCH');
  });
});
