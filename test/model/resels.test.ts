import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { latticeCounts } from '../../src/model/resels-lattice.js';
import { reselCounts } from '../../src/model/resels.js';
import { rftCriticalValue } from '../../src/model/rft-critical-value.js';

// Independent lattice counts: numpy in test/reference/make_rft_fixture.py.
const fx = JSON.parse(readFileSync(new URL('../reference/rft_fixture.json', import.meta.url), 'utf8')) as {
  voxelSphere: { n: number; radiusVoxels: number; spacingMm: number; fwhmMm: number; counts: { voxels: number; edges: number[]; faces: number[]; cubes: number }; resels: number[]; uZ05: number; uZ05Analytic: number };
  box: { dims: number[]; inside: number[][]; spacingMm: number[]; fwhmMm: number[]; counts: { voxels: number; edges: number[]; faces: number[]; cubes: number }; resels: number[] };
};

function grid(dims: number[], inside: (x: number, y: number, z: number) => boolean): Uint8Array {
  const [nx, ny, nz] = dims;
  const m = new Uint8Array(nx * ny * nz);
  for (let z = 0; z < nz; z++) for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) if (inside(x, y, z)) m[x + nx * (y + ny * z)] = 1;
  return m;
}

describe('Euler characteristic of the lattice (topology: components - tunnels + cavities)', () => {
  it('solid block 1, two blocks 2, hollow box (one cavity) 2, ring (one tunnel) 0', () => {
    const d = [12, 12, 12];
    expect(latticeCounts(grid(d, (x, y, z) => x > 1 && x < 9 && y > 1 && y < 9 && z > 2 && z < 7), d).euler).toBe(1);
    expect(latticeCounts(grid(d, (x, y, z) => (x < 3 || x > 6) && y < 4 && z < 4), d).euler).toBe(2);
    const shell = (x: number, y: number, z: number): boolean => x >= 2 && x <= 9 && y >= 2 && y <= 9 && z >= 2 && z <= 9 && !(x >= 4 && x <= 7 && y >= 4 && y <= 7 && z >= 4 && z <= 7);
    expect(latticeCounts(grid(d, shell), d).euler).toBe(2);
    const ring = (x: number, y: number, z: number): boolean => z >= 3 && z <= 5 && x >= 2 && x <= 9 && y >= 2 && y <= 9 && !(x >= 4 && x <= 7 && y >= 4 && y <= 7);
    expect(latticeCounts(grid(d, ring), d).euler).toBe(0);
  });
});

describe('resel counts (Worsley KJ et al. 1996 lattice formulas)', () => {
  it('a 1e6 mm^3 cube at FWHM 10 mm has R3 = 1000 (REFERENCES.md §8) and the box intrinsic volumes', () => {
    // 51^3 voxels of 2 mm: the lattice cube spans 50 x 2 = 100 mm per side, so V = 1e6 mm^3.
    // Box of side a: R1 = 3a/F = 30, R2 = 3a^2/F^2 = 300 (intrinsic volumes of a box); exact integers here.
    const d = [53, 53, 53];
    const m = grid(d, (x, y, z) => x >= 1 && x <= 51 && y >= 1 && y <= 51 && z >= 1 && z <= 51);
    const { resels } = reselCounts(m, d, 10, [2, 2, 2]);
    expect(resels[0]).toBe(1);
    expect(resels[1]).toBeCloseTo(30, 10);
    expect(resels[2]).toBeCloseTo(300, 10);
    expect(resels[3]).toBeCloseTo(1000, 10);
  });
  it('an anisotropic box with anisotropic FWHM matches numpy counts and the box formulas', () => {
    const [[x0, x1], [y0, y1], [z0, z1]] = fx.box.inside;
    const m = grid(fx.box.dims, (x, y, z) => x >= x0 && x < x1 && y >= y0 && y < y1 && z >= z0 && z < z1);
    const r = reselCounts(m, fx.box.dims, fx.box.fwhmMm, fx.box.spacingMm);
    expect({ voxels: r.counts.voxels, edges: r.counts.edges, faces: r.counts.faces, cubes: r.counts.cubes }).toEqual(fx.box.counts);
    r.resels.forEach((v, d) => expect(v).toBeCloseTo(fx.box.resels[d], 10));
    // box sides (29x2, 19x3, 9x4) mm = (58, 57, 36), FWHM (6, 9, 8): R1 = 58/6 + 57/9 + 36/8 = 20.5, R3 = 58*57*36/(6*9*8) = 275.5
    expect(r.resels[1]).toBeCloseTo(20.5, 10);
    expect(r.resels[3]).toBeCloseTo(275.5, 10);
  });
  it('a voxelised sphere approaches the sphere formulas R = (1, 4r/F, 2 pi r^2/F^2, 4 pi r^3/(3F^3)) as the staircase predicts', () => {
    const { n, radiusVoxels: r, spacingMm, fwhmMm } = fx.voxelSphere;
    const c = (n - 1) / 2;
    const d = [n, n, n];
    const m = grid(d, (x, y, z) => (x - c) ** 2 + (y - c) ** 2 + (z - c) ** 2 <= r * r);
    const res = reselCounts(m, d, fwhmMm, [spacingMm, spacingMm, spacingMm]);
    expect({ voxels: res.counts.voxels, edges: res.counts.edges, faces: res.counts.faces, cubes: res.counts.cubes }).toEqual(fx.voxelSphere.counts);
    res.resels.forEach((v, k) => expect(v).toBeCloseTo(fx.voxelSphere.resels[k], 9));
    const F = fwhmMm / spacingMm; // 5 voxels
    expect(res.resels[0]).toBe(1);
    // The lattice measures the staircase polyhedron, not the sphere. Its R1 is (width_x + width_y + width_z)/F
    // exactly (an orthogonally convex staircase), 6r/F = 1.5 x 4r/F.
    expect(res.resels[1]).toBeCloseTo(1.5 * ((4 * r) / F), 9);
    // Its surface counts |n_x| + |n_y| + |n_z| per area, mean 3/2 over a sphere: R2 -> 1.5 x 2 pi r^2/F^2 from
    // below as r grows; at r = 31 voxels it is 4.7 % short of the limit (5 % tolerance, convergence ~ 1/r).
    expect(Math.abs(res.resels[2] / (1.5 * ((2 * Math.PI * r * r) / F ** 2)) - 1)).toBeLessThan(0.05);
    // Cubes need all 8 corners inside: the sphere shrinks by the mean corner reach (|n_x|+|n_y|+|n_z|)/2 = 3/4
    // voxel, so R3 ~ 4 pi (r - 3/4)^3 / (3 F^3). 1 % tolerance covers the lattice-point counting noise at r = 31.
    expect(Math.abs(res.resels[3] / ((4 * Math.PI * (r - 0.75) ** 3) / (3 * F ** 3)) - 1)).toBeLessThan(0.01);
  });
  it('the FWE threshold from the voxelised sphere is within 0.01 of the continuous sphere threshold', () => {
    // The staircase excess in R1, R2 and the shortfall in R3 nearly cancel at u ~ 4.66: scipy gives 4.65429 vs 4.66238.
    const { n, radiusVoxels: r, spacingMm, fwhmMm } = fx.voxelSphere;
    const c = (n - 1) / 2, d = [n, n, n];
    const m = grid(d, (x, y, z) => (x - c) ** 2 + (y - c) ** 2 + (z - c) ** 2 <= r * r);
    const u = rftCriticalValue(reselCounts(m, d, fwhmMm, [spacingMm, spacingMm, spacingMm]).resels, 0.05, { kind: 'z' }).threshold;
    expect(Math.abs(u - fx.voxelSphere.uZ05)).toBeLessThan(1e-8); // same root as scipy brentq
    expect(Math.abs(u - fx.voxelSphere.uZ05Analytic)).toBeLessThan(0.01);
  });
  it('errors: mask of another size -> GRID_MISMATCH; non-positive FWHM -> INVALID_ARGUMENT', () => {
    const code = (f: () => unknown): string | undefined => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; } return undefined; };
    expect(code(() => reselCounts(new Uint8Array(10), [2, 2, 2], 8, [2, 2, 2]))).toBe('GRID_MISMATCH');
    expect(code(() => reselCounts(new Uint8Array(8), [2, 2, 2], 0, [2, 2, 2]))).toBe('INVALID_ARGUMENT');
    expect(code(() => reselCounts(new Uint8Array(8), [2, 2, 2], 8, [2, -2, 2]))).toBe('INVALID_ARGUMENT');
  });
});
