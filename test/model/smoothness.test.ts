import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { estimateSmoothness, type SmoothnessEstimate } from '../../src/model/smoothness.js';
import { fwhmFromDerivativeVariance, fwhmFromLag1, lag1FromFwhm } from '../../src/model/smoothness-formulas.js';
import { smoothVolume3d } from '../../src/filter/gaussian-smooth.js';

// Discrete-kernel lag-1 autocorrelations and the exact finite-dof expectation: test/reference/make_smoothness_fixture.py
// (scipy.ndimage.gaussian_filter1d impulse responses; smoothVolume3d samples the same kernel, tested in test/steps).
const fx = JSON.parse(readFileSync(new URL('../reference/smoothness_fixture.json', import.meta.url), 'utf8')) as {
  kernels: Array<{ sigmaVoxels: number; rho1: number; fwhmVoxelsLag1: number; fwhmVoxelsDerivative: number; nominalFwhmVoxels: number }>;
  finiteDof: Array<{ dof: number; rawLambda: number; correctedLambda: number }>;
};
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);
const kernelFor = (sigma: number) => fx.kernels.find((k) => Math.abs(k.sigmaVoxels - sigma) < 1e-9)!;
const code = (f: () => unknown): string | undefined => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; } return undefined; };

/** nt volumes of white noise smoothed with periodic boundaries (so every voxel sees a stationary field). */
function smoothNoise(seed: number, dims: [number, number, number], nt: number, spacingMm: [number, number, number], fwhmMm: number): Float32Array {
  const n = dims[0] * dims[1] * dims[2];
  const rng = createRng(seed);
  const out = new Float32Array(n * nt), noise = new Float32Array(n);
  for (let t = 0; t < nt; t++) {
    rng.fillNormal(noise);
    smoothVolume3d(noise, dims, spacingMm, fwhmMm, { mode: 'wrap', out: out.subarray(t * n, (t + 1) * n) });
  }
  return out;
}

function meanAndSe(values: number[]): { mean: number; se: number } {
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  const variance = values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1);
  return { mean, se: Math.sqrt(variance / values.length) };
}

/** |mean - expected| within 4 standard errors measured from the seeds themselves (two-sided p ~ 0.005 at 17 dof). */
function expectWithin4Se(values: number[], expected: number, what: string): void {
  const { mean, se } = meanAndSe(values);
  expect(Math.abs(mean - expected), `${what}: mean ${mean} vs expected ${expected}, 4 SE = ${4 * se}`).toBeLessThanOrEqual(4 * se);
}

describe('smoothness formulas (REFERENCES.md §7)', () => {
  it('Forman et al. 1995: FWHM 8, dx 2 -> rho 0.9170040, variance ratio 0.1659919, and back to 8', () => {
    const rho = lag1FromFwhm(8, 2);
    expect(Math.abs(rho - 0.917004)).toBeLessThan(5e-8); // quoted to 7 decimals
    expect(Math.abs(2 * (1 - rho) - 0.1659919)).toBeLessThan(5e-8); // var(dr)/var(r) = 2 (1 - rho)
    expect(Math.abs(fwhmFromLag1(rho, 2) - 8)).toBeLessThan(1e-9);
  });
  it('discrete kernel: gaussian_filter1d sigma 2 has rho(1) 0.93941306 -> 4.709640 voxels [C]', () => {
    const k = kernelFor(2);
    expect(Math.abs(k.rho1 - 0.93941306)).toBeLessThan(5e-9);
    expect(Math.abs(fwhmFromLag1(k.rho1, 1) - 4.70964)).toBeLessThan(5e-7);
  });
  it('Kiebel et al. 1999: lambda = 4 ln 2 / FWHM^2 inverts; white noise (lambda 2 per voxel^2) reads 1.177 voxels', () => {
    expect(fwhmFromDerivativeVariance((4 * Math.LN2) / 64)).toBeCloseTo(8, 12);
    expect(fwhmFromDerivativeVariance(2)).toBeCloseTo(Math.sqrt(2 * Math.LN2), 12);
    expect(fwhmFromLag1(0, 1)).toBe(0);
    expect(fwhmFromLag1(1, 1)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe('estimateSmoothness recovers the FWHM of a known kernel', () => {
  it('isotropic: noise through gaussian sigma 2 voxels (FWHM 4.7096 voxels), 40^3 x 40 volumes, 6 seeds', () => {
    // Expected values are for the discrete kernel, from its rho(1) (fixture), at the estimator's finite-dof
    // expectation for nu = 40 (fixture, exact formula). The lag-1 form then equals the kernel FWHM; the
    // derivative form reads 1.6 % wide by construction (2(1 - rho) < -2 ln rho).
    const sigma = 2, spacing = 2, nt = 40;
    const k = kernelFor(sigma);
    const lambdaExpected = fx.finiteDof.find((f) => f.dof === nt)!.correctedLambda;
    const fwhmMm = sigma * FWHM_PER_SIGMA * spacing;
    const dims: [number, number, number] = [40, 40, 40];
    const mask = new Uint8Array(dims[0] * dims[1] * dims[2]).fill(1);
    const lambdas: number[] = [], lag1Fwhm: number[] = [], derivFwhm: number[] = [];
    for (let seed = 0; seed < 6; seed++) {
      const e = estimateSmoothness(smoothNoise(seed, dims, nt, [spacing, spacing, spacing], fwhmMm), [...dims, nt], mask, [spacing, spacing, spacing]);
      for (let a = 0; a < 3; a++) { lambdas.push(e.derivativeVariance[a]); lag1Fwhm.push(e.fwhmMmLag1[a] / spacing); derivFwhm.push(e.fwhmMmDerivative[a] / spacing); }
      expect(e.fwhmMm).toEqual(e.fwhmMmDerivative);
      expect(e.pairs).toEqual([39 * 1600, 39 * 1600, 39 * 1600]);
    }
    expectWithin4Se(lambdas, lambdaExpected, 'lambda');
    expectWithin4Se(lag1Fwhm, fwhmFromLag1(1 - lambdaExpected / 2, 1), 'lag-1 FWHM (voxels)');
    expectWithin4Se(derivFwhm, fwhmFromDerivativeVariance(lambdaExpected), 'derivative FWHM (voxels)');
    // and in plain terms: the lag-1 estimate is within 1 % of the kernel FWHM (finite-nu bias 0.12 %, SE ~0.15 %)
    expect(Math.abs(meanAndSe(lag1Fwhm).mean / k.nominalFwhmVoxels - 1)).toBeLessThan(0.01);
    expect(Math.abs(meanAndSe(derivFwhm).mean / k.fwhmVoxelsDerivative - 1)).toBeLessThan(0.01);
  });
  it('anisotropic voxels (2 x 2 x 3 mm) and FWHM 8 mm inside a spherical mask give 8 mm on every axis (lag-1 form)', () => {
    // sigma = 8 / 2.3548 / spacing voxels: 1.6986 (x, y) and 1.1324 (z); fixture rho(1) -> 4.0000 and 2.6666 voxels
    const spacing: [number, number, number] = [2, 2, 3], nt = 40, dims: [number, number, number] = [36, 36, 28];
    const kxy = kernelFor(8 / FWHM_PER_SIGMA / 2), kz = kernelFor(8 / FWHM_PER_SIGMA / 3);
    const mask = new Uint8Array(dims[0] * dims[1] * dims[2]);
    for (let z = 0; z < dims[2]; z++) for (let y = 0; y < dims[1]; y++) for (let x = 0; x < dims[0]; x++) {
      // 32 mm radius sphere in mm
      if (((x - 17.5) * 2) ** 2 + ((y - 17.5) * 2) ** 2 + ((z - 13.5) * 3) ** 2 <= 32 ** 2) mask[x + dims[0] * (y + dims[1] * z)] = 1;
    }
    const perAxis: number[][] = [[], [], []];
    for (let seed = 10; seed < 14; seed++) {
      const e = estimateSmoothness(smoothNoise(seed, dims, nt, spacing, 8), [...dims, nt], mask, spacing, { method: 'lag1-autocorrelation' });
      expect(e.fwhmMm).toEqual(e.fwhmMmLag1);
      for (let a = 0; a < 3; a++) perAxis[a].push(e.fwhmMm[a]);
    }
    const expected = [kxy.fwhmVoxelsLag1 * 2, kxy.fwhmVoxelsLag1 * 2, kz.fwhmVoxelsLag1 * 3];
    // 2 %: about 5 SE of a 4-seed mean over this ~8000-voxel sphere (per-seed spread ~1.5 %), plus the 0.1 % finite-nu bias
    for (let a = 0; a < 3; a++) expect(Math.abs(meanAndSe(perAxis[a]).mean / expected[a] - 1), `axis ${a}`).toBeLessThan(0.02);
  });
  it('white noise: lambda = 2 per voxel step (rho(1) = 0), so the lag-1 form reads 0 and the derivative form 1.18 voxels', () => {
    const dims: [number, number, number] = [24, 24, 24], nt = 20, n = 24 ** 3;
    const r = new Float32Array(n * nt);
    createRng(5).fillNormal(r);
    const e = estimateSmoothness(r, [...dims, nt], new Uint8Array(n).fill(1), [1, 1, 1]);
    // E = 2 exactly for independent voxels at any nu before the correction factor; 3 % covers SE ~0.3 %
    for (let a = 0; a < 3; a++) expect(Math.abs(e.derivativeVariance[a] / e.dofCorrection / 2 - 1)).toBeLessThan(0.03);
  });
});

describe('degrees-of-freedom correction (nu - 2)/(nu - 1)', () => {
  it('small nu: the corrected estimate matches the exact finite-nu expectation; without the factor it is 20 % high', () => {
    // nu = 6: raw E[lambda] = 0.14623 (exact formula, fixture), corrected 0.11699; the large-nu value is 0.12117.
    const nt = 6, dims: [number, number, number] = [40, 40, 40];
    const mask = new Uint8Array(64000).fill(1);
    const fwhmMm = 2 * FWHM_PER_SIGMA;
    const ref = fx.finiteDof.find((f) => f.dof === nt)!;
    const lambdas: number[] = [];
    for (let seed = 20; seed < 26; seed++) {
      const e = estimateSmoothness(smoothNoise(seed, dims, nt, [1, 1, 1], fwhmMm), [...dims, nt], mask, [1, 1, 1]);
      expect(e.dofCorrection).toBeCloseTo(4 / 5, 15);
      lambdas.push(...e.derivativeVariance);
    }
    expectWithin4Se(lambdas, ref.correctedLambda, 'corrected lambda at nu 6');
    expectWithin4Se(lambdas.map((l) => (l * 5) / 4), ref.rawLambda, 'raw lambda at nu 6');
    const largeNu = 2 * (1 - kernelFor(2).rho1);
    expect(ref.rawLambda / largeNu).toBeGreaterThan(1.2);
  });
  it('GLM-style residuals (each voxel de-meaned, nu = nt - 1) behave like nu-dimensional noise', () => {
    // Removing the mean projects onto an (nt - 1)-dimensional space; with dof = nt - 1 = 10 the expectation
    // is the fixture's nu = 10 value.
    const nt = 11, dims: [number, number, number] = [40, 40, 40], n = 64000;
    const mask = new Uint8Array(n).fill(1);
    const ref = fx.finiteDof.find((f) => f.dof === 10)!;
    const lambdas: number[] = [];
    for (let seed = 30; seed < 36; seed++) {
      const r = smoothNoise(seed, dims, nt, [1, 1, 1], 2 * FWHM_PER_SIGMA);
      for (let v = 0; v < n; v++) {
        let m = 0;
        for (let t = 0; t < nt; t++) m += r[t * n + v];
        m /= nt;
        for (let t = 0; t < nt; t++) r[t * n + v] -= m;
      }
      lambdas.push(...estimateSmoothness(r, [...dims, nt], mask, [1, 1, 1], { dof: nt - 1 }).derivativeVariance);
    }
    expectWithin4Se(lambdas, ref.correctedLambda, 'corrected lambda, de-meaned, nu 10');
  });
});

describe('estimateSmoothness bookkeeping and errors', () => {
  const dims: [number, number, number, number] = [6, 5, 4, 5];
  const n = 120;
  const r = new Float32Array(n * 5);
  createRng(3).fillNormal(r);
  const mask = new Uint8Array(n).fill(1);
  it('leaves the input untouched, skips all-zero voxels and counts them', () => {
    const copy = Float32Array.from(r);
    const withZero = Float32Array.from(r);
    for (let t = 0; t < 5; t++) withZero[t * n + 7] = 0;
    const e: SmoothnessEstimate = estimateSmoothness(withZero, dims, mask, [1, 1, 1]);
    expect(e.constantVoxels).toBe(1);
    expect(e.voxelsUsed).toBe(n - 1);
    // voxel 7 = (1, 1, 0): loses its own x/y/z pairs and those of (0,1,0) along x and (1,0,0) along y
    expect(e.pairs).toEqual([5 * 5 * 4 - 2, 6 * 4 * 4 - 2, 6 * 5 * 3 - 1]);
    estimateSmoothness(r, dims, mask, [1, 1, 1]);
    expect(r).toEqual(copy);
  });
  it('errors: GRID_MISMATCH, TOO_FEW_VOLUMES, NON_FINITE_VOXELS, INVALID_ARGUMENT', () => {
    expect(code(() => estimateSmoothness(r, dims, new Uint8Array(n - 1), [1, 1, 1]))).toBe('GRID_MISMATCH');
    expect(code(() => estimateSmoothness(r.subarray(0, 2 * n), [6, 5, 4, 2], mask, [1, 1, 1]))).toBe('TOO_FEW_VOLUMES');
    const bad = Float32Array.from(r); bad[3 * n + 9] = Number.NaN;
    expect(code(() => estimateSmoothness(bad, dims, mask, [1, 1, 1]))).toBe('NON_FINITE_VOXELS');
    expect(code(() => estimateSmoothness(r, dims, mask, [1, 1, 1], { dof: 6 }))).toBe('INVALID_ARGUMENT');
    expect(code(() => estimateSmoothness(r, dims, mask, [1, 1, 1], { dof: 2 }))).toBe('INVALID_ARGUMENT');
    expect(code(() => estimateSmoothness(r, dims, mask, [0, 1, 1]))).toBe('INVALID_ARGUMENT');
    expect(code(() => estimateSmoothness(r, [6, 5, 4, 4], mask, [1, 1, 1]))).toBe('INVALID_ARGUMENT');
    const slab = new Uint8Array(n); for (let i = 0; i < 30; i++) slab[i] = 1; // one slice: no z pairs
    expect(code(() => estimateSmoothness(r, dims, slab, [1, 1, 1]))).toBe('INVALID_ARGUMENT');
  });
});
