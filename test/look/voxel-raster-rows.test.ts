import { expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { makeVolume } from '../../src/core/volume.js';
import { voxelRasterRows } from '../../src/look/voxel-raster-rows.js';

// Depth below the mask surface for a box mask, by plain geometry (a fact of the trade, no source):
// inside, the nearest voxel outside lies straight across the nearest face, min over axes of the
// distance to the first outside index; outside, the nearest mask voxel is at the box's clamp of the
// point, sqrt of the summed squared overhangs. Voxel centres, 2 mm spacing.
it('orders voxel raster rows by exact depth below the mask surface in mm', () => {
  const N = 20, nt = 6, sp = 2, lo = 5, hi = 14;
  const n = N * N * N;
  const mask = new Uint8Array(n);
  for (let k = lo; k <= hi; k++) for (let j = lo; j <= hi; j++) for (let i = lo; i <= hi; i++) mask[i + N * (j + N * k)] = 1;
  const data = new Float32Array(n * nt).map((_, p) => (p * 7919) % 13); // any varying values
  const run = makeVolume({ dims: [N, N, N, nt], spacingMm: [sp, sp, sp], trSec: 2, affine: diagonalAffine([sp, sp, sp]), data });
  const rows = voxelRasterRows(run, mask, { maxRows: 400, rimWidth: 2 });
  expect(rows.rows).toBe(400);
  for (let r = 0; r < rows.rows; r++) {
    const v = rows.voxels[r];
    const ijk = [v % N, Math.floor(v / N) % N, Math.floor(v / (N * N))];
    const expected = mask[v]
      ? sp * Math.min(...ijk.map((x) => Math.min(x - (lo - 1), hi + 1 - x)))
      : -sp * Math.hypot(...ijk.map((x) => Math.max(0, lo - x, x - hi)));
    expect(rows.depthMm[r]).toBeCloseTo(expected, 4); // float32 storage of a few mm
    if (r > 0) expect(rows.depthMm[r]).toBeGreaterThanOrEqual(rows.depthMm[r - 1]);
  }
  expect(rows.depthMm[0]).toBeLessThan(0); // the band outside the mask comes first
  expect(rows.depthMm[rows.rows - 1]).toBeGreaterThanOrEqual(8); // down to the box's centre
});
