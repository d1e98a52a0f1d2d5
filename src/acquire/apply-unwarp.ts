import { fail } from '../core/fail.js';
import { initTaps, prefilterBatch, prefilterRow } from '../resample/cubic-bspline-prefilter.js';
import type { UnwarpPlan } from './plan-unwarp.js';

/**
 * Unwarp volumes of a run along their phase-encode lines with a plan from {@link planUnwarp}: every
 * output voxel is the weighted sum of the 2 (linear) or 4 (cubic) voxels of its line that the plan
 * names, read straight from the volume (for the cubic kernel, from the volume's B-spline
 * coefficients, each line prefiltered with mirror extension by the resampling module's exact
 * prefilter). One flat pass per volume over precomputed indices, so it costs a fraction of a 3D
 * resampling.
 * @param data - volumes `tStart`..`tEnd - 1` of a run, NIfTI order (not modified unless it is `out`)
 * @param plan - the unwarping plan of the run's grid
 * @param out - where to write (same layout and length as `data`; may be `data` itself: each volume
 *   is copied aside before it is written)
 * @param tStart - first volume. __Default value:__ 0
 * @param tEnd - one past the last volume. __Default value:__ all volumes in `data`
 * @returns `out`
 * @throws BoldsweepError INVALID_ARGUMENT for lengths that do not fit the plan's grid
 * @example applyUnwarp(run.data, planUnwarp(shift, dims, 1, { kernel: 'linear', jacobian: true }), out)
 */
export function applyUnwarp(data: Float32Array, plan: UnwarpPlan, out: Float32Array, tStart = 0, tEnd?: number): Float32Array {
  const [nx, ny, nz] = plan.dims;
  const n = nx * ny * nz;
  if (data.length % n !== 0) fail('INVALID_ARGUMENT', `data length ${data.length} is not a whole number of ${n}-voxel volumes`);
  if (out.length !== data.length) fail('INVALID_ARGUMENT', `out has ${out.length} values, data ${data.length}`);
  const end = tEnd ?? data.length / n;
  const inPlace = out === data || (out.buffer === data.buffer && out.byteOffset === data.byteOffset);
  const cubic = plan.kernel === 'cubic';
  // the volume read: the data themselves, or a copy (in place), or the B-spline coefficients (cubic)
  const scratch = cubic ? new Float64Array(n) : inPlace ? new Float32Array(n) : null;
  for (let t = tStart; t < end; t++) {
    const o = t * n;
    if (cubic) cubicCoefficients(data, o, plan, scratch as Float64Array);
    else if (inPlace) (scratch as Float32Array).set(data.subarray(o, o + n));
    if (cubic) gather4(scratch as Float64Array, 0, plan.sources, plan.weights, out, o, n);
    else if (scratch) gather2(scratch as Float32Array, 0, plan.sources, plan.weights, out, o, n);
    else gather2(data, o, plan.sources, plan.weights, out, o, n);
  }
  return out;
}

function gather2(src: Float32Array, so: number, s: Int32Array, w: Float32Array, out: Float32Array, o: number, n: number): void {
  for (let v = 0, q = 0; v < n; v++, q += 2) out[o + v] = w[q] * src[so + s[q]] + w[q + 1] * src[so + s[q + 1]];
}

function gather4(src: Float64Array, so: number, s: Int32Array, w: Float32Array, out: Float32Array, o: number, n: number): void {
  for (let v = 0, q = 0; v < n; v++, q += 4) {
    out[o + v] = w[q] * src[so + s[q]] + w[q + 1] * src[so + s[q + 1]] + w[q + 2] * src[so + s[q + 2]] + w[q + 3] * src[so + s[q + 3]];
  }
}

/**
 * B-spline coefficients of one volume along the plan's axis (mirror extension, the resampling
 * module's exact prefilter): the j and k passes run over many contiguous lines at once.
 */
function cubicCoefficients(data: Float32Array, o: number, plan: UnwarpPlan, coef: Float64Array): void {
  const [nx, ny, nz] = plan.dims;
  const n = nx * ny * nz;
  const axis = plan.axis;
  const len = plan.dims[axis];
  coef.set(data.subarray(o, o + n));
  if (len < 2) return;
  const t = initTaps(len, 'mirror');
  const batch = axis === 0 ? 1 : axis === 1 ? nx : nx * ny;
  if (yp.length < len * batch) yp = new Float64Array(len * batch);
  if (ym.length < batch) ym = new Float64Array(batch);
  if (axis === 0) for (let r = 0; r < n; r += nx) prefilterRow(coef, r, nx, t, yp);
  else if (axis === 1) for (let k = 0; k < nz; k++) prefilterBatch(coef, k * nx * ny, nx, ny, nx, t, yp, ym);
  else prefilterBatch(coef, 0, nx * ny, nz, nx * ny, t, yp, ym);
}

let yp = new Float64Array(0);
let ym = new Float64Array(0);
