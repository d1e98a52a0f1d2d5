import type { BoundaryMode } from '../core/boundary-mode.js';
import { applySmoothPlan, makeSmoothScratch, type SmoothPlan, type SmoothScratch } from './smooth-plan.js';

/**
 * Smooth volumes tStart..tEnd-1 of a run: the unit of work shared by the main thread and the
 * worker threads (same code, so both give the same bytes). Arrays may be SharedArrayBuffer views.
 */
export interface SmoothVolumesTask {
  /** The whole run, x fastest then y, z, t. Only read. */
  input: Float32Array;
  /** Where the smoothed run goes (same length); volumes tStart..tEnd-1 are written. */
  output: Float32Array;
  dims: [number, number, number];
  mode: BoundaryMode;
  kernels: [Float64Array, Float64Array, Float64Array];
  mask: Uint8Array | null;
  maskWeights: Float64Array | null;
  tStart: number;
  tEnd: number;
}

let cached: { key: string; scratch: SmoothScratch } | null = null;

/**
 * Run a {@link SmoothVolumesTask}: one plan, one scratch (kept between tasks of the same shape).
 * @param task - the task
 * @returns number of volumes smoothed
 * @example smoothVolumesTask({ input, output, dims, mode: 'reflect', kernels, mask: null, maskWeights: null, tStart: 0, tEnd: nt })
 */
export function smoothVolumesTask(task: SmoothVolumesTask): number {
  const plan: SmoothPlan = { dims: task.dims, mode: task.mode, kernels: task.kernels, mask: task.mask, maskWeights: task.maskWeights };
  const key = `${task.dims.join('x')}|${task.kernels.map((k) => k.length).join(',')}`;
  if (!cached || cached.key !== key) cached = { key, scratch: makeSmoothScratch(plan) };
  const n = task.dims[0] * task.dims[1] * task.dims[2];
  for (let t = task.tStart; t < task.tEnd; t++) {
    applySmoothPlan(plan, task.input.subarray(n * t, n * (t + 1)), task.output.subarray(n * t, n * (t + 1)), cached.scratch);
  }
  return task.tEnd - task.tStart;
}
