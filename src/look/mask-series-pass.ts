import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import type { EdgeSides } from './edge-sides.js';
import type { MaskSeries } from './mask-series.js';

/**
 * The motion edge signature's per-voxel work, done in the mask-series pass (see {@link maskSeriesPass}):
 * the edge voxels and their sides, and per edge voxel an upper bound on its floor (a tenth of its mean
 * over the run) from the whole-run sums.
 */
export interface EdgePlan {
  sides: EdgeSides;
  /** Per edge voxel: at least |mean| / 10 for the mean as motionEdgeSignature sums it (Infinity: unknown). */
  floorAbove: Float64Array;
}

/** What {@link maskSeriesPass} returns. */
export interface MaskSeriesPassResult {
  series: MaskSeries;
  /**
   * With an edge plan: per volume t and side s (2a: facing + along axis a, 2a + 1: facing -), the sum of
   * the edge voxels' % changes from volume t - 1 at [6 t + s], added in ascending voxel order as
   * motionEdgeSignature adds them; null when some change needed the voxel's exact floor (then
   * motionEdgeSignature must be run), or without a plan.
   */
  sideSums: Float64Array | null;
}

/**
 * Global mean, DVARS and per-slice means of the voxels in a mask, one pass over the run in memory
 * order (maskSeries), and with `edges` the motion edge signature's changes at the mask's edge voxels
 * from the same reads: the edge voxels are mask voxels, so their values are in cache when their slice
 * has just been summed (a separate pass reads one cache line per edge voxel and volume, and cost about
 * as much as a plain pass over the whole run on a 64 x 64 x 36 grid).
 *
 * Each change is (x_t - x_{t-1}) / max(|x_t + x_{t-1}| / 2, floor) in %, with floor a tenth of the
 * voxel's mean over the run; the floor is only known exactly after the whole pass, so a change is
 * taken here only when |x_t + x_{t-1}| / 2 lies above `floorAbove` (a bound on the floor), and the
 * first that does not (a voxel near zero in two volumes in a row) abandons the sums.
 *
 * The mask voxels are visited as contiguous runs, slice by slice, four volumes at a time with the sums
 * in registers (each value is read once; V8 neither unrolls nor reorders additions, so this is done by
 * hand).
 * @param run - the run (not modified)
 * @param mask - nonzero = in, length nx*ny*nz; voxels must be finite in every volume
 * @param minSliceVoxels - slices with fewer mask voxels are not summarised
 * @param edges - the edge plan, or null
 * @returns the traces and the edge side sums
 * @throws BoldsweepError INVALID_ARGUMENT when the mask is empty or of the wrong length
 * @example const { series } = maskSeriesPass(run.volume, brain.mask, 10, null)
 */
export function maskSeriesPass(run: Volume, mask: ArrayLike<number>, minSliceVoxels: number, edges: EdgePlan | null): MaskSeriesPassResult {
  const n = voxelsPerVolume(run);
  const [nx, ny, nz, nt] = run.dims;
  if (mask.length !== n) fail('INVALID_ARGUMENT', `mask length ${mask.length} does not match the run's ${nx}x${ny}x${nz} grid`);
  // maximal runs of consecutive mask voxels within each slice
  const sliceVoxels = new Int32Array(nz);
  const sliceFirstRun = new Int32Array(nz + 1);
  const found = maskRuns(mask, nx * ny, nz, sliceVoxels, sliceFirstRun);
  const m = sliceVoxels.reduce((a, b) => a + b, 0);
  if (m === 0) fail('INVALID_ARGUMENT', 'the mask is empty');
  const runStart = found.start, runEnd = found.end;
  const sliceSum = new Float64Array(nz * nt);
  const d2 = new Float64Array(nt);
  const data = run.data;
  let edgeWork: EdgeWork | null = null;
  if (edges) {
    const sliceFirstEdge = new Int32Array(nz + 1);
    const edge = edges.sides.edge;
    for (let z = 0, e = 0; z <= nz; z++) {
      while (e < edge.length && edge[e] < z * nx * ny) e++;
      sliceFirstEdge[z] = e;
    }
    edgeWork = { edge, sides: edges.sides.sides, floorAbove: edges.floorAbove, sliceFirstEdge, sideSums: new Float64Array(6 * nt), unsure: new Int32Array(1) };
  }
  // volume 0 (no DVARS), then four volumes per sweep
  sumFirstVolume(data, nt, sliceFirstRun, runStart, runEnd, sliceSum);
  let t = 1;
  for (; t + 4 <= nt; t += 4) sumFourVolumes(data, n, nt, t, sliceFirstRun, runStart, runEnd, sliceSum, d2, edgeWork);
  for (; t < nt; t++) sumOneVolume(data, n, nt, t, sliceFirstRun, runStart, runEnd, sliceSum, d2, edgeWork);
  const globalMean = new Float64Array(nt);
  const dvars = new Float64Array(nt);
  const sliceMean = new Float64Array(nz * nt);
  for (let t = 0; t < nt; t++) {
    let total = 0;
    for (let z = 0; z < nz; z++) {
      const s = sliceSum[z * nt + t];
      total += s;
      sliceMean[z * nt + t] = sliceVoxels[z] >= minSliceVoxels ? s / sliceVoxels[z] : NaN;
    }
    globalMean[t] = total / m;
    dvars[t] = t > 0 ? Math.sqrt(d2[t] / m) : NaN;
  }
  return {
    series: { globalMean, dvars, sliceMean, sliceVoxels, minSliceVoxels },
    sideSums: edgeWork && edgeWork.unsure[0] === 0 ? edgeWork.sideSums : null,
  };
}

/** The edge part of the pass: edge voxels and side codes, their first position per slice, the sums, and a flag (unsure[0] = 1: abandoned). */
interface EdgeWork {
  edge: Int32Array;
  sides: Uint8Array;
  floorAbove: Float64Array;
  sliceFirstEdge: Int32Array;
  sideSums: Float64Array;
  unsure: Int32Array;
}

/**
 * Slice sums and summed squared differences from the volume before, for volumes t..t+3 (t >= 1): each
 * value is loaded once and serves as the previous volume of the next; eight independent sums keep the
 * adder busy. With edge work, each slice's edge changes follow its sums (the slice is still in cache).
 */
function sumFourVolumes(data: Float32Array, n: number, nt: number, t: number, sliceFirstRun: Int32Array, runStart: Int32Array, runEnd: Int32Array, sliceSum: Float64Array, d2: Float64Array, edges: EdgeWork | null): void {
  const nz = sliceFirstRun.length - 1;
  const acc = new Float64Array(8);
  for (let z = 0; z < nz; z++) {
    sliceFourVolumes(data, t * n, n, sliceFirstRun[z], sliceFirstRun[z + 1], runStart, runEnd, acc);
    const o = z * nt + t;
    sliceSum[o] = acc[0]; sliceSum[o + 1] = acc[1]; sliceSum[o + 2] = acc[2]; sliceSum[o + 3] = acc[3];
    if (edges !== null && edges.unsure[0] === 0) {
      const e0 = edges.sliceFirstEdge[z], e1 = edges.sliceFirstEdge[z + 1];
      for (let q = 0; q < 4; q++) edgeChanges(data, (t + q) * n, n, e0, e1, edges.edge, edges.sides, edges.floorAbove, edges.sideSums, 6 * (t + q), edges.unsure);
    }
  }
  d2[t] = acc[4]; d2[t + 1] = acc[5]; d2[t + 2] = acc[6]; d2[t + 3] = acc[7];
}

/**
 * One slice of sumFourVolumes (runs r0..r1-1): acc[0..3] = the slice's sums of volumes t..t+3,
 * acc[4..7] += their squared differences. A short function called per slice and group of volumes,
 * so V8 optimises it early and keeps it (long single calls were compiled mid-loop and then
 * deoptimised, over and over).
 */
function sliceFourVolumes(data: Float32Array, b0: number, n: number, r0: number, r1: number, runStart: Int32Array, runEnd: Int32Array, acc: Float64Array): void {
  const bp = b0 - n, b1 = b0 + n, b2 = b1 + n, b3 = b2 + n;
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, e0 = acc[4], e1 = acc[5], e2 = acc[6], e3 = acc[7];
  for (let r = r0; r < r1; r++) {
    for (let v = runStart[r], e = runEnd[r]; v < e; v++) {
      const yp = data[bp + v], y0 = data[b0 + v], y1 = data[b1 + v], y2 = data[b2 + v], y3 = data[b3 + v];
      s0 += y0; s1 += y1; s2 += y2; s3 += y3;
      const d0 = y0 - yp, d1 = y1 - y0, dd2 = y2 - y1, d3 = y3 - y2;
      e0 += d0 * d0; e1 += d1 * d1; e2 += dd2 * dd2; e3 += d3 * d3;
    }
  }
  acc[0] = s0; acc[1] = s1; acc[2] = s2; acc[3] = s3; acc[4] = e0; acc[5] = e1; acc[6] = e2; acc[7] = e3;
}

/**
 * The % changes of edge voxels e0..e1-1 from the volume before the one at offset b (see
 * motionEdgeSignature), each added to the sums of the sides it faces at sums[o + side]; sets unsure[0]
 * and stops at a change whose level is not surely above the voxel's floor.
 */
function edgeChanges(data: Float32Array, b: number, n: number, e0: number, e1: number, edge: Int32Array, sides: Uint8Array, floorAbove: Float64Array, sums: Float64Array, o: number, unsure: Int32Array): void {
  const bp = b - n;
  let p0 = sums[o], m0 = sums[o + 1], p1 = sums[o + 2], m1 = sums[o + 3], p2 = sums[o + 4], m2 = sums[o + 5];
  for (let e = e0; e < e1; e++) {
    const v = edge[e];
    const a = data[bp + v], x = data[b + v];
    const level = Math.abs(a + x) / 2;
    if (!(level > floorAbove[e])) { unsure[0] = 1; return; }
    const c = (100 * (x - a)) / level;
    const s = sides[e];
    if (s & 1) p0 += c;
    if (s & 2) m0 += c;
    if (s & 4) p1 += c;
    if (s & 8) m1 += c;
    if (s & 16) p2 += c;
    if (s & 32) m2 += c;
  }
  sums[o] = p0; sums[o + 1] = m0; sums[o + 2] = p1; sums[o + 3] = m1; sums[o + 4] = p2; sums[o + 5] = m2;
}

/** Slice sums of volume 0. */
function sumFirstVolume(data: Float32Array, nt: number, sliceFirstRun: Int32Array, runStart: Int32Array, runEnd: Int32Array, sliceSum: Float64Array): void {
  const nz = sliceFirstRun.length - 1;
  for (let z = 0; z < nz; z++) {
    let s = 0;
    for (let r = sliceFirstRun[z]; r < sliceFirstRun[z + 1]; r++) for (let v = runStart[r], e = runEnd[r]; v < e; v++) s += data[v];
    sliceSum[z * nt] = s;
  }
}

/** As sumFourVolumes for the single volume t (t >= 1). */
function sumOneVolume(data: Float32Array, n: number, nt: number, t: number, sliceFirstRun: Int32Array, runStart: Int32Array, runEnd: Int32Array, sliceSum: Float64Array, d2: Float64Array, edges: EdgeWork | null): void {
  const b0 = t * n, bp = b0 - n;
  const nz = sliceFirstRun.length - 1;
  let e0 = 0;
  for (let z = 0; z < nz; z++) {
    let s0 = 0;
    for (let r = sliceFirstRun[z], rEnd = sliceFirstRun[z + 1]; r < rEnd; r++) {
      for (let v = runStart[r], e = runEnd[r]; v < e; v++) {
        const y0 = data[b0 + v], d0 = y0 - data[bp + v];
        s0 += y0; e0 += d0 * d0;
      }
    }
    sliceSum[z * nt + t] = s0;
    if (edges !== null && edges.unsure[0] === 0) edgeChanges(data, b0, n, edges.sliceFirstEdge[z], edges.sliceFirstEdge[z + 1], edges.edge, edges.sides, edges.floorAbove, edges.sideSums, 6 * t, edges.unsure);
  }
  d2[t] = e0;
}

/**
 * Maximal runs of consecutive mask voxels within each slice: run r covers start[r]..end[r]-1, slice z
 * holds runs sliceFirstRun[z]..sliceFirstRun[z+1]-1 and sliceVoxels[z] mask voxels.
 */
function maskRuns(mask: ArrayLike<number>, nxy: number, nz: number, sliceVoxels: Int32Array, sliceFirstRun: Int32Array): { start: Int32Array; end: Int32Array } {
  let start = new Int32Array(1024), end = new Int32Array(1024);
  let runs = 0;
  for (let z = 0; z < nz; z++) {
    sliceFirstRun[z] = runs;
    const last = (z + 1) * nxy;
    for (let v = z * nxy; v < last;) {
      if (!mask[v]) { v++; continue; }
      const a = v;
      while (v < last && mask[v]) v++;
      if (runs === start.length) {
        const s2 = new Int32Array(2 * runs), e2 = new Int32Array(2 * runs);
        s2.set(start); e2.set(end); start = s2; end = e2;
      }
      start[runs] = a; end[runs] = v; runs++;
      sliceVoxels[z] += v - a;
    }
  }
  sliceFirstRun[nz] = runs;
  return { start: start.subarray(0, runs), end: end.subarray(0, runs) };
}
