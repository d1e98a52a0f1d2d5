import { describe, expect, it } from 'vitest';
import { affineFromRows, diagonalAffine } from '../../src/core/affine.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { brainMaskFromMean } from '../../src/look/brain-mask.js';
import { motionEdgeSignature } from '../../src/look/motion-edge-signature.js';
import { resampleVolume } from '../../src/resample/resample-volume.js';
import { resolvePhantomSpec, simulatePhantomRun } from '../../src/simulate/index.js';
import { quietSpec } from '../simulate/phantom-helpers.js';

// One noise-free phantom volume on a plain grid (world x, y, z = voxel axes i, j, k, 4 mm voxels),
// then the same head moved by a known shift (cubic resampling), then that volume scaled globally.
const spacing: [number, number, number] = [4, 4, 4];
function phantomVolume(): Volume {
  const r = simulatePhantomRun(resolvePhantomSpec(quietSpec({ dims: [38, 46, 36], spacingMm: spacing, nVolumes: 1 })));
  return makeVolume({ dims: [38, 46, 36, 1], spacingMm: spacing, trSec: 2, affine: diagonalAffine(spacing), data: r.volume.data });
}

/** The head moved by `shiftMm` (world): output(p) = input(p - shift), so the transform (target -> source world) is -shift. */
function moved(v: Volume, shiftMm: [number, number, number]): Float32Array {
  const transform = affineFromRows([[1, 0, 0, -shiftMm[0]], [0, 1, 0, -shiftMm[1]], [0, 0, 1, -shiftMm[2]]]);
  return resampleVolume(v, { kernel: 'cubic', transform, mode: 'constant' }).data;
}

function run(volumes: Float32Array[]): Volume {
  const n = volumes[0].length;
  const data = new Float32Array(n * volumes.length);
  volumes.forEach((d, t) => data.set(d, t * n));
  return makeVolume({ dims: [38, 46, 36, volumes.length], spacingMm: spacing, trSec: 2, affine: diagonalAffine(spacing), data });
}

describe('motionEdgeSignature: opposite-signed change at opposite edges', () => {
  const v0 = phantomVolume();
  const mask = brainMaskFromMean(Float64Array.from(v0.data), [38, 46, 36], { spacingMm: spacing }).mask;

  it('a 1 mm shift along one axis shows on that axis with the shift\'s sign, barely on the others; a global 2 % scaling shows nowhere', () => {
    const still = v0.data;
    const scaled = Float32Array.from(still, (x) => x * 1.02);
    const r = run([still, moved(v0, [1, 0, 0]), moved(v0, [0, -1, 0]), still, scaled]);
    const sig = motionEdgeSignature(r, mask);
    const at = (t: number) => sig.axes.map((a) => a[t]);
    for (const a of sig.axes) expect(a[0]).toBe(0);
    // volume 1: +1 mm in x (a quarter voxel)
    const [x1, y1, z1] = at(1);
    expect(x1).toBeGreaterThan(5); // measured: 37.9 % on x, -0.20 % on y, -0.25 % on z
    expect(Math.abs(y1)).toBeLessThan(0.1 * x1);
    expect(Math.abs(z1)).toBeLessThan(0.1 * x1);
    // volume 2: from +1 mm x to -1 mm y: x moves back (negative), y moves by -1 (negative)
    const [x2, y2, z2] = at(2);
    expect(x2).toBeLessThan(-5);
    expect(y2).toBeLessThan(-5);
    expect(Math.abs(z2)).toBeLessThan(0.1 * Math.min(-x2, -y2));
    // volume 4: the whole image x 1.02 from volume 3: every edge voxel changes by the same 2 %, so the
    // difference of the two sides is 0 up to float32 storage of the scaled values (2^-24 relative of
    // 102 %, about 1e-5 % per voxel, averaged): 1e-4 %
    for (const s of at(4)) expect(Math.abs(s)).toBeLessThan(1e-4);
    // every side has many edge voxels (measured: 724, 590, 844 facing + and - along i, j, k)
    expect(sig.voxels.plus.every((c) => c > 50) && sig.voxels.minus.every((c) => c > 50)).toBe(true);
  });

  it('bad input: one volume, a mask of another size', () => {
    expect(() => motionEdgeSignature(v0, mask)).toThrow(expect.objectContaining({ code: 'NOT_4D' }));
    expect(() => motionEdgeSignature(run([v0.data, v0.data]), mask.subarray(1))).toThrow(expect.objectContaining({ code: 'GRID_MISMATCH' }));
  });
});
