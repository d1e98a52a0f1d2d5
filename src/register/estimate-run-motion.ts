import { isMainThread } from 'node:worker_threads';
import type { Affine, Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';
import type { Volume } from '../core/volume.js';
import { defaultWorkerCount, sharedWorkerPool } from '../core/worker-pool.js';
import { gridCentreMm } from '../acquire/grid-centre-mm.js';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { AFFINE_MOTION_COLUMNS, type AffineMotionRow } from '../io/motion-table-tsv.js';
import { meanImage } from '../look/mean-image.js';
import { scanNonFinite } from '../io/non-finite.js';
import { leastMovingVolume } from './least-moving-volume.js';
import { motionParametersAffine } from './motion-parameters-affine.js';
import { registerVolumesTask, type RegisterVolumesResult, type RegisterVolumesTask } from './register-volumes-task.js';
import { REGISTRATION_COSTS, REGISTRATION_MODELS, type RegisterOptions, type RegistrationCost, type RegistrationModel } from './registration-types.js';

/**
 * The volume every other is registered to: `first`, `middle` (index floor(nt / 2)), `mean` (the
 * run's mean image), `least-moving` (a first pass to the mean, then the volume with the least summed
 * displacement to all others, leastMovingVolume), or a 0-based volume index.
 */
export type MotionReference = 'first' | 'middle' | 'mean' | 'least-moving' | number;

/** The named references, for validation and schemas. */
export const MOTION_REFERENCES: readonly string[] = ['first', 'middle', 'mean', 'least-moving'];

/** Options of {@link estimateRunMotion}. */
export interface RunMotionOptions extends Omit<RegisterOptions, 'initialParameters' | 'label' | 'mask'> {
  /** The reference. __Default value:__ `'first'` */
  reference?: MotionReference;
  /** Weights on the run's grid (e.g. a brain mask). __Default value:__ every voxel */
  mask?: Uint8Array | Float32Array | null;
  /** Worker threads; 1 = the calling thread. __Default value:__ the cores from the main thread, 1 inside a worker */
  workers?: number;
}

/** A run's motion estimate. */
export interface RunMotion {
  /** One row per volume: shifts (mm) and rotations (degrees), plus scales and shears for the affine model. */
  rows: (MotionRow | AffineMotionRow)[];
  /** Per volume, reference world (mm) -> that volume's world (mm): the head's pose (resampleRun's `perVolume`). */
  transforms: Affine[];
  /** The reference volume's index, or null when the reference is the mean image. */
  referenceIndex: number | null;
  /** The reference as asked. */
  reference: MotionReference;
  /** Final cost per volume (0 for the reference volume itself). */
  costs: Float64Array;
  /** Iterations per level per volume (empty for the reference volume). */
  iterations: number[][];
  model: RegistrationModel;
  cost: RegistrationCost;
  centreMm: Vec3;
  levels: number[];
}

/** Below this many voxel-volumes the run is registered in the calling thread (thread start-up would dominate). */
export const RUN_MOTION_IN_THREAD_BELOW = 1_000_000;


/** Volumes in the order each is registered: outwards from the reference, in chunks. */
function chunksFrom(ref: number | null, nt: number, chunks: number): number[][] {
  const after = ref === null ? Array.from({ length: nt }, (_, t) => t) : Array.from({ length: nt - ref - 1 }, (_, i) => ref + 1 + i);
  const before = ref === null ? [] : Array.from({ length: ref }, (_, i) => ref - 1 - i);
  const out: number[][] = [];
  for (const list of [after, before]) {
    if (list.length === 0) continue;
    const share = Math.max(1, Math.round((chunks * list.length) / Math.max(1, after.length + before.length)));
    const size = Math.ceil(list.length / share);
    for (let i = 0; i < list.length; i += size) out.push(list.slice(i, i + size));
  }
  return out;
}

/**
 * Estimate the head motion of a run: every volume registered to a reference (registerImagePair's
 * engine, same options), in parallel over volumes on worker threads (volumes in chunks going
 * outwards from the reference; within a chunk each volume starts from the previous one's estimate).
 * The reference volume itself gets the identity. The rows are in the motion-table convention (the
 * pose of each volume relative to the reference: p' = R (p - c) + c + t), so `transforms[t]` maps the
 * reference world to volume t's world, the `perVolume` resampleRun needs to bring volume t back.
 * @param run - the 4D run (not modified)
 * @param options - reference, model, cost, levels, finestFwhmVoxels, centreMm (default the grid centre),
 *   mask (run grid), bins, toleranceMm, maxIterations, workers
 * @returns the motion table rows, the transforms, the reference index, costs and iterations
 * @throws BoldsweepError TOO_FEW_VOLUMES (a run of one volume), MOTION_REFERENCE_INVALID,
 *   NON_FINITE_VOXELS, INVALID_ARGUMENT, REGISTRATION_NOT_CONVERGED (names the volume), REGISTRATION_NO_OVERLAP,
 *   WORKER_SCRIPT_MISSING when the package is not built
 * @example const motion = await estimateRunMotion(run.volume, { reference: 'middle', model: 'rigid' })
 */
export async function estimateRunMotion(run: Volume, options: RunMotionOptions = {}): Promise<RunMotion> {
  const [nx, ny, nz, nt] = run.dims;
  if (nt < 2) fail('TOO_FEW_VOLUMES', `motion estimation needs at least 2 volumes; this run has ${nt} (a 3D image has no motion to estimate)`);
  const reference = options.reference ?? 'first';
  let refIndex: number | null;
  if (typeof reference === 'number') {
    if (!Number.isInteger(reference) || reference < 0 || reference >= nt) fail('MOTION_REFERENCE_INVALID', `reference volume ${reference} is outside 0..${nt - 1} (this run has ${nt} volumes)`);
    refIndex = reference;
  } else if (reference === 'first') refIndex = 0;
  else if (reference === 'middle') refIndex = Math.floor(nt / 2);
  else if (reference === 'mean' || reference === 'least-moving') refIndex = null;
  else return fail('MOTION_REFERENCE_INVALID', `reference '${String(reference)}' is not one of ${MOTION_REFERENCES.join(', ')} or a volume index`);
  const model = options.model ?? 'rigid';
  const cost = options.cost ?? 'least-squares';
  if (!REGISTRATION_MODELS.includes(model)) fail('INVALID_ARGUMENT', `model must be one of ${REGISTRATION_MODELS.join(', ')}, got '${String(model)}'`);
  if (!REGISTRATION_COSTS.includes(cost)) fail('INVALID_ARGUMENT', `cost must be one of ${REGISTRATION_COSTS.join(', ')}, got '${String(cost)}'`);
  const workers = options.workers ?? (isMainThread ? defaultWorkerCount() : 1);
  if (!Number.isInteger(workers) || workers < 1) fail('INVALID_ARGUMENT', `workers must be a positive integer, got ${workers}`);
  const scan = scanNonFinite(run.data, false);
  if (scan.count > 0) {
    const n = nx * ny * nz;
    fail('NON_FINITE_VOXELS', `the run has ${scan.count} NaN or infinite values (first in volume ${Math.floor(scan.firstIndex / n)}); motion cannot be estimated through them (replace them, e.g. open the run with nonFinite: 'zero', or drop the volume)`);
  }
  const grid: Grid = { dims: [nx, ny, nz], affine: run.affine };
  const centreMm: Vec3 = options.centreMm ? [...options.centreMm] as Vec3 : gridCentreMm(grid);
  const np = model === 'rigid' ? 6 : 12;
  const n = nx * ny * nz;
  const inThread = workers === 1 || n * nt < RUN_MOTION_IN_THREAD_BELOW;
  // the run and the reference go to shared memory once for every task
  let data = run.data;
  if (!inThread && !(data.buffer instanceof SharedArrayBuffer)) {
    data = new Float32Array(new SharedArrayBuffer(run.data.byteLength));
    data.set(run.data);
  }
  const toShared = (a: Float32Array): Float32Array => {
    if (inThread) return a;
    const s = new Float32Array(new SharedArrayBuffer(a.byteLength));
    s.set(a);
    return s;
  };
  const mask = options.mask ?? null;
  if (mask && mask.length !== n) fail('INVALID_ARGUMENT', `the mask has ${mask.length} voxels, the run's grid ${nx}x${ny}x${nz} has ${n}`);
  const taskOptions: RegisterVolumesTask['options'] = {
    model, cost, centreMm, levels: options.levels, finestFwhmVoxels: options.finestFwhmVoxels, mask, bins: options.bins,
    toleranceMm: options.toleranceMm, maxIterations: options.maxIterations,
  };
  const pool = inThread ? null : sharedWorkerPool<RegisterVolumesTask, RegisterVolumesResult>(new URL('./register-worker.js', import.meta.url), workers);

  const pass = async (ref: number | null, referenceData: Float32Array) => {
    const params = new Float64Array(np * nt);
    const costs = new Float64Array(nt);
    const iterations: number[][] = Array.from({ length: nt }, () => []);
    if (ref !== null) params.set(np === 6 ? [0, 0, 0, 0, 0, 0] : [0, 0, 0, 0, 0, 0, 1, 1, 1, 0, 0, 0], ref * np);
    // two chunks per worker: each chunk prepares the reference once (about 10 % of a chunk of 25 volumes)
    const lists = chunksFrom(ref, nt, inThread ? 1 : workers * 2);
    const shared = toShared(referenceData);
    const results = await Promise.all(lists.map((volumes) => {
      const task: RegisterVolumesTask = { run: data, grid, reference: shared, options: taskOptions, volumes };
      return pool ? pool.run(task) : Promise.resolve(registerVolumesTask(task));
    }));
    results.forEach((r, c) => lists[c].forEach((t, q) => {
      params.set(r.parameters.subarray(q * np, (q + 1) * np), t * np);
      costs[t] = r.costs[q];
      iterations[t] = r.iterations[q];
    }));
    return { params, costs, iterations };
  };

  let result: { params: Float64Array; costs: Float64Array; iterations: number[][] };
  if (reference === 'least-moving') {
    const first = await pass(null, Float32Array.from(meanImage(run)));
    refIndex = leastMovingVolume(first.params, np);
    result = await pass(refIndex, run.data.slice(refIndex * n, (refIndex + 1) * n));
  } else {
    result = await pass(refIndex, refIndex === null ? Float32Array.from(meanImage(run)) : run.data.slice(refIndex * n, (refIndex + 1) * n));
  }
  const rows = Array.from({ length: nt }, (_, t) => {
    const p = result.params.subarray(t * np, (t + 1) * np);
    const row: MotionRow = { volume: t, shiftXMm: p[0], shiftYMm: p[1], shiftZMm: p[2], rotXDeg: p[3], rotYDeg: p[4], rotZDeg: p[5] };
    if (np === 12) AFFINE_MOTION_COLUMNS.forEach((c, q) => { (row as AffineMotionRow)[c] = p[6 + q]; });
    return row;
  });
  const transforms = Array.from({ length: nt }, (_, t) => motionParametersAffine(result.params.subarray(t * np, (t + 1) * np), centreMm));
  return {
    rows, transforms, referenceIndex: refIndex, reference, costs: result.costs, iterations: result.iterations,
    model, cost, centreMm, levels: [...(options.levels ?? [4, 2, 1])],
  };
}
