import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { VOXELS_PER_STEP, exactSumNames, lookSumNames, sumsScratchBytes, voxelSumsKernels } from './voxel-sums-wasm.js';

/** What {@link voxelSums} computes: which volumes, in which order, with which drift terms. */
export interface VoxelSumsPlan {
  /** Volume of each row, in row order (the lag-1 sums pair row i with row i - 1 where `weights` say so). */
  rows: ArrayLike<number>;
  /** First row of the drift fit; the fit rows are [fitStart, rows.length) and the shift is row fitStart's value. */
  fitStart: number;
  /** Drift terms p (polynomial order + 1). */
  terms: number;
  /** Per row, p values: [adj, w_1 .. w_{p-1}] (adj 1 when the row before is the previous volume, else 0). */
  weights: Float64Array;
  /** 'look': raw sums over all rows and the drift fit over the fit rows; 'exact': fit and residual sums over all rows. */
  mode: 'look' | 'exact';
  /** Look mode: voxels whose mean over the fit rows is below this get no residual sums (default -Infinity: all do). */
  residualsAbove?: number;
  /** Look mode: A_F, B_F, A_h, V (4 p x p, row-major; see voxel-sums-wasm.ts). */
  matrices?: Float64Array;
}

/**
 * Bytes of the block of rows copied per kernel call. Each row copy is one call, so long rows matter:
 * 4096-voxel rows copied 118 MB in half the time of 328-voxel rows (Node 20). The kernel goes through the
 * block two voxels at a time, and one pair's rows (one cache line per row) stay in the first-level cache
 * between its two loops. The block should still fit the second-level cache (2 MiB a core on the
 * development machine), where the copy leaves it for the kernel: with 4 MiB blocks the look took about a
 * quarter more CPU time than with 1 MiB ones (1310-voxel rows for 200 volumes) while the machine was
 * loaded (its third-level cache contended); at load 1-2 both took the same within the noise
 * (December 2026).
 */
const BLOCK_BYTES = 1024 * 1024;

/**
 * Per-voxel time sums of a run in one streamed read (see src/look/voxel-sums-wasm.ts for the sums).
 * The voxels are taken in blocks; for each block the rows of the plan are copied volume by volume
 * (each copy one contiguous stretch of a volume, so reads follow memory order) into WebAssembly
 * memory, where the kernel sums them. The run is read once and not modified.
 * @param run - the run
 * @param plan - rows, fit rows, drift weights and mode
 * @param reuse - optional arrays to write the outputs into (one of nx*ny*nz values per output name, in
 *   order; used when they fit), which spares fresh memory for callers that repeat the sums
 * @returns one Float64Array of nx*ny*nz values per output name (lookSumNames / exactSumNames order)
 * @throws BoldsweepError INVALID_ARGUMENT when the plan does not fit the run
 * @example const s = voxelSums(run, { rows: [0, 1, 2], fitStart: 0, terms: 1, weights: new Float64Array([0, 1, 1]), mode: 'exact' })
 */
export function voxelSums(run: Volume, plan: VoxelSumsPlan, reuse?: readonly Float64Array[]): Record<string, Float64Array> {
  const n = voxelsPerVolume(run);
  const nt = run.dims[3];
  const R = plan.rows.length;
  const p = plan.terms;
  if (!(plan.fitStart >= 0 && plan.fitStart < R && Number.isInteger(plan.fitStart))) fail('INVALID_ARGUMENT', `fitStart must be a row in 0..${R - 1}, got ${plan.fitStart}`);
  if (plan.weights.length !== R * p) fail('INVALID_ARGUMENT', `weights must hold ${p} values per row (${R * p}), got ${plan.weights.length}`);
  for (let i = 0; i < R; i++) {
    const t = plan.rows[i];
    if (!Number.isInteger(t) || t < 0 || t >= nt) fail('INVALID_ARGUMENT', `row ${i} names volume ${t}, outside 0..${nt - 1}`);
  }
  const names = plan.mode === 'look' ? lookSumNames(p) : exactSumNames(p);
  const mats = plan.matrices ?? new Float64Array(4 * p * p);
  if (plan.mode === 'look' && (!plan.matrices || plan.matrices.length !== 4 * p * p)) fail('INVALID_ARGUMENT', `look sums with ${p} terms need 4 matrices of ${p} x ${p}`);
  // block width: a whole number of kernel steps
  const step = VOXELS_PER_STEP;
  const cols = step * Math.max(8, Math.min(Math.ceil(n / step), Math.floor(BLOCK_BYTES / (4 * step * R))));
  // memory: weights, matrices, the kernel's scratch, outputs, then the block of rows (all 16-byte aligned)
  const scratchAt = align16(8 * R * p) + align16(8 * mats.length);
  const wBytes = scratchAt + sumsScratchBytes(p);
  const outBytes = align16(8 * names.length * cols);
  const kernels = voxelSumsKernels(p, wBytes + outBytes + 4 * R * cols);
  const kernel = plan.mode === 'look' ? kernels.look : kernels.exact;
  const memory = kernels.memory;
  const f32 = new Float32Array(memory.buffer);
  const f64 = new Float64Array(memory.buffer);
  f64.set(plan.weights, 0);
  const matsAt = align16(8 * R * p);
  f64.set(mats, matsAt >> 3);
  const outAt = wBytes, srcAt = wBytes + outBytes;
  const out = reuse && reuse.length === names.length && reuse.every((a) => a.length === n) ? [...reuse] : names.map(() => new Float64Array(n));
  const data = run.data;
  const src4 = srcAt >> 2, out8 = outAt >> 3;
  const rows = Int32Array.from(plan.rows);
  const theta = plan.residualsAbove ?? -Infinity;
  for (let v0 = 0; v0 < n; v0 += cols) {
    const len = Math.min(cols, n - v0);
    const c = step * Math.ceil(len / step); // a short last block carries unused lanes
    copyRows(data, n, rows, v0, len, f32, src4, c);
    kernel(srcAt, c, R, plan.fitStart, 0, outAt, theta, c, matsAt, p, scratchAt);
    for (let q = 0; q < names.length; q++) out[q].set(f64.subarray(out8 + q * c, out8 + q * c + len), v0);
  }
  const result: Record<string, Float64Array> = {};
  names.forEach((name, q) => { result[name] = out[q]; });
  return result;
}

/** Row i of the block (volume rows[i], voxels v0..v0+len-1) to dst at di + i * stride: one contiguous copy each. */
function copyRows(data: Float32Array, n: number, rows: Int32Array, v0: number, len: number, dst: Float32Array, di: number, stride: number): void {
  for (let i = 0; i < rows.length; i++) {
    const from = rows[i] * n + v0;
    dst.set(data.subarray(from, from + len), di + i * stride);
  }
}

function align16(bytes: number): number {
  return (bytes + 15) & ~15;
}
