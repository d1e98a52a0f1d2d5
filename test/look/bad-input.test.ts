import { describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume } from '../../src/core/volume.js';
import { lookAtRun } from '../../src/look/look-at-run.js';
import { robustZ } from '../../src/look/robust-z.js';
import { voxelTimeStats } from '../../src/look/voxel-time-stats.js';
import { checkUserMask } from '../../src/look/brain-mask.js';
import { syntheticRun } from './synthetic-run.js';

function expectCode(fn: () => unknown, code: string): string {
  try {
    fn();
  } catch (e) {
    expect(isBoldsweepError(e), String(e)).toBe(true);
    expect((e as { code: string }).code).toBe(code);
    return (e as Error).message;
  }
  throw new Error(`expected ${code}, nothing was thrown`);
}

describe('look on bad input', () => {
  it('a constant run: typed CONSTANT_DATA, no division by zero', () => {
    const run = makeVolume({ dims: [8, 8, 4, 20], spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data: new Float32Array(8 * 8 * 4 * 20).fill(100) });
    expect(expectCode(() => lookAtRun(run), 'CONSTANT_DATA')).toMatch(/single value/);
  });

  it('a run constant over time but with spatial contrast: CONSTANT_DATA naming the mask', () => {
    const base = syntheticRun({ dims: [16, 16, 8, 20], noiseSd: 0 });
    expect(expectCode(() => lookAtRun(base), 'CONSTANT_DATA')).toMatch(/varies over time/);
  });

  it('all-NaN slices: reported as a finding, excluded, maps NaN there, the rest measured', () => {
    const run = syntheticRun({ dims: [20, 20, 12, 40] });
    const data = Float32Array.from(run.data);
    const n = 20 * 20 * 12;
    for (let t = 0; t < 40; t++) for (let i = 0; i < 400; i++) { data[t * n + 6 * 400 + i] = NaN; data[t * n + 7 * 400 + i] = NaN; }
    const look = lookAtRun({ ...run, data });
    const f = look.findings.find((x) => x.kind === 'non-finite');
    expect(f?.slices).toEqual([6, 7]);
    expect(f?.evidence.wholeSlices).toEqual([6, 7]);
    expect(look.maps.tsnr.data[6 * 400 + 210]).toBeNaN();
    expect(look.summaries.tsnr.median).toBeGreaterThan(50);
    expect(run.data[6 * 400]).not.toBeNaN(); // input not modified
  });

  it('a 3D image: NOT_4D', () => {
    const img = makeVolume({ dims: [8, 8, 4, 1], spacingMm: [3, 3, 3], trSec: 0, affine: diagonalAffine([3, 3, 3]), data: new Float32Array(256) });
    expectCode(() => lookAtRun(img), 'NOT_4D');
    expectCode(() => voxelTimeStats(img), 'NOT_4D');
  });

  it('a negative or fractional drop count is named as such (not as "leaves N volumes")', () => {
    const run = syntheticRun({ dims: [12, 12, 6, 40] });
    expect(expectCode(() => lookAtRun(run, { dropInitialVolumes: -1 }), 'INVALID_ARGUMENT')).toMatch(/whole number of volumes, 0 or more.*got -1/);
    expectCode(() => lookAtRun(run, { dropInitialVolumes: 1.5 }), 'INVALID_ARGUMENT');
  });

  it('fewer volumes than a measure needs: TOO_FEW_VOLUMES with the numbers', () => {
    expect(expectCode(() => lookAtRun(syntheticRun({ dims: [12, 12, 6, 5] })), 'TOO_FEW_VOLUMES')).toMatch(/at least 12 volumes.*has 5/);
    expectCode(() => voxelTimeStats(syntheticRun({ dims: [4, 4, 2, 3] }), { detrendOrder: 2 }), 'TOO_FEW_VOLUMES');
    expectCode(() => robustZ([1, NaN]), 'TOO_FEW_VOLUMES');
  });

  it('robust z of a series whose MAD is 0 uses the mean absolute deviation, and of a constant series gives 0', () => {
    const r = robustZ([5, 5, 5, 5, 9]);
    expect(r.scaleFrom).toBe('mean-absolute-deviation');
    expect(Number.isFinite(r.z[4])).toBe(true);
    expect(Array.from(robustZ([3, 3, 3]).z)).toEqual([0, 0, 0]);
  });

  it('a user mask on another grid: GRID_MISMATCH', () => {
    const run = syntheticRun({ dims: [12, 12, 6, 20] });
    const mask = makeVolume({ dims: [10, 12, 6, 1], spacingMm: [3, 3, 3], trSec: 0, affine: run.affine, data: new Float32Array(720).fill(1) });
    expectCode(() => checkUserMask(mask, run), 'GRID_MISMATCH');
  });
});

describe('findings table', () => {
  it('is an empty table with the same columns when nothing was found', async () => {
    const { findingsTable } = await import('../../src/look/findings-table.js');
    const t = findingsTable({ findings: [] });
    expect(t.shape).toEqual([0, 9]);
    expect(t.columns).toContain('verdict');
  });
});

describe('runs a look cannot read the usual way', () => {
  const make = (dims: [number, number, number, number], f: (i: number, j: number, k: number) => number, noise: (i: number, j: number, k: number) => number) => {
    const [nx, ny, nz, nt] = dims;
    const rng = createRng(3);
    const data = new Float32Array(nx * ny * nz * nt);
    for (let t = 0, p = 0; t < nt; t++) for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, p++) data[p] = f(i, j, k) + rng.normal(0, 1) * noise(i, j, k);
    return makeVolume({ dims, spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data });
  };
  const disc = (i: number, j: number) => ((i - 10) ** 2 + (j - 10) ** 2 < 50 ? 800 : 20);

  it('a uniform phantom (no brain/background split): uses every voxel and says so', async () => {
    const look = lookAtRun(make([20, 20, 10, 30], () => 500, () => 5));
    expect(look.mask.voxels).toBe(4000);
    expect(look.skipped.map((s) => s.check)).toContain('automatic brain mask');
    expect(look.skipped.find((s) => s.check === 'automatic brain mask')!.how).toMatch(/--mask/);
  });

  it('all-zero slices: named as one finding, left out of the mask', () => {
    const run = make([20, 20, 10, 30], (i, j, k) => (k < 3 ? 0 : disc(i, j)), (_i, _j, k) => (k < 3 ? 0 : 5));
    const look = lookAtRun(run);
    const f = look.findings.find((x) => x.kind === 'empty-slices');
    expect(f?.slices).toEqual([0, 1, 2]);
    expect(look.findings[0].kind).toBe('empty-slices');
    for (let v = 0; v < 3 * 400; v++) expect(look.mask.mask[v]).toBe(0);
  });

  it('a single-slice (2D) run: runs, skips the slice checks and says why', async () => {
    const run = make([20, 20, 1, 30], (i, j) => disc(i, j), () => 5);
    const look = lookAtRun(run);
    expect(look.mask.voxels).toBeGreaterThan(100);
    expect(look.skipped.map((s) => s.check).join()).toMatch(/slice checks/);
    const { lookFigures } = await import('../../src/report/look-figures.js');
    expect((await lookFigures(run, look)).length).toBeGreaterThan(5); // figures draw one slice too
  }, 30000);
});
