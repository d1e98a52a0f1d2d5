import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/random.js';
import { hrfValues } from '../../src/model/hrf.js';
import { blockDesignEvents } from '../../src/simulate/block-design-events.js';
import { blockResponseAt } from '../../src/simulate/block-response-at.js';
import { interleavedSliceTiming } from '../../src/acquire/interleaved-slice-timing.js';
import { physioTraces } from '../../src/simulate/physio-traces.js';
import { smoothGaussianField } from '../../src/simulate/smooth-gaussian-field.js';

describe('interleaved ascending slice timing', () => {
  // definition (common practice, no source): even slices 0, 2, 4, ... first, then odd ones, evenly over one TR
  it('4 slices at TR 2 s -> [0, 1, 0.5, 1.5]; 5 slices at TR 2.5 s -> [0, 1.5, 0.5, 2, 1]', () => {
    expect(interleavedSliceTiming(4, 2)).toEqual([0, 1, 0.5, 1.5]);
    expect(interleavedSliceTiming(5, 2.5)).toEqual([0, 1.5, 0.5, 2, 1]);
  });
  it('every slice time is inside the TR and all are distinct', () => {
    const t = interleavedSliceTiming(34, 2);
    expect(new Set(t).size).toBe(34);
    expect(Math.max(...t)).toBeLessThan(2);
  });
});

describe('block design and its response', () => {
  it('20 s blocks every 40 s from 20 s fill a 300 s run with 7 blocks', () => {
    const ev = blockDesignEvents({ firstOnsetSec: 20, onSec: 20, offSec: 20, trialType: 'flicker' }, 300);
    expect(ev.map((e) => e.onsetSec)).toEqual([20, 60, 100, 140, 180, 220, 260]);
    expect(ev.every((e) => e.durationSec === 20 && e.trialType === 'flicker' && e.modulation === 1)).toBe(true);
  });
  it('a 20 s block convolved with the Glover (1999) HRF matches direct numerical integration', () => {
    const ev = blockDesignEvents({ firstOnsetSec: 10, onSec: 20, offSec: 100, trialType: 'x' }, 60);
    const times = [0, 12, 16, 20, 25, 30, 34, 40, 45];
    const got = blockResponseAt(ev, times);
    // reference: midpoint rule at 1 ms on the Glover form (hrfValues, itself checked against the
    // project's scipy fixture), normalised by the HRF's integral over 0-32 s
    const dt = 0.001;
    const grid = Float64Array.from({ length: 32000 }, (_, i) => (i + 0.5) * dt);
    const h = hrfValues(grid);
    const area = h.reduce((s, v) => s + v, 0) * dt;
    times.forEach((t, n) => {
      let acc = 0;
      for (let i = 0; i < grid.length; i++) {
        const u = t - grid[i];
        if (u >= 10 && u < 30) acc += h[i] * dt;
      }
      // midpoint rule on the 0.05 s grid plus linear reading between grid points: errors of order
      // (0.05 s)^2 x curvature, about 1e-5 of the plateau here; 1e-4 bounds it
      expect(Math.abs(got[n] - acc / area)).toBeLessThan(1e-4);
    });
    expect(got[0]).toBe(0);
  });
  it('a long block reaches a plateau of 1', () => {
    const got = blockResponseAt([{ onsetSec: 0, durationSec: 200, trialType: 'x', modulation: 1 }], [100]);
    // 'sum' normalisation of the sampled HRF makes a sustained unit input sum to exactly 1
    expect(Math.abs(got[0] - 1)).toBeLessThan(1e-9);
  });
});

describe('physiological traces', () => {
  // Sampling at 1/TR aliases a frequency f to |f - round(f TR) / TR| (Nyquist-Shannon sampling,
  // common practice, no source): 1.1 Hz at TR 2 s -> 0.1 Hz, 0.3 Hz -> 0.2 Hz.
  it('alias 1.1 Hz and 0.3 Hz to 0.1 Hz and 0.2 Hz when read once per 2 s', () => {
    const n = 600;
    const times = Float64Array.from({ length: n }, (_, i) => 2 * i);
    const tr = physioTraces(times, { cardiacHz: 1.1, respirationHz: 0.3, rateWanderFraction: 0 }, createRng(2));
    const peak = (x: Float64Array) => {
      let best = 0, bestF = 0;
      for (let m = 1; m < n / 2; m++) {
        let re = 0, im = 0;
        for (let i = 0; i < n; i++) { re += x[i] * Math.cos((2 * Math.PI * m * i) / n); im += x[i] * Math.sin((2 * Math.PI * m * i) / n); }
        if (re * re + im * im > best) { best = re * re + im * im; bestF = m / (n * 2); }
      }
      return bestF;
    };
    // frequency resolution of 600 samples at 2 s is 1/1200 Hz
    expect(Math.abs(peak(tr.cardiac) - 0.1)).toBeLessThan(1 / 1200 + 1e-12);
    expect(Math.abs(peak(tr.respiration) - 0.2)).toBeLessThan(1 / 1200 + 1e-12);
  });
});

describe('smooth Gaussian random field', () => {
  const dims: [number, number, number] = [48, 48, 48];
  const fwhmMm = 2 * Math.sqrt(2 * Math.LN2) * 2 * 3; // sigma 2 voxels of 3 mm
  const f = smoothGaussianField(dims, [3, 3, 3], fwhmMm, createRng(11));
  it('has unit variance and the lag-1 correlation of Gaussian-smoothed white noise, exp(-1/(4 sigma^2))', () => {
    let s = 0, sq = 0, lag = 0;
    for (let p = 0; p < f.length; p++) {
      s += f[p]; sq += f[p] * f[p];
      const i = p % 48;
      lag += f[p] * f[i === 47 ? p - 47 : p + 1];
    }
    const n = f.length;
    const sd = Math.sqrt(sq / n - (s / n) ** 2);
    // about n / (8 pi^(3/2) sigma^3) ~ 2500 independent values: SD error ~ 1.5 %, 6 % is 4 SE
    expect(Math.abs(sd - 1)).toBeLessThan(0.06);
    // a Gaussian of variance sigma^2 convolved with itself has variance 2 sigma^2 (REFERENCES.md §1:
    // variances add), so neighbours correlate exp(-1/(4 sigma^2)) = 0.9394 at sigma 2
    expect(Math.abs(lag / sq - Math.exp(-1 / 16))).toBeLessThan(0.02);
  });
  it('rejects a non-positive FWHM', () => {
    expect(() => smoothGaussianField(dims, [3, 3, 3], 0, createRng(1))).toThrow(/fwhmMm/);
  });
});
