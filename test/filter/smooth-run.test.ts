import { afterAll, describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { closeSharedWorkerPools, createWorkerPool, resolveWorkerScript } from '../../src/core/worker-pool.js';
import { smoothVolume3d } from '../../src/filter/gaussian-smooth.js';
import { SMOOTH_RUN_IN_THREAD_BELOW, smoothRun } from '../../src/filter/smooth-run.js';

// Worker threads run the compiled files under dist/: `npm test` builds first (npm run build).

function randomRun(dims: [number, number, number, number], seed: number): Volume {
  const data = new Float32Array(dims[0] * dims[1] * dims[2] * dims[3]);
  createRng(seed).fillNormal(data, 1000, 50);
  return makeVolume({ dims, spacingMm: [3, 3, 3.5], trSec: 2, affine: identityAffine(), data });
}

function ellipsoidMask(nx: number, ny: number, nz: number): Uint8Array {
  const m = new Uint8Array(nx * ny * nz);
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    if (((i - nx / 2) / (nx / 2.5)) ** 2 + ((j - ny / 2) / (ny / 2.5)) ** 2 + ((k - nz / 2) / (nz / 2.5)) ** 2 <= 1) m[i + nx * (j + ny * k)] = 1;
  }
  return m;
}

function sameBytes(a: Float32Array, b: Float32Array): boolean {
  const x = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  const y = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  if (x.length !== y.length) return false;
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
  return true;
}

afterAll(async () => { await closeSharedWorkerPools(); });

describe('smoothRun', () => {
  const big = randomRun([40, 40, 30, 45], 7); // 2.16 M voxel-volumes: above the in-thread limit
  it('uses a run large enough to need workers', () => {
    expect(big.data.length).toBeGreaterThan(SMOOTH_RUN_IN_THREAD_BELOW);
  });
  it('worker path gives the same bytes as the main-thread path', async () => {
    const before = Float32Array.from(big.data);
    const one = await smoothRun(big, { fwhmMm: 6, workers: 1 });
    const two = await smoothRun(big, { fwhmMm: 6, workers: 2 });
    expect(two.data.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(sameBytes(one.data, two.data)).toBe(true);
    expect(sameBytes(big.data, before)).toBe(true); // input untouched
  });
  it('worker path with a mask and another mode gives the same bytes', async () => {
    const mask = ellipsoidMask(40, 40, 30);
    const one = await smoothRun(big, { fwhmMm: 8, mode: 'nearest', mask, workers: 1 });
    const two = await smoothRun(big, { fwhmMm: 8, mode: 'nearest', mask, workers: 2 });
    expect(sameBytes(one.data, two.data)).toBe(true);
  });
  it('writes into a given out array (shared: in place by the workers; plain: copied once)', async () => {
    const ref = await smoothRun(big, { fwhmMm: 6, workers: 1 });
    const shared = new Float32Array(new SharedArrayBuffer(big.data.length * 4));
    const a = await smoothRun(big, { fwhmMm: 6, workers: 2, out: shared });
    expect(a.data).toBe(shared);
    expect(sameBytes(shared, ref.data)).toBe(true);
    const plain = new Float32Array(big.data.length);
    const b = await smoothRun(big, { fwhmMm: 6, workers: 2, out: plain });
    expect(b.data).toBe(plain);
    expect(sameBytes(plain, ref.data)).toBe(true);
    // a view overlapping the input without being it would be overwritten before it is read
    const overlapping = new Float32Array(big.data.length + 10);
    overlapping.set(big.data);
    const shifted = makeVolume({ ...big, data: overlapping.subarray(0, big.data.length) });
    await expect(smoothRun(shifted, { fwhmMm: 6, out: overlapping.subarray(10) })).rejects.toSatisfy((e) => isBoldsweepError(e, 'INVALID_ARGUMENT'));
  });
  it('smooths in place when out is the input itself (one thread, and workers on shared memory)', async () => {
    const ref = await smoothRun(big, { fwhmMm: 6, workers: 1 });
    const plain = makeVolume({ ...big, data: Float32Array.from(big.data) });
    const a = await smoothRun(plain, { fwhmMm: 6, workers: 1, out: plain.data });
    expect(a.data).toBe(plain.data);
    expect(sameBytes(plain.data, ref.data)).toBe(true);
    const shared = new Float32Array(new SharedArrayBuffer(big.data.length * 4));
    shared.set(big.data);
    const b = await smoothRun(makeVolume({ ...big, data: shared }), { fwhmMm: 6, workers: 2, out: shared });
    expect(b.data).toBe(shared);
    expect(sameBytes(shared, ref.data)).toBe(true);
  });
  it('FWHM 0 without a mask copies the run (the same bytes as the identity kernel), and does nothing in place', async () => {
    const small = randomRun([12, 10, 8, 5], 4);
    const copy = await smoothRun(small, { fwhmMm: 0 });
    expect(copy.data).not.toBe(small.data);
    expect(sameBytes(copy.data, small.data)).toBe(true);
    const n = 12 * 10 * 8;
    // the identity kernel through the convolution code (one volume at a time) gives these bytes too
    for (let t = 0; t < 5; t++) expect(sameBytes(smoothVolume3d(small.data.subarray(n * t, n * (t + 1)), [12, 10, 8], small.spacingMm, 0), small.data.subarray(n * t, n * (t + 1)))).toBe(true);
    const before = Float32Array.from(small.data);
    const same = await smoothRun(small, { fwhmMm: 0, out: small.data });
    expect(same.data).toBe(small.data);
    expect(sameBytes(small.data, before)).toBe(true);
  });
  it('equals smoothVolume3d applied volume by volume', async () => {
    const small = randomRun([12, 10, 8, 5], 3);
    const res = await smoothRun(small, { fwhmMm: 7 });
    const n = 12 * 10 * 8;
    for (let t = 0; t < 5; t++) {
      const ref = smoothVolume3d(small.data.subarray(n * t, n * (t + 1)), [12, 10, 8], small.spacingMm, 7);
      expect(sameBytes(res.data.subarray(n * t, n * (t + 1)), ref)).toBe(true);
    }
    expect(res.dims).toEqual(small.dims);
    expect(res.trSec).toBe(2);
  });
  it('rejects a bad worker count and a mask of another size', async () => {
    const small = randomRun([6, 6, 6, 2], 1);
    await expect(smoothRun(small, { fwhmMm: 6, workers: 0 })).rejects.toSatisfy((e) => isBoldsweepError(e, 'INVALID_ARGUMENT'));
    await expect(smoothRun(small, { fwhmMm: 6, mask: new Uint8Array(5) })).rejects.toSatisfy((e) => isBoldsweepError(e, 'GRID_MISMATCH'));
  });
});

describe('worker pool', () => {
  it('resolves a worker script under src/ to the compiled file under dist/', () => {
    const url = resolveWorkerScript(new URL('../../src/filter/smooth-worker.js', import.meta.url));
    expect(url.pathname).toMatch(/\/dist\/src\/filter\/smooth-worker\.js$/);
  });
  it('fails with WORKER_SCRIPT_MISSING for a script that exists nowhere', () => {
    try {
      resolveWorkerScript(new URL('../../src/steps/no-such-worker.js', import.meta.url));
      expect.unreachable();
    } catch (e) { expect(isBoldsweepError(e, 'WORKER_SCRIPT_MISSING')).toBe(true); }
  });
  it('passes a worker error back to the caller and keeps serving', async () => {
    const pool = createWorkerPool<unknown, number>(new URL('../../src/filter/smooth-worker.js', import.meta.url), { size: 1 });
    try {
      await expect(pool.run({ bogus: true })).rejects.toBeInstanceOf(Error);
      const input = new Float32Array(new SharedArrayBuffer(8 * 4)).fill(2);
      const output = new Float32Array(new SharedArrayBuffer(8 * 4));
      const k = Float64Array.of(0.25, 0.5, 0.25);
      const done = await pool.run({ input, output, dims: [2, 2, 2], mode: 'reflect', kernels: [k, k, k], mask: null, maskWeights: null, tStart: 0, tEnd: 1 });
      expect(done).toBe(1);
      expect(Array.from(output)).toEqual(new Array(8).fill(2)); // constant stays constant under 'reflect'
    } finally {
      await pool.close();
    }
  });
});
