import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { BoundaryMode } from '../../src/core/boundary-mode.js';
import { boundaryIndex } from '../../src/core/boundary-mode.js';
import { CUBIC_BSPLINE_POLE, cubicBSplinePrefilter, prefilterLine } from '../../src/resample/cubic-bspline-prefilter.js';
import type { InterpolationKernel } from '../../src/resample/interpolation-kernel.js';
import { lanczosWeight } from '../../src/resample/lanczos-weight.js';
import { resampleVoxels } from '../../src/resample/resample-voxels.js';
import { resampleVolumesTask } from '../../src/resample/resample-volumes-task.js';

// Expected values: scipy.ndimage.affine_transform / map_coordinates (orders 0, 1, 3, prefilter on)
// and scipy.ndimage.spline_filter from Debian python3-scipy 1.10.1, written by
// test/reference/make_resample_fixture.py into test/reference/resample_fixture.json.
const fx = JSON.parse(readFileSync(new URL('../reference/resample_fixture.json', import.meta.url), 'utf8')) as {
  dims: [number, number, number]; image: number[]; cval: number; srcFromOut: number[]; outDims: [number, number, number];
  points: number[][]; affine: Record<string, number[]>; points_values: Record<string, number[]>; spline: Record<string, number[]>;
};
const KERNEL: Record<string, InterpolationKernel> = { 0: 'nearest', 1: 'linear', 3: 'cubic' };

const coefficientsByMode = new Map<BoundaryMode, ReturnType<typeof cubicBSplinePrefilter>>();
function run(mode: BoundaryMode, kernel: InterpolationKernel, srcFromOut: Float64Array, outDims: [number, number, number]): Float32Array {
  const img = Float64Array.from(fx.image);
  let source: Float64Array = img, sourceDims = fx.dims, pad = 0;
  if (kernel === 'cubic') {
    if (!coefficientsByMode.has(mode)) coefficientsByMode.set(mode, cubicBSplinePrefilter(img, fx.dims, mode));
    ({ coefficients: source, dims: sourceDims, pad } = coefficientsByMode.get(mode)!);
  }
  return resampleVoxels({ source, sourceDims, pad, srcFromOut, outDims, kernel, mode, cval: fx.cval }, new Float32Array(outDims[0] * outDims[1] * outDims[2]));
}

// Output is float32 and values are near 100 (one float32 ulp there is 7.6e-6): 2e-7 relative is
// about two ulps, room for rounding the float64 result once.
const F32 = 2e-7;
// scipy 1.10's 'reflect' spline start is not exact: its own spline misses the samples by 4e-7 on
// values near 100 (measured with spline_filter1d), while ours reproduces them to 1e-12 (test below);
// the coefficients differ by up to 2e-4, the interpolated values by up to 1.1e-4 (1.1e-6 relative).
const REFLECT_CUBIC = 2e-6;

describe('interpolation kernels against scipy.ndimage (orders 0, 1, 3; 5 boundary modes)', () => {
  for (const key of Object.keys(fx.affine)) {
    const [mode, order] = key.split('/') as [BoundaryMode, string];
    const kernel = KERNEL[order];
    const tol = mode === 'reflect' && kernel === 'cubic' ? REFLECT_CUBIC : F32;
    it(`${kernel} / ${mode}: a rotated, scaled and shifted grid matches affine_transform`, () => {
      const out = run(mode, kernel, Float64Array.from(fx.srcFromOut), fx.outDims);
      out.forEach((v, n) => {
        const want = fx.affine[key][n];
        if (Math.abs(v - want) > tol * Math.max(1, Math.abs(want))) expect.fail(`voxel ${n}: got ${v}, scipy ${want}`);
      });
    });
    it(`${kernel} / ${mode}: scattered points, half-voxel ties and far-outside points match map_coordinates`, () => {
      fx.points.forEach((pt, n) => {
        const m = new Float64Array(16);
        m[3] = pt[0]; m[7] = pt[1]; m[11] = pt[2]; m[15] = 1;
        const got = run(mode, kernel, m, [1, 1, 1])[0];
        const want = fx.points_values[key][n];
        if (Math.abs(got - want) > tol * Math.max(1, Math.abs(want))) expect.fail(`point ${pt}: got ${got}, scipy ${want}`);
      });
    });
  }
  it('the run path (prefilter, extended margin, interior fast path) matches affine_transform for cubic and linear in every mode', () => {
    const input = Float32Array.from(fx.image);
    const output = new Float32Array(fx.outDims[0] * fx.outDims[1] * fx.outDims[2]);
    for (const key of Object.keys(fx.affine)) {
      const [mode, order] = key.split('/') as [BoundaryMode, string];
      if (order === '0') continue;
      resampleVolumesTask({ input, output, sourceDims: fx.dims, outDims: fx.outDims, srcFromOut: [Float64Array.from(fx.srcFromOut)], displacementVox: null, kernel: KERNEL[order], mode, cval: fx.cval, tStart: 0, tEnd: 1 });
      // the image is rounded to float32 first (run data are float32): 1e-6 relative covers that
      // rounding carried through the spline (plus scipy's inexact reflect start, 1.1e-6)
      const tol = mode === 'reflect' && order === '3' ? 3e-6 : 1e-6;
      output.forEach((v, n) => {
        const want = fx.affine[key][n];
        if (Math.abs(v - want) > tol * Math.max(1, Math.abs(want))) expect.fail(`${key} voxel ${n}: got ${v}, scipy ${want}`);
      });
    }
  });
  for (const mode of ['mirror', 'wrap'] as const) {
    it(`cubic B-spline coefficients (${mode}) match scipy's spline_filter`, () => {
      const { coefficients } = cubicBSplinePrefilter(Float64Array.from(fx.image), fx.dims, mode);
      // both in float64 from the same samples; 1e-10 relative leaves room for another summation order
      coefficients.forEach((c, n) => expect(Math.abs(c - fx.spline[mode][n])).toBeLessThan(1e-10 * Math.max(1, Math.abs(c))));
    });
  }
});

describe('cubic B-spline prefilter (Unser M 1999, Splines: a perfect fit for signal and image processing, IEEE Signal Process Mag 16(6):22-38 [memory])', () => {
  it('has the pole z = sqrt(3) - 2, the root of z^2 + 4z + 1 inside the unit circle', () => {
    expect(CUBIC_BSPLINE_POLE).toBeCloseTo(-0.2679491924311227, 15);
    expect(Math.abs(CUBIC_BSPLINE_POLE ** 2 + 4 * CUBIC_BSPLINE_POLE + 1)).toBeLessThan(1e-15);
  });
  it('turns a unit impulse far from the edges into sqrt(3) z^|k| (the inverse filter in closed form)', () => {
    const n = 101, line = new Float64Array(n);
    line[50] = 1;
    prefilterLine(line, 'mirror', new Float64Array(n));
    const z = CUBIC_BSPLINE_POLE;
    // float64 recursions over 101 samples: 1e-14 absolute
    for (let k = 0; k < n; k++) expect(Math.abs(line[k] - Math.sqrt(3) * z ** Math.abs(k - 50))).toBeLessThan(1e-14);
  });
  for (const mode of ['mirror', 'reflect', 'wrap'] as const) {
    it(`reproduces the samples exactly: (c[k-1] + 4 c[k] + c[k+1]) / 6 = s[k] with c extended by ${mode}`, () => {
      for (const n of [2, 3, 7, 40, 90]) {
        const s = Float64Array.from({ length: n }, (_, k) => Math.sin(1.7 * k) * 50 + 100 + (k % 3));
        const c = s.slice();
        prefilterLine(c, mode, new Float64Array(n));
        for (let k = 0; k < n; k++) {
          const back = (c[boundaryIndex(k - 1, n, mode)] + 4 * c[k] + c[boundaryIndex(k + 1, n, mode)]) / 6;
          // float64: 1e-12 relative is a few thousand ulps, far below any interpolation error
          expect(Math.abs(back - s[k])).toBeLessThan(1e-12 * 100);
        }
      }
    });
  }
  it('cubic interpolation at the grid points gives back the image (any mode)', () => {
    const identity = new Float64Array([1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]);
    for (const mode of ['constant', 'nearest', 'reflect', 'mirror', 'wrap'] as const) {
      const out = run(mode, 'cubic', identity, fx.dims);
      out.forEach((v, n) => expect(Math.abs(v - fx.image[n])).toBeLessThan(F32 * Math.abs(fx.image[n])));
    }
  });
});

describe('Lanczos kernel (radius 3) against its definition', () => {
  // L(x) = sinc(x) sinc(x/3) for |x| < 3 (Duchon CE 1979, J Appl Meteorol 18:1016-1022 [memory]);
  // the six weights of an axis are normalised to sum 1 (stated in interpolation-kernel.ts)
  const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));
  const L = (x: number) => (Math.abs(x) < 3 ? sinc(x) * sinc(x / 3) : 0);
  const n = 20;
  const line = Float64Array.from({ length: n }, (_, k) => Math.cos(0.9 * k) * 30 + 0.5 * k);
  it('interpolates a line as sum_k s[k] L(x - k) / sum_k L(x - k) away from the edges', () => {
    for (const x of [3.0, 4.25, 7.5, 9.9, 12.01, 15.75]) {
      let num = 0, den = 0;
      for (let k = Math.floor(x) - 2; k <= Math.floor(x) + 3; k++) { num += line[k] * L(x - k); den += L(x - k); }
      const m = new Float64Array(16);
      m[3] = x; m[15] = 1;
      const got = resampleVoxels({ source: line, sourceDims: [n, 1, 1], pad: 0, srcFromOut: m, outDims: [1, 1, 1], kernel: 'lanczos3', mode: 'mirror', cval: 0 }, new Float32Array(1))[0];
      // float32 output of values up to 40: 2e-7 relative
      expect(Math.abs(got - num / den)).toBeLessThan(F32 * Math.max(1, Math.abs(num / den)));
    }
  });
  it('lanczosWeight is the definition: 1 at 0, 0 at the other integers and from |x| = 3 on', () => {
    for (let x = -4; x <= 4; x += 0.125) {
      // the same formula rearranged (one product of sines over pi^2 x^2 / 3): 1e-15 absolute
      expect(Math.abs(lanczosWeight(x, 3) - L(x))).toBeLessThan(1e-15);
    }
    expect(lanczosWeight(0, 3)).toBe(1);
    for (const k of [1, 2, -1, -2, 3, -3]) expect(Math.abs(lanczosWeight(k, 3))).toBeLessThan(1e-16);
  });
  it('reproduces the samples on the grid (integer positions)', () => {
    for (let k = 0; k < n; k++) {
      const m = new Float64Array(16);
      m[3] = k; m[15] = 1;
      const got = resampleVoxels({ source: line, sourceDims: [n, 1, 1], pad: 0, srcFromOut: m, outDims: [1, 1, 1], kernel: 'lanczos3', mode: 'reflect', cval: 0 }, new Float32Array(1))[0];
      expect(got).toBe(Math.fround(line[k]));
    }
  });
});
