import { boundaryIndex } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import { prefilterLine } from '../resample/cubic-bspline-prefilter.js';
import { NO_TAP, type UnwarpPlan } from './plan-unwarp.js';

/**
 * Unwarp volumes of a run along their phase-encode lines with a plan from {@link planUnwarp}: each
 * line is read once (for the cubic kernel, prefiltered into B-spline coefficients with mirror
 * extension, the exact prefilter of the resampling module), and every voxel of the output line takes
 * its taps from it. One-dimensional work per line, so it costs a fraction of a 3D resampling.
 * @param data - volumes `tStart`..`tEnd - 1` of a run, NIfTI order (not modified)
 * @param plan - the unwarping plan of the run's grid
 * @param out - where to write (same layout and length as `data`; may be `data` itself: each line is
 *   read whole before it is written)
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
  const axis = plan.axis;
  const len = plan.dims[axis];
  const stride = axis === 0 ? 1 : axis === 1 ? nx : nx * ny;
  const lines = n / len;
  const line = new Float64Array(len);
  const scratch = new Float64Array(len);
  const { first, weights, taps } = plan;
  const cubic = plan.kernel === 'cubic';
  for (let t = tStart; t < end; t++) {
    const o = t * n;
    for (let li = 0; li < lines; li++) {
      const base = o + (axis === 0 ? li * nx : axis === 1 ? (li % nx) + nx * ny * Math.floor(li / nx) : li);
      let any = false;
      for (let y = 0; y < len; y++) {
        const x = data[base + y * stride];
        line[y] = x;
        if (x !== 0) any = true;
      }
      if (!any) {
        for (let y = 0; y < len; y++) out[base + y * stride] = 0;
        continue;
      }
      if (cubic) prefilterLine(line, 'mirror', scratch);
      const vBase = base - o;
      for (let y = 0; y < len; y++) {
        const v = vBase + y * stride;
        const f = first[v];
        if (f === NO_TAP) { out[base + y * stride] = 0; continue; }
        const w = v * taps;
        let sum = 0;
        if (!cubic) {
          // weights of taps beyond the line are 0: clamp the index only to stay inside the array
          sum = weights[w] * line[f < 0 ? 0 : f] + weights[w + 1] * line[f + 1 >= len ? len - 1 : f + 1];
        } else if (f >= 0 && f + 3 < len) {
          sum = weights[w] * line[f] + weights[w + 1] * line[f + 1] + weights[w + 2] * line[f + 2] + weights[w + 3] * line[f + 3];
        } else {
          for (let k = 0; k < 4; k++) sum += weights[w + k] * line[boundaryIndex(f + k, len, 'mirror')];
        }
        out[base + y * stride] = sum;
      }
    }
  }
  return out;
}
