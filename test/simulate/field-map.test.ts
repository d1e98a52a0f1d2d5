import { describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { distortAlongAxis } from '../../src/acquire/distort-along-axis.js';
import { fieldMapShiftVoxels } from '../../src/acquire/field-map-shift-voxels.js';
import { totalReadoutTimeSec } from '../../src/acquire/total-readout-time.js';
import { intravoxelDephasing } from '../../src/simulate/intravoxel-dephasing.js';
import { PROTON_HZ_PER_TESLA, sphereFieldMapHz } from '../../src/simulate/sphere-field-map-hz.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { quietSpec } from './phantom-helpers.js';

describe('field-map shift (Jezzard P & Balaban RS (1995) Magn Reson Med 34:65-73; REFERENCES.md §11)', () => {
  it('50 Hz, 0.5 ms effective echo spacing, 64 lines -> 1.575 voxels = 4.725 mm at 3 mm', () => {
    const trt = totalReadoutTimeSec(0.0005, 64);
    // exact decimal arithmetic up to binary rounding
    expect(trt).toBeCloseTo(0.0315, 15);
    expect(fieldMapShiftVoxels(50, trt)).toBeCloseTo(1.575, 12);
    expect(fieldMapShiftVoxels(50, trt) * 3).toBeCloseTo(4.725, 12);
  });

  it('a uniform 50 Hz field moves an object 1.575 voxels along the phase-encode axis, keeping its signal', () => {
    const dims: [number, number, number] = [3, 64, 2];
    const img = new Float32Array(3 * 64 * 2);
    // a smooth bump along j (away from the ends) in every line
    for (let k = 0; k < 2; k++) for (let j = 0; j < 64; j++) for (let i = 0; i < 3; i++) img[i + 3 * (j + 64 * k)] = Math.exp(-0.5 * ((j - 30.3) / 4) ** 2) * (1 + i);
    const shift = new Float32Array(img.length).fill(fieldMapShiftVoxels(50, totalReadoutTimeSec(0.0005, 64)));
    const out = distortAlongAxis(img, shift, dims, 1);
    for (let k = 0; k < 2; k++) for (let i = 0; i < 3; i++) {
      let m0 = 0, m1 = 0, n0 = 0, n1 = 0;
      for (let j = 0; j < 64; j++) {
        const a = img[i + 3 * (j + 64 * k)], b = out[i + 3 * (j + 64 * k)];
        m0 += a; m1 += a * j; n0 += b; n1 += b * j;
      }
      // splatting by linear weights keeps the sum and first moment exactly; float32 leaves ~1e-6
      expect(Math.abs(n0 / m0 - 1)).toBeLessThan(1e-5);
      expect(Math.abs(n1 / n0 - m1 / m0 - 1.575)).toBeLessThan(1e-4);
    }
  });

  it('a converging shift piles signal up and a diverging one thins it (intensity follows the Jacobian)', () => {
    const dims: [number, number, number] = [1, 40, 1];
    const img = new Float32Array(40).fill(0);
    for (let j = 5; j < 35; j++) img[j] = 100;
    // shift s(j) = -0.2 (j - 20): positions move towards j = 20, compressed by 1 + ds/dj = 0.8
    const shift = Float32Array.from({ length: 40 }, (_, j) => -0.2 * (j - 20));
    const out = distortAlongAxis(img, shift, dims, 1);
    // a line compressed by 0.8 carries 1/0.8 = 1.25 times the intensity (Chang & Fitzpatrick 1992,
    // REFERENCES.md §11: I = 100, d' = -0.2 -> 125); away from the edges, within 1 %
    expect(Math.abs(out[20] / 125 - 1)).toBeLessThan(0.01);
  });

  it('rejects an odd number of pieces and mismatched lengths', () => {
    expect(() => distortAlongAxis(new Float32Array(8), new Float32Array(8), [2, 2, 2], 1, undefined, 3)).toThrow(/even/);
    expect(() => distortAlongAxis(new Float32Array(8), new Float32Array(7), [2, 2, 2], 1)).toThrow(/values/);
  });

  it('in the phantom, shifts follow the phase-encode polarity: j and j- move the frontal signal opposite ways', () => {
    const make = (pe: 'j' | 'j-') => simulatePhantomRun(quietSpec({ nVolumes: 1, acquisition: { phaseEncodingDirection: pe }, b0: { susceptibilityDifferencePpm: 9.4, dephasing: false, distortion: true } }));
    const plus = make('j'), minus = make('j-'), none = simulatePhantomRun(quietSpec({ nVolumes: 1 }));
    const comY = (d: Float32Array) => {
      let s = 0, sy = 0;
      const [nx, ny, nz] = none.volume.dims;
      for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) { const v = d[i + nx * (j + ny * k)]; s += v; sy += v * j; }
      return sy / s;
    };
    const c0 = comY(none.volume.data);
    expect(Math.sign(comY(plus.volume.data) - c0)).toBe(-Math.sign(comY(minus.volume.data) - c0));
    expect(Math.abs(comY(plus.volume.data) - c0)).toBeGreaterThan(1e-4);
  });
});

describe('sinus field map and dephasing', () => {
  it('1 ppm at 3 T is 127.73 Hz (REFERENCES.md §11)', () => {
    // 0.005 Hz: half a unit in the last printed digit
    expect(Math.abs(PROTON_HZ_PER_TESLA * 3 * 1e-6 - 127.73)).toBeLessThan(0.005);
  });
  it('follows the sphere formula (dchi/3)(a/r)^3(3cos^2 - 1): +2x on the field axis, -1x beside, 0 inside', () => {
    // grid of 1 mm voxels centred on the sphere
    const dims: [number, number, number] = [41, 41, 41];
    const affine = diagonalAffine([1, 1, 1], [-20, -20, -20]);
    const map = sphereFieldMapHz(dims, affine, { centreMm: [0, 0, 0], radiusMm: 5, fieldStrengthT: 3, susceptibilityDifferencePpm: 9.4 });
    const at = (x: number, y: number, z: number) => map[x + 20 + 41 * (y + 20 + 41 * (z + 20))];
    // formula written out: 9.4 ppm / 3 x (5/10)^3 x 2 x 127.73 Hz/ppm at r = 10 mm on the z axis
    const hzPerPpm = PROTON_HZ_PER_TESLA * 3e-6;
    const onAxis = (9.4 / 3) * 0.125 * 2 * hzPerPpm;
    // float32 storage: relative 1e-6
    expect(Math.abs(at(0, 0, 10) / onAxis - 1)).toBeLessThan(1e-6);
    expect(Math.abs(at(10, 0, 0) / (-onAxis / 2) - 1)).toBeLessThan(1e-6);
    expect(at(0, 0, 0)).toBe(0);
    expect(at(0, 0, -10)).toBeCloseTo(at(0, 0, 10), 3);
  });
  it('a linear field of g Hz per voxel keeps |sinc(g TE)|: 2/pi at g TE = 1/2, 0 at g TE = 1', () => {
    const dims: [number, number, number] = [5, 1, 1];
    const te = 0.03;
    const half = intravoxelDephasing(Float32Array.from({ length: 5 }, (_, i) => (i * 0.5) / te), dims, te);
    const full = intravoxelDephasing(Float32Array.from({ length: 5 }, (_, i) => i / te), dims, te);
    // sinc(1/2) = sin(pi/2)/(pi/2) = 2/pi; float32 field values leave ~1e-6
    for (const v of half) expect(Math.abs(v - 2 / Math.PI)).toBeLessThan(1e-5);
    for (const v of full) expect(v).toBeLessThan(1e-5);
  });
});
