/**
 * The per-voxel time sums behind the look: a WebAssembly SIMD kernel written in kernels/voxel-sums.ts
 * (AssemblyScript, compiled at build time; that file defines every sum), two neighbouring voxels per
 * step (two Float64 lanes).
 *
 * Why WebAssembly: every look statistic needs several Float64 operations per voxel and volume.
 * JavaScript runs them one value at a time with a bounds check per typed-array access, which costs
 * several times a plain pass over the run; two lanes per instruction, no bounds checks and accumulators
 * held in registers bring the sums close to the cost of reading the data.
 *
 * Outputs are Float64 arrays of `stride` values at `out`, one after another, in the order of
 * {@link lookSumNames} / {@link exactSumNames}. WebAssembly never fuses multiply-add, so the results
 * equal the scalar expressions evaluated in the order the kernel writes them.
 *
 * The memory is imported and made at the size a call needs, never grown: growing a WebAssembly
 * memory detaches its old ArrayBuffer, and in V8 the first detach anywhere in a process switches every
 * typed-array access of all later optimised code to a slower checked form (a plain summing loop took
 * twice as long afterwards, measured in Node 20).
 */
import { fail } from '../core/fail.js';
import { loadKernelModule, type KernelMemory } from '../core/load-kernel-module.js';

/** The part of WebAssembly.Memory used here. */
export type SumsMemory = KernelMemory;

/**
 * Kernel call: (src, cols, rows, fitStart, weights, out, theta, stride, mats, p, scratch): byte
 * addresses or counts; theta (look only) is the level below which a voxel pair's residual loop is
 * skipped (-Infinity: never); mats (look only) the address of A_F, B_F, A_h, V (p x p each; the first
 * three used when p <= MAX_CUMULATIVE_TERMS); stride the row length in values of both the block and
 * the outputs (>= cols); p the number of drift terms; scratch the address of
 * {@link sumsScratchBytes}(p) bytes the kernel may overwrite.
 */
export type SumsKernel = (src: number, cols: number, rows: number, fitStart: number, weights: number, out: number, theta: number, stride: number, mats: number, p: number, scratch: number) => void;

/** Drift terms up to which the look kernel uses repeated running sums instead of weights (see kernels/voxel-sums.ts). */
export const MAX_CUMULATIVE_TERMS = 4;

/**
 * Drift terms up to which the look kernel steps its residuals' drift by forward differences: with 3 the
 * error stayed below 1e-11 of the signal over 3000 volumes; with 4 it reached 4e-9 over 1000 volumes and
 * with 7 several percent over 500, so higher orders use the weights.
 */
export const MAX_DIFFERENCE_TERMS = 3;

/** Voxels per kernel step: one SIMD vector of two Float64 lanes (two vectors per step spilled registers and ran slower in V8). */
export const VOXELS_PER_STEP = 2;

/**
 * Scratch bytes a kernel call needs: above 4 drift terms the kernel keeps three arrays of p vectors
 * (16 bytes each) in memory instead of registers.
 * @param p - drift terms
 * @returns bytes (a multiple of 16)
 * @example sumsScratchBytes(6) // 288
 */
export function sumsScratchBytes(p: number): number {
  return 48 * p;
}

/** The two kernels and the memory they work in. */
export interface VoxelSumsKernels {
  memory: SumsMemory;
  /** Bytes of `memory`. */
  bytes: number;
  look: SumsKernel;
  exact: SumsKernel;
}

/**
 * Output names of the look kernel, in storage order.
 * @param p - drift terms (order + 1)
 * @returns names: shift, S, SS, M1.., c0, c1.., uAbs, Lu
 * @example lookSumNames(3) // ['shift','S','SS','M1','M2','c0','c1','c2','uAbs','Lu']
 */
export function lookSumNames(p: number): string[] {
  return ['shift', 'S', 'SS', ...range(1, p).map((k) => `M${k}`), ...range(0, p).map((k) => `c${k}`), 'uAbs', 'Lu'];
}

/**
 * Output names of the exact kernel, in storage order.
 * @param p - drift terms (order + 1)
 * @returns names: shift, S, M1.., SSu, Lu, uAbs
 * @example exactSumNames(3) // ['shift','S','M1','M2','SSu','Lu','uAbs']
 */
export function exactSumNames(p: number): string[] {
  return ['shift', 'S', ...range(1, p).map((k) => `M${k}`), 'SSu', 'Lu', 'uAbs'];
}

function range(from: number, to: number): number[] {
  return Array.from({ length: Math.max(0, to - from) }, (_, i) => from + i);
}


let current: VoxelSumsKernels | null = null;

/**
 * The kernels with a memory of at least `bytes` bytes. The module is compiled once per thread; its
 * instance is kept and replaced by one with a new, larger memory when a call needs more (the old
 * memory is left to the garbage collector, never grown: see above).
 * @param p - drift terms (polynomial order + 1); checked here
 * @param bytes - memory the call needs
 * @returns memory and the two kernels
 * @throws BoldsweepError INVALID_ARGUMENT when p is not an integer in 1..64; KERNEL_MISSING when the
 *   package is not built
 * @example const k = voxelSumsKernels(3, 1 << 20); k.look(src, cols, rows, fitStart, weights, out, -Infinity, cols, mats, 3, scratch)
 */
export function voxelSumsKernels(p: number, bytes: number): VoxelSumsKernels {
  if (!Number.isInteger(p) || p < 1 || p > 64) fail('INVALID_ARGUMENT', `detrendOrder must be an integer in 0..63, got ${p - 1}`);
  if (!current || current.bytes < bytes) {
    const pages = Math.max(1, Math.ceil(bytes / 65536));
    const { memory, exports } = loadKernelModule('voxel-sums').instantiate(pages);
    current = { memory, bytes: pages * 65536, look: exports.look as SumsKernel, exact: exports.exact as SumsKernel };
  }
  return current;
}

/**
 * Let go of the kept instance and its memory (the block of rows: about 4 MB), for a thread that will
 * not sum again for a long while: a sweep's worker after its tSNR tasks, the main thread after the
 * look. The next call makes a new instance (the compiled module is kept).
 * @returns nothing
 * @example releaseVoxelSumsKernels()
 */
export function releaseVoxelSumsKernels(): void {
  current = null;
}
