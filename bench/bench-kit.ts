/**
 * Helpers shared by the bench scripts: where the package lives, the median used for every timing,
 * a warm-up-then-median timer, and the seeded "head" run most benches work on.
 * This file has no `main`, so bench/run-all.ts imports it and runs nothing.
 */
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { diagonalAffine } from '../src/core/affine.js';
import { createRng } from '../src/core/random.js';
import { makeVolume, type Dims4, type Volume } from '../src/core/volume.js';

/**
 * The package root: the first folder above this file holding package.json, so the same code works
 * from bench/ (ts) and dist/bench/ (compiled).
 * @returns absolute path of the package root
 * @example const script = join(packageRoot(), 'bench', 'reference', 'smooth_scipy.py')
 */
export function packageRoot(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  while (!existsSync(join(dir, 'package.json'))) dir = dirname(dir);
  return dir;
}

/**
 * The median as the benches have always taken it: the element at index floor(n/2) of the sorted
 * values (for an even count the upper of the two middle values; the benches use odd counts).
 * @param xs - values; not modified
 * @returns the median
 * @example median([0.3, 0.1, 0.2]) // 0.2
 */
export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** How {@link timeMedianSec} repeats a call. */
export interface TimingOptions {
  /** Timed calls whose median is returned. __Default value:__ 5 */
  repeats?: number;
  /** Untimed calls first (JIT compilation, worker start-up, first touch of memory). __Default value:__ 1 */
  warmUp?: number;
}

/**
 * Median wall-clock seconds of `repeats` calls of `fn` after `warmUp` untimed calls. A promise
 * returned by `fn` is awaited inside the timed span; a plain value is not awaited, so a synchronous
 * `fn` is timed without a trip through the microtask queue.
 * @param fn - the work to time (its result is ignored; capture it in the closure if needed)
 * @param options - repeats (default 5) and warm-up calls (default 1)
 * @returns the median time in seconds
 * @example const sec = await timeMedianSec(() => fitGlm(run, design), { repeats: 5, warmUp: 1 })
 */
export async function timeMedianSec(fn: () => unknown, options: TimingOptions = {}): Promise<number> {
  const { repeats = 5, warmUp = 1 } = options;
  for (let w = 0; w < warmUp; w++) await settle(fn());
  const times: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = process.hrtime.bigint();
    const result = fn();
    if (isThenable(result)) await result;
    times.push(Number(process.hrtime.bigint() - t0) / 1e9);
  }
  return median(times);
}

function isThenable(x: unknown): x is PromiseLike<unknown> {
  return typeof (x as PromiseLike<unknown> | null)?.then === 'function';
}

async function settle(x: unknown): Promise<void> {
  if (isThenable(x)) await x;
}

/**
 * A smooth ellipsoidal "head" on a voxel raster: 1000 * (1 - 0.3 r^2) inside the ellipsoid
 * (r^2 <= 1, so 700..1000) and 20 outside. The ellipsoid sits at the grid centre with semi-axes
 * 26/64, 30/64 and 16/36 of the grid's extent along x, y, z (26, 30 and 16 voxels on 64 x 64 x 36).
 * @param dims - [nx, ny, nz, ...]; entries past the third are ignored
 * @returns one volume, x fastest
 * @example const base = ellipsoidHeadBase([64, 64, 36])
 */
export function ellipsoidHeadBase(dims: readonly [number, number, number, ...number[]]): Float32Array {
  const [nx, ny, nz] = dims;
  const [cx, cy, cz] = [(nx - 1) / 2, (ny - 1) / 2, (nz - 1) / 2];
  const [rx, ry, rz] = [(nx * 26) / 64, (ny * 30) / 64, (nz * 16) / 36];
  const base = new Float32Array(nx * ny * nz);
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const r2 = ((i - cx) / rx) ** 2 + ((j - cy) / ry) ** 2 + ((k - cz) / rz) ** 2;
    base[i + nx * (j + ny * k)] = r2 <= 1 ? 1000 * (1 - 0.3 * r2) : 20;
  }
  return base;
}

/** What {@link noisyHeadRun} builds. */
export interface NoisyHeadRunOptions {
  /** [nx, ny, nz, nt] */
  dims: Dims4;
  /** Voxel size in mm; the affine is diagonal with these spacings and origin 0. */
  spacingMm: [number, number, number];
  /** Seed of the MT19937 stream the noise is drawn from (one fillNormal over the whole run). */
  seed: number;
  /** Standard deviation of the Gaussian noise (mean 0). */
  noiseSd: number;
  /** Repetition time in seconds. */
  trSec: number;
  /**
   * Factor on the head in volume t, for a bench that needs a response in the data: volume t is
   * noise + head * headScaleAt(t), in that arithmetic. __Default value:__ 1 for every volume
   */
  headScaleAt?: (t: number) => number;
}

/**
 * A seeded run: {@link ellipsoidHeadBase} in every volume plus Gaussian noise, all float32.
 * The noise fills the whole run from one stream first, then the head is added volume by volume.
 * @param options - grid, seed, noise and timing of the run (see {@link NoisyHeadRunOptions})
 * @returns a new run
 * @example const run = noisyHeadRun({ dims: [64, 64, 36, 200], spacingMm: [3, 3, 3], seed: 20240601, noiseSd: 20, trSec: 2 })
 */
export function noisyHeadRun(options: NoisyHeadRunOptions): Volume {
  const { dims, spacingMm, seed, noiseSd, trSec, headScaleAt } = options;
  const [nx, ny, nz, nt] = dims;
  const n = nx * ny * nz;
  const base = ellipsoidHeadBase(dims);
  const data = new Float32Array(n * nt);
  createRng(seed).fillNormal(data, 0, noiseSd);
  for (let t = 0; t < nt; t++) {
    const offset = t * n;
    if (headScaleAt === undefined) {
      for (let v = 0; v < n; v++) data[offset + v] += base[v];
    } else {
      const scale = headScaleAt(t);
      for (let v = 0; v < n; v++) data[offset + v] += base[v] * scale;
    }
  }
  return makeVolume({ dims, spacingMm, trSec, affine: diagonalAffine(spacingMm), data });
}
