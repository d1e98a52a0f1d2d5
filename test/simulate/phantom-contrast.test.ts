import { describe, expect, it } from 'vitest';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { TISSUE_LABEL } from '../../src/simulate/tissue-properties.js';
import { quietSpec } from './phantom-helpers.js';

// Stated contrast of the noise-free phantom at steady state (TR 2 s, TE 30 ms, 77 deg), from the
// spoiled-gradient-echo signal S = PD sin(a) (1 - E1)/(1 - E1 cos a) exp(-TE/T2*) (Ernst & Anderson
// 1966; Haacke et al. 1999), grey matter scaled to 1000: CSF about 1055, GM 1000, WM about 929,
// extracerebral about 153, air 0.
describe('noise-free phantom tissue contrast', () => {
  const run = simulatePhantomRun(quietSpec({ nVolumes: 12, dims: [44, 52, 34], spacingMm: [3.5, 3.5, 3.5] }));
  const { truth } = run;
  const nVox = 44 * 52 * 34;
  const last = run.volume.data.subarray(11 * nVox);
  const signal = (pd: number, t1: number, t2s: number) => {
    const a = (77 * Math.PI) / 180;
    const e1 = Math.exp(-2 / t1);
    return pd * Math.sin(a) * ((1 - e1) / (1 - e1 * Math.cos(a))) * Math.exp(-0.03 / t2s);
  };
  // written out from the default tissue table (PD, T1 s, T2* s) so the test does not reuse the code under test
  const expected = {
    csf: signal(1.0, 4.2, 0.2),
    'grey-matter': signal(0.8, 1.331, 0.05),
    'white-matter': signal(0.7, 0.832, 0.045),
    extracerebral: signal(0.25, 0.5, 0.02),
  };
  const gm = expected['grey-matter'];

  it('pure-tissue voxels at steady state match the closed-form contrast relative to grey matter', () => {
    for (const [tissue, s] of Object.entries(expected) as Array<[keyof typeof expected, number]>) {
      const f = truth.tissueFractions[tissue];
      let count = 0, sum = 0;
      for (let v = 0; v < nVox; v++) if (f[v] > 0.999) { count++; sum += last[v]; }
      expect(count, `pure ${tissue} voxels`).toBeGreaterThan(0);
      // volume 12 is within 1e-9 of steady state for T1 <= 4.2 s; float32 values: relative 1e-5
      expect(Math.abs(sum / count - (1000 * s) / gm)).toBeLessThan(1e-5 * (1000 * s) / gm + 1e-4);
    }
  });

  it('orders CSF > grey matter > white matter > extracerebral > air (0), with the stated values', () => {
    const sig = truth.tissueSignal;
    expect(sig.csf).toBeGreaterThan(sig['grey-matter']);
    expect(sig['grey-matter']).toBeGreaterThan(sig['white-matter']);
    expect(sig['white-matter']).toBeGreaterThan(sig.extracerebral);
    expect(sig['grey-matter']).toBe(1000);
    // stated values above, rounded to the nearest whole unit
    expect(Math.round(sig.csf)).toBe(1055);
    expect(Math.round(sig['white-matter'])).toBe(929);
    expect(Math.round(sig.extracerebral)).toBe(153);
    const labels = truth.tissueLabels.data;
    for (let v = 0; v < nVox; v++) {
      if (labels[v] === TISSUE_LABEL.air || labels[v] === TISSUE_LABEL['sinus-air']) {
        // a majority-air voxel holds less than half a voxel of the brightest tissue
        expect(last[v]).toBeLessThanOrEqual(0.5 * sig.csf + 1e-3);
      }
    }
    let outside = 0;
    for (let v = 0; v < nVox; v++) if (truth.tissueFractions.extracerebral[v] + truth.tissueFractions.csf[v] + truth.tissueFractions['grey-matter'][v] + truth.tissueFractions['white-matter'][v] === 0) outside = Math.max(outside, Math.abs(last[v]));
    expect(outside).toBe(0);
  });
});
