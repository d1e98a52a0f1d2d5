import { describe, expect, it } from 'vitest';
import { predictDetection, type DetectionTheoryInput } from '../../src/model/predict-detection.js';
import { residualNorm } from '../../src/model/residual-norm.js';

const base: DetectionTheoryInput = { blobFwhmMm: 12, amplitudePct: 1, kernelFwhmMm: 0, noiseSdPct: 2, noiseFwhmMm: 0, spacingMm: [3, 3, 3], designNorm: 6, threshold: 5 };
const SIGMA_PER_FWHM = 1 / (2 * Math.sqrt(2 * Math.LN2));

describe('predicted detection: a Gaussian blob in white noise (matched filter, Rosenfeld & Kak 1982)', () => {
  it('unsmoothed: the statistic at the centre is amplitude x design norm / noise SD, worked by hand', () => {
    // 1 % x 6 / 2 % = 3; P(detect) = Phi(3 - 5) = Phi(-2) = 0.0227501 (normal table [memory])
    const p = predictDetection(base);
    expect(p.expectedPeakT).toBeCloseTo(3, 12);
    expect(p.detectionProbability).toBeCloseTo(0.0227501, 6);
  });

  it('at the matched width the signal-to-noise ratio equals the matched-filter bound A / sigma (pi sigma_b^2)^(3/4) / sqrt(v)', () => {
    // the matched filter's output SNR is sqrt(signal energy / noise power per sample): for a Gaussian blob
    // A exp(-r^2 / (2 sigma_b^2)) sampled on voxels of volume v, the energy is A^2 (pi sigma_b^2)^(3/2) / v
    for (const blob of [12, 24]) {
      const p = predictDetection({ ...base, blobFwhmMm: blob, kernelFwhmMm: blob });
      const sb = blob * SIGMA_PER_FWHM;
      const bound = (1 / 2) * (Math.PI * sb * sb) ** 0.75 / Math.sqrt(27);
      // the prediction sums over the voxel lattice; the bound integrates. By Poisson summation they differ by
      // about exp(-pi^2 sigma^2 / d^2), under 1e-9 for sigma_b >= 1.7 voxels (12 mm FWHM on 3 mm voxels)
      expect(Math.abs(p.signalPct / p.noiseSdPct / bound - 1)).toBeLessThan(1e-9);
    }
  });

  it('the noise the kernel leaves matches the sum of squared weights of the sampled Gaussian (continuous form, 1e-4 from 1 voxel)', () => {
    // sum over integers of the unit-sum sampled Gaussian squared, sigma = 1.5 voxels, against d / (sqrt(4 pi) sigma)
    const sigma = 1.5;
    let s1 = 0, s2 = 0;
    for (let x = -30; x <= 30; x++) { const w = Math.exp(-(x * x) / (2 * sigma * sigma)); s1 += w; s2 += w * w; }
    const discrete = (s2 / (s1 * s1)) ** 3;
    const p = predictDetection({ ...base, kernelFwhmMm: 3 * sigma / SIGMA_PER_FWHM });
    expect(Math.abs((p.noiseSdPct / 2) ** 2 / discrete - 1)).toBeLessThan(1e-4);
  });

  it('is largest where the kernel matches the blob', () => {
    const at = (k: number) => predictDetection({ ...base, kernelFwhmMm: k }).expectedPeakT;
    expect(at(12)).toBeGreaterThan(at(11.8));
    expect(at(12)).toBeGreaterThan(at(12.2));
  });

  it('smooth noise gains less from smoothing than white noise', () => {
    const white = predictDetection({ ...base, kernelFwhmMm: 8 }).expectedPeakT;
    const smooth = predictDetection({ ...base, kernelFwhmMm: 8, noiseFwhmMm: 6 }).expectedPeakT;
    expect(smooth).toBeLessThan(white);
  });

  it('refuses a zero noise SD', () => {
    expect(() => predictDetection({ ...base, noiseSdPct: 0 })).toThrow(/noise SD/);
  });
});

describe('residualNorm: sqrt(p\' M p)', () => {
  it('against an intercept is the root sum of squared deviations from the mean (by hand)', () => {
    expect(residualNorm([0, 1, 0, 1], [[1, 1, 1, 1]])).toBeCloseTo(1, 14);
    expect(residualNorm([1, 2, 3, 4, 5], [[1, 1, 1, 1, 1]])).toBeCloseTo(Math.sqrt(10), 14);
  });
  it('against an intercept and a linear trend leaves the quadratic part; a repeated column changes nothing', () => {
    // p = t^2 on t = -2..2: minus its fit on [1, t] (mean 2, slope 0) leaves [2, -1, -2, -1, 2], norm sqrt(14)
    const t = [-2, -1, 0, 1, 2];
    expect(residualNorm(t.map((x) => x * x), [[1, 1, 1, 1, 1], t, t])).toBeCloseTo(Math.sqrt(14), 12);
  });
});
