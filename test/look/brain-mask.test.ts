import { describe, expect, it } from 'vitest';
import { brainMaskFromMean } from '../../src/look/brain-mask.js';
import { fillHoles } from '../../src/look/fill-holes.js';
import { meanImage } from '../../src/look/mean-image.js';
import { syntheticRun } from './synthetic-run.js';

describe('brain mask from the EPI', () => {
  it('recovers a noisy ellipsoid (Dice > 0.97) with specks and holes removed', () => {
    const run = syntheticRun({ dims: [32, 32, 16, 20] });
    const [nx, ny, nz] = run.dims;
    const truth = new Uint8Array(nx * ny * nz);
    const cx = (nx - 1) / 2, cy = (ny - 1) / 2, cz = (nz - 1) / 2;
    for (let z = 0; z < nz; z++) for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) {
      truth[x + nx * (y + ny * z)] = ((x - cx) / (0.35 * nx)) ** 2 + ((y - cy) / (0.38 * ny)) ** 2 + ((z - cz) / (0.4 * nz)) ** 2 <= 1 ? 1 : 0;
    }
    const mean = meanImage(run);
    mean[3 + nx * 3] = 5000; // a bright speck in the background corner: opening must remove it
    const centre = Math.round(cx) + nx * (Math.round(cy) + ny * Math.round(cz));
    mean[centre] = 0; // a dark voxel inside: hole filling must restore it
    const m = brainMaskFromMean(mean, [nx, ny, nz]);
    let both = 0, a = 0, b = 0;
    for (let v = 0; v < truth.length; v++) { both += m.mask[v] & truth[v]; a += m.mask[v]; b += truth[v]; }
    expect((2 * both) / (a + b)).toBeGreaterThan(0.97);
    expect(m.mask[3 + nx * 3]).toBe(0);
    expect(m.mask[centre]).toBe(1);
  });

  it('fills an enclosed hole but not a notch open to the border', () => {
    const dims = [5, 5, 3];
    const m = new Uint8Array(75).fill(1);
    m[2 + 5 * 2 + 25] = 0; // enclosed
    m[0 + 5 * 2 + 25] = 0; // on the border
    const f = fillHoles(m, dims);
    expect(f[2 + 5 * 2 + 25]).toBe(1);
    expect(f[0 + 5 * 2 + 25]).toBe(0);
  });

  it('fills exactly the background not connected to the grid border (random masks, 3D and one slice), against a plain fixed-point relaxation', () => {
    // the definition itself, computed the slow way: background reached from the border grows by face
    // neighbours until nothing changes; everything else is in the filled mask
    const reference = (m: Uint8Array, [nx, ny, nz]: number[]): Uint8Array => {
      const reached = new Uint8Array(m.length);
      const at = (i: number, j: number, k: number) => i + nx * (j + ny * k);
      for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
        const border = i === 0 || j === 0 || i === nx - 1 || j === ny - 1 || (nz > 1 && (k === 0 || k === nz - 1));
        if (border && !m[at(i, j, k)]) reached[at(i, j, k)] = 1;
      }
      for (let changed = true; changed;) {
        changed = false;
        for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
          const v = at(i, j, k);
          if (m[v] || reached[v]) continue;
          const near = (i > 0 && reached[v - 1]) || (i < nx - 1 && reached[v + 1]) || (j > 0 && reached[v - nx]) || (j < ny - 1 && reached[v + nx])
            || (k > 0 && reached[v - nx * ny]) || (k < nz - 1 && reached[v + nx * ny]);
          if (near) { reached[v] = 1; changed = true; }
        }
      }
      return Uint8Array.from(reached, (r) => 1 - r);
    };
    let seed = 7;
    const next = () => { seed = (seed * 1103515245 + 12345) % 2147483648; return seed / 2147483648; };
    for (const dims of [[13, 11, 9], [17, 12, 1], [40, 3, 5]]) {
      for (const density of [0.3, 0.55, 0.7]) {
        const m = Uint8Array.from({ length: dims[0] * dims[1] * dims[2] }, () => (next() < density ? 1 : 0));
        expect(Array.from(fillHoles(m, dims))).toEqual(Array.from(reference(m, dims)));
      }
    }
  });
});
