import { isMainThread } from 'node:worker_threads';
import { composeAffine, invertAffine, type Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Volume } from '../core/volume.js';
import { defaultWorkerCount, sharedWorkerPool } from '../core/worker-pool.js';
import type { NonFiniteScan } from '../io/non-finite.js';
import { checkInvertible } from './target-grid.js';
import { planResample, type ResampleOptions } from './plan-resample.js';
import { checkFiniteRun, volumeOnTarget } from './resample-volume.js';
import { resampleVolumesTask, type ResampleVolumesTask } from './resample-volumes-task.js';

/** Options of {@link resampleRun}. */
export interface ResampleRunOptions extends ResampleOptions {
  /**
   * One target world -> source world affine per volume (e.g. each volume's head pose, inverted),
   * used instead of `transform`. __Default value:__ none (every volume uses `transform`)
   */
  perVolume?: readonly Affine[];
  /**
   * Worker threads; 1 = the calling thread only. __Default value:__ the number of cores from the
   * main thread, 1 inside a worker thread.
   */
  workers?: number;
}

/** Below this many output values the run is resampled in the calling thread (thread start-up would dominate). */
export const RESAMPLE_RUN_IN_THREAD_BELOW = 1_000_000;

/**
 * Resample every volume of a run onto a grid, in parallel over volumes on worker threads (the run
 * is copied once into shared memory, workers write straight into a shared output). Same bytes for
 * any number of workers.
 * @param run - the run (not modified)
 * @param options - grid, kernel, mode, cval, transform or perVolume, workers
 * @returns a new run on the target grid (its data over a SharedArrayBuffer when workers were used)
 * @throws BoldsweepError as resampleVolume; INVALID_ARGUMENT for a perVolume list of the wrong length,
 *   combined with `transform`, or a bad worker count; WORKER_SCRIPT_MISSING when the package is not built
 * @example const onTwoMm = await resampleRun(run.volume, { kernel: 'linear', grid: targetGrid(runGrid, { voxelSizeMm: 2 }) })
 */
export async function resampleRun(run: Volume, options: ResampleRunOptions): Promise<Volume> {
  const nt = run.dims[3];
  const workers = options.workers ?? (isMainThread ? defaultWorkerCount() : 1);
  if (!Number.isInteger(workers) || workers < 1) fail('INVALID_ARGUMENT', `workers must be a positive integer, got ${workers}`);
  const source = { dims: [run.dims[0], run.dims[1], run.dims[2]] as [number, number, number], affine: run.affine };
  if (options.perVolume && options.transform !== undefined) fail('INVALID_ARGUMENT', 'give either transform or perVolume, not both');
  if (options.perVolume && options.perVolume.length !== nt) fail('INVALID_ARGUMENT', `perVolume has ${options.perVolume.length} affines, the run has ${nt} volumes`);
  const plan = planResample(source, options, nt);
  let maps: Affine[] = [plan.srcFromOut];
  if (options.perVolume) {
    const sourceFromWorld = invertAffine(run.affine);
    maps = options.perVolume.map((a, t) => {
      checkInvertible(a, `perVolume[${t}] (target world -> source world)`);
      return composeAffine(sourceFromWorld, composeAffine(a, plan.grid.affine));
    });
  }
  const [ox, oy, oz] = plan.grid.dims;
  const m = ox * oy * oz;
  const base: Omit<ResampleVolumesTask, 'input' | 'output' | 'tStart' | 'tEnd'> = {
    sourceDims: plan.sourceDims, outDims: plan.grid.dims, srcFromOut: maps, displacementVox: plan.displacementVox,
    kernel: plan.kernel, mode: plan.mode, cval: plan.cval,
  };
  if (workers === 1 || nt < 2 || m * nt < RESAMPLE_RUN_IN_THREAD_BELOW) {
    checkFiniteRun(run);
    const output = new Float32Array(m * nt);
    resampleVolumesTask({ ...base, input: run.data, output, tStart: 0, tEnd: nt });
    return volumeOnTarget(plan, run, output);
  }
  const n = plan.sourceDims[0] * plan.sourceDims[1] * plan.sourceDims[2];
  const alreadyShared = run.data.buffer instanceof SharedArrayBuffer;
  const input = alreadyShared ? run.data : new Float32Array(new SharedArrayBuffer(n * nt * 4));
  const output = new Float32Array(new SharedArrayBuffer(m * nt * 4));
  let displacementVox = plan.displacementVox;
  if (displacementVox) {
    const shared = new Float32Array(new SharedArrayBuffer(displacementVox.byteLength));
    shared.set(displacementVox);
    displacementVox = shared;
  }
  // the workers scan their own volumes for NaN/Inf (resampleCheckedVolumes) and the run is refused after
  const pool = sharedWorkerPool<ResampleVolumesTask, NonFiniteScan>(new URL('./resample-worker.js', import.meta.url), workers);
  // several chunks per worker so a slow thread does not hold up the end; each chunk is copied into
  // shared memory just before it is queued, so workers start while the rest is still being copied
  const chunk = Math.max(1, Math.ceil(nt / (workers * 4)));
  const jobs: Promise<NonFiniteScan>[] = [];
  for (let t = 0; t < nt; t += chunk) {
    const tEnd = Math.min(nt, t + chunk);
    if (!alreadyShared) input.set(run.data.subarray(t * n, tEnd * n), t * n);
    jobs.push(pool.run({ ...base, displacementVox, input, output, tStart: t, tEnd }));
  }
  const scans = await Promise.all(jobs);
  const bad = scans.filter((s) => s.count > 0);
  if (bad.length > 0) checkFiniteRun(run, { count: bad.reduce((a, s) => a + s.count, 0), firstIndex: Math.min(...bad.map((s) => s.firstIndex)) });
  return volumeOnTarget(plan, run, output);
}
