import type { Affine } from '../core/affine.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { scanNonFinite } from '../io/non-finite.js';
import { cubicBSplinePrefilter } from './cubic-bspline-prefilter.js';
import { extendCoefficients } from './extend-coefficients.js';
import type { InterpolationKernel } from './interpolation-kernel.js';
import { resampleVoxels } from './resample-voxels.js';
import { trilinearKernel } from './trilinear-wasm.js';

/**
 * Resample volumes tStart..tEnd-1 of a run: the unit of work shared by the main thread and the
 * worker threads (same code, so both give the same bytes). Arrays may be SharedArrayBuffer views.
 */
export interface ResampleVolumesTask {
  /** The whole source run, x fastest then y, z, t. Only read. */
  input: Float32Array;
  /** The whole output run; volumes tStart..tEnd-1 are written. */
  output: Float32Array;
  sourceDims: [number, number, number];
  outDims: [number, number, number];
  /** Target voxel -> source voxel: one map for every volume, or one per volume. */
  srcFromOut: Affine[];
  displacementVox: Float32Array | null;
  kernel: InterpolationKernel;
  mode: BoundaryMode;
  cval: number;
  tStart: number;
  tEnd: number;
}

let coefficientScratch: Float64Array | undefined;
let extendedScratch: Float64Array | undefined;
let extendedVoxelScratch: Float32Array | undefined;

/** Planes of extended coefficients each side for the cubic kernel: positions up to the grid's edge then read them directly. */
const CUBIC_MARGIN = 2;
/**
 * Planes of extended voxels each side for the linear kernel (real ones in the modes that read them,
 * virtual in constant and nearest mode): a position in the last cell of an axis (up to n - 1) then
 * takes the fast path too. Without them that shell (about a tenth of a
 * 64 x 64 x 36 volume under a small rotation) went through the generic taps and took most of the time.
 */
const LINEAR_MARGIN = 1;

/**
 * Run a {@link ResampleVolumesTask}: per volume, the cubic prefilter (into a scratch kept between
 * tasks) when the kernel needs it, then the interpolation.
 * @param task - the task
 * @param counted - when given, its `nonFinite` is set to the number of NaN/Inf values in the volumes
 *   read (counted while each volume is copied for the kernel, so the run is not scanned separately)
 * @returns number of volumes resampled
 * @example resampleVolumesTask({ input, output, sourceDims, outDims, srcFromOut: [map], displacementVox: null, kernel: 'linear', mode: 'constant', cval: 0, tStart: 0, tEnd: nt })
 */
export function resampleVolumesTask(task: ResampleVolumesTask, counted?: { nonFinite: number }): number {
  const [sx, sy, sz] = task.sourceDims;
  const n = sx * sy * sz;
  const m = task.outDims[0] * task.outDims[1] * task.outDims[2];
  // linear without a displacement field in constant or nearest mode: the volume is copied as it is
  // into the WebAssembly kernel's memory and read there with a virtual margin (resampleVoxels)
  const linearAsIs = task.kernel === 'linear' && !task.displacementVox && (task.mode === 'constant' || task.mode === 'nearest');
  if (counted) counted.nonFinite = 0;
  for (let t = task.tStart; t < task.tEnd; t++) {
    const volume = task.input.subarray(n * t, n * (t + 1));
    const map = task.srcFromOut.length === 1 ? task.srcFromOut[0] : task.srcFromOut[t];
    const out = task.output.subarray(m * t, m * (t + 1));
    if (linearAsIs) {
      const k = trilinearKernel(n, m);
      const source = new Float32Array(k.memory.buffer, k.sourceAt, n);
      source.set(volume);
      if (counted) counted.nonFinite += k.countNonFinite(k.sourceAt, n);
      resampleVoxels({ source, sourceDims: task.sourceDims, pad: 0, virtualMargin: LINEAR_MARGIN, srcFromOut: map, displacementVox: null, outDims: task.outDims, kernel: 'linear', mode: task.mode, cval: task.cval }, out);
      continue;
    }
    if (counted) counted.nonFinite += scanNonFinite(volume, false).count;
    let source: Float32Array | Float64Array = volume;
    let sourceDims: readonly [number, number, number] = task.sourceDims;
    let pad = 0, margin = 0;
    if (task.kernel === 'cubic') {
      const c = cubicBSplinePrefilter(volume, task.sourceDims, task.mode, coefficientScratch);
      coefficientScratch = c.coefficients;
      const x = extendCoefficients(c.coefficients, c.dims, task.mode, CUBIC_MARGIN, extendedScratch);
      extendedScratch = x.values;
      source = x.values; sourceDims = x.dims; pad = c.pad; margin = CUBIC_MARGIN;
    } else if (task.kernel === 'linear') {
      // without a displacement field resampleVoxels runs the WebAssembly kernel: extend straight into its memory
      const into = task.displacementVox ? extendedVoxelScratch : linearKernelSource(task.sourceDims, m);
      const x = extendCoefficients(volume, task.sourceDims, task.mode, LINEAR_MARGIN, into);
      if (task.displacementVox) extendedVoxelScratch = x.values;
      source = x.values; sourceDims = x.dims; margin = LINEAR_MARGIN;
    }
    resampleVoxels({ source, sourceDims, pad, margin, srcFromOut: map, displacementVox: task.displacementVox, outDims: task.outDims, kernel: task.kernel, mode: task.mode, cval: task.cval }, out);
  }
  return task.tEnd - task.tStart;
}

/** Where the trilinear kernel reads its source (LINEAR_MARGIN planes each side), as a Float32Array over its memory. */
function linearKernelSource(dims: readonly [number, number, number], outValues: number): Float32Array {
  const values = (dims[0] + 2 * LINEAR_MARGIN) * (dims[1] + 2 * LINEAR_MARGIN) * (dims[2] + 2 * LINEAR_MARGIN);
  const k = trilinearKernel(values, outValues);
  return new Float32Array(k.memory.buffer, k.sourceAt, values);
}
