import { isMainThread } from 'node:worker_threads';
import { fail } from '../core/fail.js';
import { makeVolume, voxelsPerVolume, type Volume } from '../core/volume.js';
import { defaultWorkerCount, sharedWorkerPool } from '../core/worker-pool.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { planGaussianSmooth } from './gaussian-smooth.js';
import { smoothVolumesTask, type SmoothVolumesTask } from './smooth-volumes-task.js';

/** Options of {@link smoothRun}. */
export interface SmoothRunOptions {
  /** Kernel FWHM in mm (0 = copy unchanged), one number or one per axis. */
  fwhmMm: number | readonly [number, number, number];
  /** Boundary mode. __Default value:__ `'reflect'` (scipy.ndimage's half-sample symmetric). */
  mode?: BoundaryMode;
  /** Smooth inside this mask by normalised convolution; outside becomes 0. __Default value:__ none. */
  mask?: Uint8Array;
  /** Standard deviations kept each side. __Default value:__ 4. */
  truncate?: number;
  /**
   * Worker threads; 1 = the calling thread only. __Default value:__ the number of cores
   * (os.availableParallelism()) from the main thread, 1 inside a worker thread (a sweep's workers
   * must not each start their own).
   */
  workers?: number;
  /**
   * Where to write the smoothed run (length nx*ny*nz*nt), e.g. a buffer reused across a sweep. It
   * may be the input's own array (smoothing in place: the caller gives up the input; each volume is
   * read whole before it is overwritten), but no other view that overlaps it. Workers write into it
   * directly when it lives in a SharedArrayBuffer; otherwise the result is copied into it once at
   * the end. __Default value:__ a new array.
   */
  out?: Float32Array;
}

/**
 * Below this many voxels x volumes the run is smoothed in the main thread: starting threads (tens
 * of ms, once per process) and copying into shared memory would cost more than the work itself
 * (about 5 ms per million voxels at 6 mm FWHM and 3 mm voxels on one core).
 */
export const SMOOTH_RUN_IN_THREAD_BELOW = 2_000_000;

/**
 * Smooth every volume of a run with the same 3D Gaussian kernel, in parallel across volumes.
 * A FWHM of 0 (no mask) copies the run unchanged (into `out` when given; nothing when `out` is the
 * input itself).
 * With workers > 1 the input is copied once into shared memory (not at all when it already lives
 * there) and the workers write the result in place into a shared output buffer: no per-volume
 * copies. The result's `data` is then a Float32Array over a SharedArrayBuffer. Worker and
 * main-thread paths run the same code and give identical bytes. Small runs stay in the main thread
 * (see {@link SMOOTH_RUN_IN_THREAD_BELOW}).
 * @param volume - the run (not modified, unless `out` is its own array)
 * @param options - fwhmMm, mode, mask, truncate, workers, out
 * @returns a new volume with the same grid, TR and affine (its data is `out` when given)
 * @throws BoldsweepError INVALID_ARGUMENT for bad widths or worker counts, or an `out` that partly overlaps the
 *   input; GRID_MISMATCH for a mask of another size;
 *   WORKER_SCRIPT_MISSING when workers are needed but the package is not built
 * @example const smoothed = await smoothRun(run.volume, { fwhmMm: 6, mask })
 */
export async function smoothRun(volume: Volume, options: SmoothRunOptions): Promise<Volume> {
  const [nx, ny, nz, nt] = volume.dims;
  const workers = options.workers ?? (isMainThread ? defaultWorkerCount() : 1);
  if (!Number.isInteger(workers) || workers < 1) fail('INVALID_ARGUMENT', `workers must be a positive integer, got ${workers}`);
  const plan = planGaussianSmooth([nx, ny, nz], volume.spacingMm, options.fwhmMm, options);
  const n = voxelsPerVolume(volume);
  const total = n * nt;
  const base: Omit<SmoothVolumesTask, 'input' | 'output' | 'tStart' | 'tEnd'> = {
    dims: plan.dims, mode: plan.mode, kernels: plan.kernels, mask: plan.mask, maskWeights: plan.maskWeights,
  };
  const like = { dims: [nx, ny, nz, nt] as Volume['dims'], spacingMm: [...volume.spacingMm] as Volume['spacingMm'], trSec: volume.trSec, affine: new Float64Array(volume.affine) };

  if (options.out && options.out.length !== total) fail('INVALID_ARGUMENT', `out has ${options.out.length} values, the run has ${total}`);
  if (options.out && options.out !== volume.data && overlaps(options.out, volume.data)) fail('INVALID_ARGUMENT', 'out overlaps the input run without being the same array (pass the input itself to smooth in place)');
  if (plan.kernels.every((k) => k.length === 1) && !plan.mask) {
    // every kernel is the identity (FWHM 0, or narrower than the sampling): the result is the input,
    // so copy it (nothing to do in place); the kernels would give the same values
    const output = options.out ?? new Float32Array(total);
    if (output !== volume.data) output.set(volume.data);
    return makeVolume({ ...like, data: output });
  }
  if (workers === 1 || nt < 2 || total < SMOOTH_RUN_IN_THREAD_BELOW) {
    const output = options.out ?? new Float32Array(total);
    smoothVolumesTask({ ...base, input: volume.data, output, tStart: 0, tEnd: nt });
    return makeVolume({ ...like, data: output });
  }

  const alreadyShared = volume.data.buffer instanceof SharedArrayBuffer;
  const input = alreadyShared ? volume.data : new Float32Array(new SharedArrayBuffer(total * 4));
  const outShared = options.out !== undefined && options.out.buffer instanceof SharedArrayBuffer;
  const output = outShared ? (options.out as Float32Array) : new Float32Array(new SharedArrayBuffer(total * 4));
  const shared = { ...base, mask: plan.mask && sharedCopy(plan.mask), maskWeights: plan.maskWeights && sharedCopy(plan.maskWeights) };
  const pool = sharedWorkerPool<SmoothVolumesTask, number>(new URL('./smooth-worker.js', import.meta.url), workers);
  // several chunks per worker so a slow thread does not hold up the end; each chunk is copied into
  // shared memory just before it is queued, so workers start while the rest is still being copied
  const chunk = Math.max(1, Math.ceil(nt / (workers * 4)));
  const jobs: Promise<number>[] = [];
  for (let t = 0; t < nt; t += chunk) {
    const tEnd = Math.min(nt, t + chunk);
    if (!alreadyShared) input.set(volume.data.subarray(t * n, tEnd * n), t * n);
    jobs.push(pool.run({ ...shared, input, output, tStart: t, tEnd }));
  }
  await Promise.all(jobs);
  if (options.out && !outShared) {
    options.out.set(output);
    return makeVolume({ ...like, data: options.out });
  }
  return makeVolume({ ...like, data: output });
}

/** Whether two arrays share any byte of memory. */
function overlaps(a: Float32Array, b: Float32Array): boolean {
  if (a.buffer !== b.buffer) return false;
  return a.byteOffset < b.byteOffset + b.byteLength && b.byteOffset < a.byteOffset + a.byteLength;
}

/** A copy of a typed array in shared memory (workers see it without copying). */
function sharedCopy<A extends Float32Array | Float64Array | Uint8Array>(a: A): A {
  const C = a.constructor as new (b: SharedArrayBuffer) => A;
  const out = new C(new SharedArrayBuffer(a.byteLength));
  out.set(a as never);
  return out;
}
