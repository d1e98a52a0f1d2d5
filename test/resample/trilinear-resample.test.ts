import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { trilinearAt, trilinearResample } from '../../src/resample/trilinear-resample.js';
import { identityAffine } from '../../src/core/affine.js';

// Expected values: scipy.ndimage.map_coordinates(order=1) from Debian python3-scipy 1.10.1,
// written by test/reference/make-trilinear-fixture.py into test/reference/trilinear-fixture.json.
const fx = JSON.parse(readFileSync(new URL('../reference/trilinear-fixture.json', import.meta.url), 'utf8')) as {
  dims: [number, number, number]; image: number[]; points: number[][]; constantCval: number;
  constant: number[]; nearest: number[]; srcFromOut: number[]; outDims: [number, number, number]; resampled: number[];
};
// both sides compute in float64 from the same inputs; 1e-9 relative leaves room for a different
// order of the same additions
const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b));

describe('trilinear interpolation against scipy map_coordinates(order=1)', () => {
  const img = Float64Array.from(fx.image);
  it("matches mode 'constant' (cval outside [0, n-1], no edge blending) at scattered points", () => {
    fx.points.forEach((p, n) => {
      const got = trilinearAt(img, fx.dims, p[0], p[1], p[2], 'constant', fx.constantCval);
      if (!close(got, fx.constant[n])) expect.fail(`point ${p}: got ${got}, scipy ${fx.constant[n]}`);
    });
  });
  it("matches mode 'nearest' at scattered points", () => {
    fx.points.forEach((p, n) => {
      const got = trilinearAt(img, fx.dims, p[0], p[1], p[2], 'nearest', 0);
      if (!close(got, fx.nearest[n])) expect.fail(`point ${p}: got ${got}, scipy ${fx.nearest[n]}`);
    });
  });
  it('matches a whole-grid resample through a rotation and shift', () => {
    const out = trilinearResample(img, fx.dims, Float64Array.from(fx.srcFromOut), fx.outDims);
    // float32 output: relative 1e-6 is a few float32 ulps
    out.forEach((v, n) => {
      if (Math.abs(v - fx.resampled[n]) > 1e-6 * Math.max(1, Math.abs(fx.resampled[n]))) expect.fail(`voxel ${n}: got ${v}, scipy ${fx.resampled[n]}`);
    });
  });
  it('the identity map returns the image unchanged, and the input is not modified', () => {
    const copy = img.slice();
    const out = trilinearResample(img, fx.dims, identityAffine(), fx.dims);
    // identity: every sample falls exactly on a voxel, so float64 -> float32 rounding is the only change
    expect(Array.from(out)).toEqual(Array.from(Float32Array.from(img)));
    expect(img).toEqual(copy);
  });
  it('rejects a bad mode and mismatched lengths with INVALID_ARGUMENT', () => {
    expect(() => trilinearResample(img, fx.dims, identityAffine(), fx.dims, undefined, { mode: 'grid-wrap' as never })).toThrow(/mode/);
    expect(() => trilinearResample(img.subarray(1), fx.dims, identityAffine(), fx.dims)).toThrow(/length/);
  });
});
