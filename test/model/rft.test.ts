import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { ecDensities, expectedEulerCharacteristic, type Resels } from '../../src/model/rft-ec-density.js';
import { rftCriticalValue } from '../../src/model/rft-critical-value.js';
import { findRootBracketed } from '../../src/model/threshold-root.js';
import type { StatisticKind } from '../../src/model/threshold-statistic.js';

// Independent values: test/reference/make_rft_fixture.py (scipy 1.10 stats/special/brentq).
const fx = JSON.parse(readFileSync(new URL('../reference/rft_fixture.json', import.meta.url), 'utf8')) as {
  densities: Array<{ dof: number | null; u: number; rho: number[] }>;
  thresholds: Array<{ case: string; resels: number[]; dof: number | null; alpha: number; u: number }>;
};
const kind = (dof: number | null): StatisticKind => (dof === null ? { kind: 'z' } : { kind: 't', dof });

function relClose(actual: number, expected: number, rel: number, what: string): void {
  const err = Math.abs(actual - expected) / Math.max(Math.abs(expected), 1e-300);
  expect(err, `${what}: got ${actual}, expected ${expected}, relative error ${err} > ${rel}`).toBeLessThanOrEqual(rel);
}

describe('Euler-characteristic densities (Worsley KJ et al. 1996, Hum Brain Mapp 4:58-73)', () => {
  it('Gaussian field at u = 4 matches REFERENCES.md §8 [C]', () => {
    const rho = ecDensities(4, { kind: 'z' });
    const expected = [3.167124e-5, 8.890107e-5, 2.362217e-4, 5.884422e-4];
    // 7 significant digits are quoted, so 1e-6 relative covers their rounding.
    expected.forEach((e, d) => relClose(rho[d], e, 1e-6, `rho${d}`));
  });
  it('z and t densities match the scipy fixture', () => {
    // 1e-9 relative: same closed forms; differences are in the last digits of erfc, t.sf and lgamma.
    for (const c of fx.densities) {
      const rho = ecDensities(c.u, kind(c.dof));
      c.rho.forEach((e, d) => relClose(rho[d], e, 1e-9, `dof ${c.dof} u ${c.u} rho${d}`));
    }
  });
  it('t densities tend to the Gaussian ones as dof grows (the t forms reduce to the z forms)', () => {
    const z = ecDensities(4.5, { kind: 'z' }), t = ecDensities(4.5, { kind: 't', dof: 1e7 });
    // at dof 1e7 the t forms differ from the limit by O(u^4 / dof) ~ 4e-5 relative
    for (let d = 0; d < 4; d++) relClose(t[d], z[d], 1e-4, `rho${d}`);
  });
  it('E[EC] is the resel-weighted sum of the densities', () => {
    const rho = ecDensities(3.5, { kind: 'z' });
    const resels: Resels = [1, 20, 150, 700];
    expect(expectedEulerCharacteristic(3.5, resels, { kind: 'z' })).toBeCloseTo(rho[0] + 20 * rho[1] + 150 * rho[2] + 700 * rho[3], 14);
  });
});

describe('RFT family-wise critical values', () => {
  it('reproduce REFERENCES.md §8 [C] to the quoted 5 decimals', () => {
    const sphere = (r: number, F: number): Resels => [1, (4 * r) / F, (2 * Math.PI * r * r) / F ** 2, (4 * Math.PI * r ** 3) / (3 * F ** 3)];
    const cases: Array<[Resels, StatisticKind, number]> = [
      [[0, 0, 0, 1000], { kind: 'z' }, 4.64345],
      [[0, 0, 0, 100], { kind: 'z' }, 4.04662],
      [sphere(62.035, 10), { kind: 'z' }, 4.66277],
      [[0, 0, 0, 1000], { kind: 't', dof: 20 }, 6.88513],
      [[0, 0, 0, 1000], { kind: 't', dof: 40 }, 5.54666],
      [[0, 0, 0, 1000], { kind: 't', dof: 100 }, 4.96586],
      [[0, 0, 0, 1000], { kind: 't', dof: 1000 }, 4.67371],
    ];
    for (const [resels, stat, expected] of cases) {
      const { threshold, expectedEc } = rftCriticalValue(resels, 0.05, stat);
      // quoted to 5 decimals: half a unit in the last place
      expect(Math.abs(threshold - expected), `${JSON.stringify(stat)} [${resels.join(', ')}]: ${threshold} vs ${expected}`).toBeLessThanOrEqual(5e-6);
      expect(expectedEc).toBeCloseTo(0.05, 9);
    }
  });
  it('match scipy brentq for every fixture case (alpha 0.05 and 0.01, z and t)', () => {
    // both solvers stop within ~1e-10 of the root of the same smooth function
    for (const c of fx.thresholds) {
      const { threshold } = rftCriticalValue(c.resels as unknown as Resels, c.alpha, kind(c.dof));
      expect(Math.abs(threshold - c.u), `${c.case} dof ${c.dof} alpha ${c.alpha}: ${threshold} vs ${c.u}`).toBeLessThanOrEqual(1e-8);
    }
  });
  it('a search region of one voxel gives the single-test critical value', () => {
    // one voxel: R = (1, 0, 0, 0), so E[EC] = P(Z >= u) and u = norm.isf(0.05) = 1.6448536 (scipy, REFERENCES.md §R)
    expect(rftCriticalValue([1, 0, 0, 0], 0.05, { kind: 'z' }).threshold).toBeCloseTo(1.6448536, 6);
  });
  it('refuses alpha outside (0, 1), t maps with dof <= 3 and negative resels', () => {
    const code = (f: () => unknown): string | undefined => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; } return undefined; };
    expect(code(() => rftCriticalValue([1, 1, 1, 1], 0, { kind: 'z' }))).toBe('INVALID_ARGUMENT');
    expect(code(() => rftCriticalValue([1, 1, 1, 1], 1, { kind: 'z' }))).toBe('INVALID_ARGUMENT');
    expect(code(() => rftCriticalValue([1, 1, 1, 1], 0.05, { kind: 't', dof: 3 }))).toBe('INVALID_ARGUMENT');
    expect(code(() => rftCriticalValue([1, -1, 1, 1], 0.05, { kind: 'z' }))).toBe('INVALID_ARGUMENT');
  });
});

describe('bracketed root finder (Brent 1973)', () => {
  it('finds the cube root of 2 and the fixed point of cos', () => {
    // 2^(1/3) and the Dottie number 0.7390851332151607 (root of cos x = x), facts of arithmetic
    expect(Math.abs(findRootBracketed((x) => x * x * x - 2, 1, 2) - Math.cbrt(2))).toBeLessThan(1e-12);
    expect(Math.abs(findRootBracketed((x) => Math.cos(x) - x, 0, 1) - 0.7390851332151607)).toBeLessThan(1e-12);
  });
  it('handles a root at a bracket end and a steep function', () => {
    expect(findRootBracketed((x) => x - 3, 3, 5)).toBe(3);
    expect(Math.abs(findRootBracketed((x) => Math.exp(50 * (x - 0.3)) - 1, 0, 1) - 0.3)).toBeLessThan(1e-12);
  });
  it('refuses a bracket without a sign change', () => {
    try { findRootBracketed((x) => x * x + 1, -1, 1); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'INVALID_ARGUMENT')).toBe(true); }
  });
});
