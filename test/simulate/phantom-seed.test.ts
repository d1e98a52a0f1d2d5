import { describe, expect, it } from 'vitest';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { quietSpec } from './phantom-helpers.js';

describe('seeded phantom noise', () => {
  // every noise component on, plus a jerk, spikes and a dropout
  const noisy = (seed: number) => simulatePhantomRun(quietSpec({
    seed, nVolumes: 5, thermalNoiseSd: 11, rician: true,
    physio: {}, drift: {}, smoothNoise: {}, activation: {},
    motion: { wanderStepMm: 0.01, wanderStepDeg: 0.01, jerk: { volume: 3, shiftMm: [0.5, 0, 0], rotationDeg: [0, 0, 1] } },
    b0: { susceptibilityDifferencePpm: 9.4, dephasing: true, distortion: true },
    spikes: [{ volume: 2, amplitude: 2000 }], dropouts: [{ volume: 1, slice: 10, keptFraction: 0.15 }],
  }));
  const a = noisy(5), b = noisy(5), c = noisy(6);
  const bytes = (x: Float32Array) => Buffer.from(x.buffer, x.byteOffset, x.byteLength);

  it('the same seed gives identical data, truth and metadata', () => {
    expect(bytes(a.volume.data).equals(bytes(b.volume.data))).toBe(true);
    expect(a.truth.motionTable).toEqual(b.truth.motionTable);
    expect(a.truth.spikes).toEqual(b.truth.spikes);
    expect(a.sidecar).toEqual(b.sidecar);
  });

  it('a different seed gives different noise but the same anatomy', () => {
    expect(bytes(a.volume.data).equals(bytes(c.volume.data))).toBe(false);
    expect(Array.from(a.truth.tissueLabels.data)).toEqual(Array.from(c.truth.tissueLabels.data));
    // the two runs differ by independent noise: the difference has mean near 0 and spread of about
    // sqrt(2) x the thermal SD in the background, where there is no signal
    const labels = a.truth.tissueLabels.data;
    const nVox = labels.length;
    let n = 0, sum = 0, sq = 0;
    for (let t = 0; t < 5; t++) for (let v = 0; v < nVox; v++) {
      if (labels[v] !== 0) continue;
      const d = a.volume.data[t * nVox + v] - c.volume.data[t * nVox + v];
      n++; sum += d; sq += d * d;
    }
    const sd = Math.sqrt(sq / n - (sum / n) ** 2);
    // Rician background (magnitude of pure noise) has SD sigma sqrt(2 - pi/2) = 0.655 sigma, so the
    // difference of two independent ones has SD 0.655 sqrt(2) sigma = 10.2 for sigma 11 (Gudbjartsson
    // H & Patz S (1995) Magn Reson Med 34:910-914, from memory); 10 % covers sampling error for n > 10^4
    expect(n).toBeGreaterThan(10000);
    expect(Math.abs(sd / (Math.sqrt(2 - Math.PI / 2) * Math.SQRT2 * 11) - 1)).toBeLessThan(0.1);
    expect(Math.abs(sum / n)).toBeLessThan(0.5);
  });
});
