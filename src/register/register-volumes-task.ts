import type { Affine, Vec3 } from '../core/affine.js';
import type { Grid } from '../core/grid-frame.js';
import { motionParametersAffine } from './motion-parameters-affine.js';
import { prepareFixed } from './register-image-pair.js';
import { registerPrepared } from './register-prepared.js';
import type { RegisterOptions } from './registration-types.js';

/** A worker thread's unit of estimateRunMotion: some volumes of a run registered to one reference. */
export interface RegisterVolumesTask {
  /** The whole run, x fastest then y, z, t (shared memory when sent to a worker). */
  run: Float32Array;
  /** The run's grid (one volume). */
  grid: Grid;
  /** The reference image on the same grid. */
  reference: Float32Array;
  /** Registration settings (model, cost, levels, finestFwhmVoxels, centreMm, mask, bins, toleranceMm, maxIterations). */
  options: Omit<RegisterOptions, 'initialParameters' | 'label'> & { centreMm: Vec3 };
  /** Volumes to register, in this order; each starts from the estimate of the one before it. */
  volumes: number[];
  /** Parameters the first volume starts from. __Default value:__ the identity */
  start?: number[];
}

/** What one task found, per volume in the task's order. */
export interface RegisterVolumesResult {
  /** The parameters of each volume, concatenated (6 or 12 each). */
  parameters: Float64Array;
  /** Final cost of each volume. */
  costs: Float64Array;
  /** Iterations per level of each volume. */
  iterations: number[][];
}

/**
 * Register the task's volumes to the reference one after another, each starting from the estimate
 * of the previous one (head motion is mostly slow, so the last pose is a close start). The
 * reference is prepared once per task.
 * @param task - the run, the reference, the settings and the volume list
 * @returns parameters, costs and iterations per volume
 * @throws BoldsweepError as registerImagePair (REGISTRATION_NOT_CONVERGED names the volume)
 * @example const r = registerVolumesTask({ run, grid, reference, options: { centreMm }, volumes: [1, 2, 3] })
 */
export function registerVolumesTask(task: RegisterVolumesTask): RegisterVolumesResult {
  const prep = prepareFixed({ data: task.reference, grid: task.grid }, task.options);
  const np = prep.model === 'rigid' ? 6 : 12;
  const n = task.grid.dims[0] * task.grid.dims[1] * task.grid.dims[2];
  const parameters = new Float64Array(np * task.volumes.length);
  const costs = new Float64Array(task.volumes.length);
  const iterations: number[][] = [];
  let start: Affine = motionParametersAffine(task.start ?? (np === 6 ? [0, 0, 0, 0, 0, 0] : [0, 0, 0, 0, 0, 0, 1, 1, 1, 0, 0, 0]), prep.centreMm);
  task.volumes.forEach((t, q) => {
    const data = task.run.subarray(t * n, (t + 1) * n);
    const r = registerPrepared(prep, { data, grid: task.grid }, start, `volume ${t}`);
    parameters.set(r.parameters, q * np);
    costs[q] = r.cost;
    iterations.push(r.iterations);
    start = r.affine;
  });
  return { parameters, costs, iterations };
}
