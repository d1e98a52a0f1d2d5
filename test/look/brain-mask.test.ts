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
});
