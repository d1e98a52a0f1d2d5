import { affineSpacing } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { makeVolume, type Volume } from '../core/volume.js';
import { scanNonFinite, type NonFiniteScan } from '../io/non-finite.js';
import { planResample, type ResampleOptions, type ResamplePlan } from './plan-resample.js';
import { resampleVolumesTask } from './resample-volumes-task.js';

/**
 * Refuse a run holding NaN or infinite values (they would spread through every kernel wider than
 * one voxel).
 * @param volume - the run
 * @param scan - its non-finite values when already counted (resampleRun's worker threads scan their
 *   own volumes), else the run is scanned here
 * @returns nothing
 * @throws BoldsweepError NON_FINITE_VOXELS naming how many and the first one
 * @example checkFiniteRun(run.volume)
 */
export function checkFiniteRun(volume: Volume, scan: NonFiniteScan = scanNonFinite(volume.data, false)): void {
  if (scan.count > 0) {
    const n = volume.dims[0] * volume.dims[1] * volume.dims[2];
    const t = Math.floor(scan.firstIndex / n), v = scan.firstIndex % n;
    const i = v % volume.dims[0], j = Math.floor(v / volume.dims[0]) % volume.dims[1], k = Math.floor(v / (volume.dims[0] * volume.dims[1]));
    fail('NON_FINITE_VOXELS', `resampling: the run holds ${scan.count} NaN or infinite values (first at voxel [${i}, ${j}, ${k}] of volume ${t}); a kernel would spread each over its neighbours. Open the run with nonFinite: 'zero', or mask those voxels first`, { details: { count: scan.count, firstIndex: scan.firstIndex } });
  }
}

/**
 * The volume a plan produces (target grid, the source's TR), around given data.
 * @param plan - the plan
 * @param like - the source run
 * @param data - output values
 * @returns the volume
 * @example const out = volumeOnTarget(plan, run.volume, values)
 */
export function volumeOnTarget(plan: ResamplePlan, like: Volume, data: Float32Array): Volume {
  const s = affineSpacing(plan.grid.affine);
  return makeVolume({ dims: [...plan.grid.dims, like.dims[3]] as Volume['dims'], spacingMm: [s[0], s[1], s[2]], trSec: like.trSec, affine: new Float64Array(plan.grid.affine), data });
}

/**
 * Resample an image or a run onto a grid through a transform, in the calling thread (use
 * resampleRun for a long run: it works on several volumes at once). Each volume goes through the
 * same transform.
 * @param volume - the image or run (not modified)
 * @param options - grid (default the source's), kernel, mode (default 'constant'), cval, transform
 *   (target world -> source world; affine or displacement field)
 * @returns a new volume on the target grid, Float32
 * @throws BoldsweepError UNKNOWN_KERNEL, INVALID_ARGUMENT, TARGET_GRID_TOO_LARGE, SINGULAR_TRANSFORM,
 *   GRID_MISMATCH, NON_FINITE_VOXELS
 * @example const moved = resampleVolume(mean, { kernel: 'cubic', transform: rotation })
 */
export function resampleVolume(volume: Volume, options: ResampleOptions): Volume {
  const plan = planResample({ dims: [volume.dims[0], volume.dims[1], volume.dims[2]], affine: volume.affine }, options, volume.dims[3]);
  checkFiniteRun(volume);
  const [ox, oy, oz] = plan.grid.dims;
  const output = new Float32Array(ox * oy * oz * volume.dims[3]);
  resampleVolumesTask({
    input: volume.data, output, sourceDims: plan.sourceDims, outDims: plan.grid.dims, srcFromOut: [plan.srcFromOut],
    displacementVox: plan.displacementVox, kernel: plan.kernel, mode: plan.mode, cval: plan.cval, tStart: 0, tEnd: volume.dims[3],
  });
  return volumeOnTarget(plan, volume, output);
}
