import { describe, expect, it } from 'vitest';
import { ernstAngleDeg, mzBeforePulse, spoiledGreSignal } from '../../src/simulate/spoiled-gre-signal.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { PHANTOM_TISSUES } from '../../src/simulate/tissue-properties.js';
import { quietSpec } from './phantom-helpers.js';

// Closed form: Ernst RR & Anderson WA (1966) Rev Sci Instrum 37:93-102; Haacke EM et al. (1999)
// Magnetic Resonance Imaging: Physical Principles and Sequence Design. E1 = exp(-TR/T1),
// q = E1 cos(a), Mss = M0 (1 - E1)/(1 - q), Mz(n) = Mss + (M0 - Mss) q^(n-1).
// Check values computed with Debian numpy (REFERENCES.md §6).
describe('spoiled gradient echo: closed form against the reference check values', () => {
  const timing = { trSec: 2, teSec: 0, flipAngleDeg: 77 };
  const g = spoiledGreSignal(1.33, 1, timing);
  // the check values are printed to 7 significant digits; 5e-7 absolute is half a unit in the last place
  it('E1, q and S_ss/M0 for TR 2 s, T1 1.33 s, 77 deg', () => {
    expect(Math.abs(g.e1 - 0.2222929)).toBeLessThan(5e-8);
    expect(Math.abs(g.q - 0.0500050)).toBeLessThan(5e-8);
    expect(Math.abs(g.steadySignal - 0.7976616)).toBeLessThan(5e-8);
  });
  it('excess over steady state of volumes 1-3 is 22.153 %, 1.1078 %, 0.05539 %', () => {
    const excess = (n: number) => 100 * (mzBeforePulse(n, g) / g.mzSteadyFraction - 1);
    // half a unit in the last printed digit of each check value
    expect(Math.abs(excess(1) - 22.153)).toBeLessThan(5e-4);
    expect(Math.abs(excess(2) - 1.1078)).toBeLessThan(5e-5);
    expect(Math.abs(excess(3) - 0.05539)).toBeLessThan(5e-6);
    expect(excess(2)).toBeGreaterThan(1);
    expect(excess(3)).toBeLessThan(1);
  });
  it('Ernst angle: cos(a_E) = exp(-TR/T1), 77.156 deg for TR 2 s, T1 1.33 s', () => {
    expect(Math.abs(ernstAngleDeg(2, 1.33) - 77.156)).toBeLessThan(5e-4);
    // the steady-state signal is largest at the Ernst angle (definition); 0.5 deg either side is lower
    const at = (deg: number) => spoiledGreSignal(1.33, 1, { trSec: 2, teSec: 0, flipAngleDeg: deg }).steadySignal;
    expect(at(77.156)).toBeGreaterThan(at(76.656));
    expect(at(77.156)).toBeGreaterThan(at(77.656));
  });
  it('rejects a non-positive T1', () => {
    expect(() => spoiledGreSignal(0, 0.05, timing)).toThrow(/T1/);
  });
});

describe('the phantom approaches steady state as the closed form says', () => {
  // T1 sources of the default tissues: GM 1331 ms and WM 832 ms from Wansapura JP et al. (1999)
  // J Magn Reson Imaging 9(4):531-538 (quoted from memory), CSF 4.2 s (from memory); Stanisz GJ
  // et al. (2005) Magn Reson Med 54(3):507-512 give higher values (GM 1820 ms, WM 1084 ms).
  const run = simulatePhantomRun(quietSpec({ nVolumes: 6 }));
  const { truth } = run;
  const spec = truth.spec;
  const [nx, ny, nz] = run.volume.dims;
  const nVox = nx * ny * nz;
  const closed = (t1Sec: number, n: number) => {
    // written out here rather than calling the code under test
    const e1 = Math.exp(-spec.acquisition.trSec / t1Sec);
    const q = e1 * Math.cos((spec.acquisition.flipAngleDeg * Math.PI) / 180);
    const mss = (1 - e1) / (1 - q);
    return 1 + (1 / mss - 1) * Math.pow(q, n - 1);
  };

  it('every head voxel of volume n equals sum_t fraction_t S_ss,t (1 + (M0/Mss,t - 1) q_t^(n-1))', () => {
    let worst = 0;
    for (let n = 1; n <= 6; n++) {
      for (let v = 0; v < nVox; v++) {
        let expected = 0;
        for (const t of PHANTOM_TISSUES) expected += truth.tissueFractions[t][v] * truth.tissueSignal[t] * closed(spec.tissues[t].t1Sec, n);
        const got = run.volume.data[(n - 1) * nVox + v];
        worst = Math.max(worst, Math.abs(got - expected) / Math.max(expected, 1));
      }
    }
    // float32 storage of voxel values and fractions: a few parts in 1e7
    expect(worst).toBeLessThan(2e-6);
  });

  it('CSF (longest T1) approaches slowest; ratio of the n-th volume to steady state per pure tissue (3.5 mm grid)', () => {
    const fine = simulatePhantomRun(quietSpec({ nVolumes: 6, dims: [44, 52, 34], spacingMm: [3.5, 3.5, 3.5] }));
    const nVox = fine.volume.data.length / 6;
    for (const t of ['csf', 'grey-matter', 'white-matter'] as const) {
      const f = fine.truth.tissueFractions[t];
      let v = -1;
      for (let p = 0; p < nVox; p++) if (f[p] > 0.999) { v = p; break; }
      expect(v, `a pure ${t} voxel exists`).toBeGreaterThanOrEqual(0);
      for (let n = 1; n <= 6; n++) {
        const ratio = fine.volume.data[(n - 1) * nVox + v] / fine.truth.tissueSignal[t];
        // float32 storage: relative 1e-6
        expect(Math.abs(ratio - closed(spec.tissues[t].t1Sec, n))).toBeLessThan(1e-6 * ratio + 1e-6);
      }
    }
    expect(closed(4.2, 2)).toBeGreaterThan(closed(1.331, 2));
    expect(closed(1.331, 2)).toBeGreaterThan(closed(0.832, 2));
  });

  it('the steady-state count follows the 1 % rule: T1 0.832 s -> volume 2, 1.331 s -> 3, 4.2 s -> 4', () => {
    // reference check values (REFERENCES.md §6): T1 0.832 s -> vol 2; 1.33 s -> vol 3; 4.2 s -> vol 4
    expect(truth.steadyState.perTissue['white-matter'].firstSteadyVolume).toBe(2);
    expect(truth.steadyState.perTissue['grey-matter'].firstSteadyVolume).toBe(3);
    expect(truth.steadyState.perTissue.csf.firstSteadyVolume).toBe(4);
    expect(truth.steadyState.firstSteadyVolume).toBe(4);
    expect(truth.steadyState.nonSteadyVolumeCount).toBe(3);
  });
});
