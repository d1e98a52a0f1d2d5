import { fail } from '../core/fail.js';
import { loadKernelModule, type KernelMemory } from '../core/load-kernel-module.js';

/**
 * The linear kernel of resampleVoxels for a whole volume, a WebAssembly kernel written in
 * kernels/trilinear.ts (AssemblyScript, compiled at build time; that file states what it computes).
 * It gives the bytes of the TypeScript row routine (same Float64 operations in the same order;
 * WebAssembly never fuses multiply-add) without a bounds check per tap: 3.5 ms a 64 x 64 x 36 volume
 * in TypeScript, about 1.6 ms CPU here (Node 20, measured on the loaded 2-core machine; see DEVELOPERS.md).
 *
 * Memory layout of one call (byte addresses): the parameters (32 Float64) at 0, the list of voxels
 * left to the generic path (their output indices, at most one per output voxel) at {@link LIST_AT}, then the
 * source (Float32) and the output (Float32). The memory is made at the size a call needs and never
 * grown (see src/core/load-kernel-module.ts).
 */
export interface TrilinearKernel {
  /** Bytes of the memory. */
  bytes: number;
  memory: KernelMemory;
  /** Byte address of the source values. */
  sourceAt: number;
  /** Byte address of the output values. */
  outAt: number;
  /**
   * (params, src, nx, ny, nz, shift, out, ox, oy, oz, constant, list) -> number of list entries; see
   * kernels/trilinear.ts.
   */
  linearVolume: (params: number, src: number, nx: number, ny: number, nz: number, shift: number, out: number, ox: number, oy: number, oz: number, constant: number, list: number) => number;
  /** (at, n) -> how many of the n Float32 values at byte address `at` are NaN or infinite. */
  countNonFinite: (at: number, n: number) => number;
}

/** Byte address of the list of generic-path voxels (after the 32 Float64 parameters). */
export const LIST_AT = 256;

/** Bytes of one list entry: the output index (Int32); the caller recomputes the position. */
export const LIST_ENTRY_BYTES = 4;

let current: TrilinearKernel | null = null;

/**
 * The trilinear kernel with room for a source of `sourceValues` and an output of `outValues` Float32
 * values. One instance per thread, replaced by one with a larger memory when a call needs more.
 * @param sourceValues - values of the source (margin included)
 * @param outValues - values of the output volume
 * @returns the kernel, its memory and where the source and output go
 * @throws BoldsweepError INVALID_ARGUMENT when the sizes need 4 GiB or more; KERNEL_MISSING when the
 *   package is not built
 * @example const k = trilinearKernel(66 * 66 * 38, 64 * 64 * 36); new Float32Array(k.memory.buffer, k.sourceAt, 66 * 66 * 38).set(values)
 */
export function trilinearKernel(sourceValues: number, outValues: number): TrilinearKernel {
  const sourceAt = align16(LIST_AT + LIST_ENTRY_BYTES * outValues);
  const outAt = align16(sourceAt + 4 * sourceValues);
  const bytes = outAt + 4 * outValues;
  if (!(bytes < 2 ** 32)) fail('INVALID_ARGUMENT', `a trilinear kernel call of ${sourceValues} source and ${outValues} output values needs 4 GiB or more`);
  if (current && current.bytes >= bytes) return { ...current, sourceAt, outAt };
  const pages = Math.max(1, Math.ceil(bytes / 65536));
  const { memory, exports } = loadKernelModule('trilinear').instantiate(pages);
  current = { memory, bytes: pages * 65536, sourceAt, outAt, linearVolume: exports.linearVolume as TrilinearKernel['linearVolume'], countNonFinite: exports.countNonFinite as TrilinearKernel['countNonFinite'] };
  return current;
}

function align16(bytes: number): number {
  return (bytes + 15) & ~15;
}
