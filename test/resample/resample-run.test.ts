import { afterAll, describe, expect, it } from 'vitest';
import { composeAffine, diagonalAffine, identityAffine, invertAffine, type Affine } from '../../src/core/affine.js';
import { BoldsweepError } from '../../src/core/errors.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { createRng } from '../../src/core/random.js';
import { resampleRun } from '../../src/resample/resample-run.js';
import { resampleVolume } from '../../src/resample/resample-volume.js';
import { targetGrid } from '../../src/resample/target-grid.js';
import { trilinearResample } from '../../src/resample/trilinear-resample.js';

afterAll(() => closeSharedWorkerPools());

function noisyRun(dims: [number, number, number, number], seed = 7): Volume {
  const rng = createRng(seed);
  const data = new Float32Array(dims[0] * dims[1] * dims[2] * dims[3]);
  for (let i = 0; i < data.length; i++) data[i] = 100 + 10 * rng.normal();
  // an oblique grid: 3 x 3 x 3.5 mm voxels, tilted 8 degrees about x
  const t = (8 * Math.PI) / 180;
  const tilt = new Float64Array([1, 0, 0, 0, 0, Math.cos(t), -Math.sin(t), 0, 0, Math.sin(t), Math.cos(t), 0, 0, 0, 0, 1]);
  return makeVolume({ dims, spacingMm: [3, 3, 3.5], trSec: 2, affine: composeAffine(tilt, diagonalAffine([3, 3, 3.5], [-30, -30, -20])), data });
}

function rotationZ(deg: number, centre: [number, number, number]): Affine {
  const t = (deg * Math.PI) / 180, c = Math.cos(t), s = Math.sin(t);
  const r = new Float64Array([c, -s, 0, 0, s, c, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]);
  const to = identityAffine(), back = identityAffine();
  to[3] = -centre[0]; to[7] = -centre[1]; to[11] = -centre[2];
  back[3] = centre[0]; back[7] = centre[1]; back[11] = centre[2];
  return composeAffine(back, composeAffine(r, to));
}

describe('resampleRun and resampleVolume', () => {
  const run = noisyRun([24, 22, 16, 12]);
  const rotation = rotationZ(4, [2, -1, 3]);

  it('give the same bytes in worker threads and in the calling thread, for every kernel', async () => {
    for (const kernel of ['nearest', 'linear', 'cubic', 'lanczos3'] as const) {
      const one = resampleVolume(run, { kernel, transform: rotation });
      const many = await resampleRun(run, { kernel, transform: rotation, workers: 2 });
      expect(Buffer.from(many.data.buffer, many.data.byteOffset, many.data.byteLength).equals(Buffer.from(one.data.buffer, one.data.byteOffset, one.data.byteLength))).toBe(true);
    }
  });

  it('give the same bytes in worker threads and in the calling thread on a run large enough for the workers, in every mode', async () => {
    // 64 x 64 x 16 x 16 = 1,048,576 output values: above RESAMPLE_RUN_IN_THREAD_BELOW, so resampleRun
    // really sends the volumes to worker threads (the run above stays in the calling thread)
    const big = noisyRun([64, 64, 16, 16], 5);
    const turn = rotationZ(3, [4, -2, 1]);
    for (const kernel of ['linear', 'cubic'] as const) {
      for (const mode of ['constant', 'nearest', 'mirror', 'reflect', 'wrap'] as const) {
        const one = resampleVolume(big, { kernel, transform: turn, mode });
        const many = await resampleRun(big, { kernel, transform: turn, mode, workers: 2 });
        expect(many.data.buffer).toBeInstanceOf(SharedArrayBuffer);
        expect(Buffer.from(many.data.buffer, many.data.byteOffset, many.data.byteLength).equals(Buffer.from(one.data.buffer, one.data.byteOffset, one.data.byteLength))).toBe(true);
      }
    }
  });

  it('linear resampling agrees with the phantom trilinear resampler (two routes to the same voxel map)', () => {
    const out = resampleVolume(run, { kernel: 'linear', transform: rotation, mode: 'nearest' });
    const n = 24 * 22 * 16;
    const srcFromOut = composeAffine(invertAffine(run.affine), composeAffine(rotation, run.affine));
    const ref = trilinearResample(run.data.subarray(0, n), [24, 22, 16], srcFromOut, [24, 22, 16], undefined, { mode: 'nearest' });
    // same float64 arithmetic in a different order: float32 output within 2 ulps near 100
    for (let p = 0; p < n; p++) expect(Math.abs(out.data[p] - ref[p])).toBeLessThan(2e-5);
  });

  it('perVolume affines move each volume by its own transform', async () => {
    const perVolume = Array.from({ length: 12 }, (_, t) => rotationZ(0.5 * t, [0, 0, 0]));
    const all = await resampleRun(run, { kernel: 'cubic', perVolume, workers: 2 });
    const n = 24 * 22 * 16;
    for (const t of [0, 5, 11]) {
      const single = resampleVolume(makeVolume({ ...run, dims: [24, 22, 16, 1], data: run.data.slice(n * t, n * (t + 1)) }), { kernel: 'cubic', transform: perVolume[t] });
      expect(Buffer.from(all.data.slice(n * t, n * (t + 1)).buffer).equals(Buffer.from(single.data.buffer))).toBe(true);
    }
  });

  it('a displacement field of one constant vector equals the translation affine', () => {
    const grid = targetGrid(run, { voxelSizeMm: 4 });
    const shift = [1.3, -0.7, 2.1];
    const nv = grid.dims[0] * grid.dims[1] * grid.dims[2];
    const vectorsMm = new Float32Array(3 * nv);
    for (let p = 0; p < nv; p++) vectorsMm.set(shift, 3 * p);
    const translation = identityAffine();
    translation[3] = shift[0]; translation[7] = shift[1]; translation[11] = shift[2];
    const a = resampleVolume(run, { kernel: 'cubic', grid, transform: translation });
    const b = resampleVolume(run, { kernel: 'cubic', grid, transform: { grid, vectorsMm } });
    // the field goes through float32 and is added per voxel: 1e-4 on values near 100
    for (let p = 0; p < a.data.length; p++) expect(Math.abs(a.data[p] - b.data[p])).toBeLessThan(1e-4);
    expect(a.dims).toEqual([...grid.dims, 12]);
  });

  it('the input is not modified', () => {
    const copy = run.data.slice();
    resampleVolume(run, { kernel: 'lanczos3', transform: rotation, mode: 'reflect' });
    expect(Buffer.from(run.data.buffer).equals(Buffer.from(copy.buffer))).toBe(true);
  });
});

describe('targetGrid', () => {
  const run = noisyRun([24, 22, 16, 1]);
  it("the run's own voxel size gives the run's grid, bit for bit", () => {
    const g = targetGrid(run, { voxelSizeMm: [3, 3, 3.5] });
    expect(g.dims).toEqual([24, 22, 16]);
    expect(Array.from(g.affine)).toEqual(Array.from(run.affine));
  });
  it('a coarser grid covers the same field of view around the same centre', () => {
    const g = targetGrid(run, { voxelSizeMm: 2 });
    expect(g.dims).toEqual([36, 33, 28]);
    const centre = (a: Affine, d: number[]) => [0, 1, 2].map((r) => a[4 * r] * (d[0] - 1) / 2 + a[4 * r + 1] * (d[1] - 1) / 2 + a[4 * r + 2] * (d[2] - 1) / 2 + a[4 * r + 3]);
    const c0 = centre(run.affine, [24, 22, 16]), c1 = centre(g.affine, g.dims);
    for (let d = 0; d < 3; d++) expect(c1[d]).toBeCloseTo(c0[d], 9);
  });
  it('an axis-aligned 2 mm affine is kept as a lattice and sized to cover the tilted field of view', () => {
    const g = targetGrid(run, { affine: diagonalAffine([2, 2, 2]) });
    for (const i of [0, 5, 10]) expect(g.affine[i]).toBe(2);
    for (const t of [3, 7, 11]) expect(Number.isInteger(g.affine[t] / 2)).toBe(true);
    // along x the field of view runs from -31.5 to 40.5 mm: 2 mm voxels centred on even mm that
    // overlap it are -32 .. 40 mm, 37 of them
    expect(g.dims[0]).toBe(37);
    expect(g.dims[1]).toBeGreaterThanOrEqual(Math.ceil((66 * Math.cos(0.1396) + 56 * Math.sin(0.1396)) / 2));
  });
});

describe('bad input: typed errors that say what to do', () => {
  const run = noisyRun([8, 8, 6, 2]);
  const code = (f: () => unknown) => { try { f(); } catch (e) { expect(e).toBeInstanceOf(BoldsweepError); return (e as BoldsweepError).code; } return 'none'; };
  it('refuses an absurd target grid before allocating it', () => {
    expect(code(() => targetGrid(run, { voxelSizeMm: 0.0001 }))).toBe('TARGET_GRID_TOO_LARGE');
    expect(code(() => resampleVolume(run, { kernel: 'linear', grid: { dims: [40000, 40000, 40000], affine: identityAffine() } }))).toBe('TARGET_GRID_TOO_LARGE');
    expect(code(() => resampleVolume(run, { kernel: 'linear', grid: { dims: [2000, 2000, 2000], affine: identityAffine() } }))).toBe('TARGET_GRID_TOO_LARGE');
  });
  it('refuses a singular affine (transform, target grid, target lattice)', () => {
    const flat = identityAffine(); flat[10] = 0;
    expect(code(() => resampleVolume(run, { kernel: 'linear', transform: flat }))).toBe('SINGULAR_TRANSFORM');
    expect(code(() => resampleVolume(run, { kernel: 'linear', grid: { dims: [8, 8, 6], affine: flat } }))).toBe('SINGULAR_TRANSFORM');
    expect(code(() => targetGrid(run, { affine: flat }))).toBe('SINGULAR_TRANSFORM');
    const nan = identityAffine(); nan[3] = NaN;
    expect(code(() => resampleVolume(run, { kernel: 'linear', transform: nan }))).toBe('SINGULAR_TRANSFORM');
  });
  it('refuses a displacement field on another grid', () => {
    const other = targetGrid(run, { voxelSizeMm: 2 });
    const vectorsMm = new Float32Array(3 * other.dims[0] * other.dims[1] * other.dims[2]);
    expect(code(() => resampleVolume(run, { kernel: 'linear', transform: { grid: other, vectorsMm } }))).toBe('GRID_MISMATCH');
  });
  it('refuses an unknown kernel and lists the known ones', () => {
    expect(() => resampleVolume(run, { kernel: 'bicubic' as never })).toThrow(/nearest, linear, cubic, lanczos3/);
    expect(code(() => resampleVolume(run, { kernel: 'bicubic' as never }))).toBe('UNKNOWN_KERNEL');
    expect(code(() => resampleVolume(run, { kernel: 'linear', mode: 'grid-wrap' as never }))).toBe('INVALID_ARGUMENT');
  });
  it('refuses NaNs in the run, naming the first voxel and the way out', () => {
    const data = run.data.slice(); data[8 * 8 * 6 + 3] = NaN;
    const bad = makeVolume({ ...run, data });
    expect(code(() => resampleVolume(bad, { kernel: 'cubic' }))).toBe('NON_FINITE_VOXELS');
    expect(() => resampleVolume(bad, { kernel: 'cubic' })).toThrow(/voxel \[3, 0, 0\] of volume 1.*nonFinite: 'zero'/);
  });
  it('refuses NaN and Inf found by the worker threads (each scans its own volumes), naming the first and counting all', async () => {
    // above RESAMPLE_RUN_IN_THREAD_BELOW output values, so the volumes go to worker threads
    const big = noisyRun([64, 64, 16, 16], 11);
    const n = 64 * 64 * 16;
    big.data[12 * n + 5] = Infinity; big.data[9 * n + 64 + 2] = NaN; big.data[9 * n + 70] = -Infinity;
    const err = await resampleRun(big, { kernel: 'linear', workers: 2 }).then(() => null, (e: unknown) => e);
    expect(err).toBeInstanceOf(BoldsweepError);
    expect((err as BoldsweepError).code).toBe('NON_FINITE_VOXELS');
    expect((err as BoldsweepError).message).toMatch(/holds 3 NaN or infinite values \(first at voxel \[2, 1, 0\] of volume 9\)/);
  });
});
