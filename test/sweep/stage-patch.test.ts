import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/random.js';
import { applyStagePatch, stagePatch } from '../../src/sweep/stage-patch.js';

const bits = (a: Float32Array): number[] => Array.from(new Int32Array(a.buffer, a.byteOffset, a.length));

describe('stage patch', () => {
  const nVoxels = 30, nt = 7;
  const base = new Float32Array(nVoxels * nt);
  createRng(5).fillNormal(base, 500, 20);
  // a "planted" run: three voxels changed in some volumes, including values equal as numbers but not as bits
  const run = Float32Array.from(base);
  run[2 * nVoxels + 4] += 1;
  run[0 * nVoxels + 11] = Number.NaN;
  run[6 * nVoxels + 29] = -0;
  base[6 * nVoxels + 29] = 0;

  it('finds the voxels that differ in any bit of any volume and rebuilds the run byte for byte', () => {
    const before = { run: bits(run), base: bits(base) };
    const patch = stagePatch(run, base, nVoxels, 0.25)!;
    expect(Array.from(patch.voxels)).toEqual([4, 11, 29]);
    expect(patch.bits.length).toBe(3 * nt);
    const out = new Float32Array(run.length).fill(7);
    expect(applyStagePatch(base, patch, nVoxels, out)).toBe(out);
    expect(bits(out)).toEqual(bits(run));
    expect({ run: bits(run), base: bits(base) }).toEqual(before); // inputs unchanged
  });
  it('gives an empty patch for identical runs and null when too many voxels differ', () => {
    const same = stagePatch(base, Float32Array.from(base), nVoxels, 0)!;
    expect(same.voxels.length).toBe(0);
    const out = new Float32Array(base.length);
    expect(bits(applyStagePatch(base, same, nVoxels, out))).toEqual(bits(base));
    expect(stagePatch(run, base, nVoxels, 2 / nVoxels)).toBeNull(); // 3 voxels differ, 2 allowed
    expect(stagePatch(run, base.subarray(1), nVoxels, 1)).toBeNull(); // lengths differ
  });
});
