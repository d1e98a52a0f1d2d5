import { fail } from '../core/fail.js';
import { loadKernelModule, type KernelMemory } from '../core/load-kernel-module.js';

/**
 * The symmetric 1-D convolution of the separable smoothing, a WebAssembly SIMD kernel written in
 * kernels/gaussian-conv.ts (AssemblyScript, compiled at build time). For i = 0..len-1 it computes
 *   dst[i] = w0 src[i] + w1 (src[i + m1] + src[i + p1]) + ... + wr (src[i + mr] + src[i + pr])
 * summed left to right in Float64 (WebAssembly never fuses multiply-add, so every thread and lane
 * gives the same bits as the scalar expression). Offsets are relative, in bytes, so one call can sweep
 * a whole block of rows or planes whose neighbours lie at a fixed distance.
 *
 * Call signature of `conv`: (dst, src, len, offs, w, r) with dst/src byte addresses in `memory`,
 * len the number of Float64 values, offs the address of 2r Int32 byte offsets [m1, p1, m2, p2, ...],
 * w the address of r + 1 Float64 weights [w0 .. wr] and r the radius.
 */
export interface ConvKernels {
  memory: WasmMemory;
  /** Bytes of `memory` (fixed: it is never grown). */
  bytes: number;
  conv: (dst: number, src: number, len: number, offs: number, w: number, r: number) => void;
  /** Float32 rows (stride nx values) -> Float64 rows (stride px values): (dst, src, rows, nx, px). */
  widen: (dst: number, src: number, rows: number, nx: number, px: number) => void;
  /** Float64 rows (stride px values) -> Float32 rows (stride nx values), rounded to nearest: (dst, src, rows, nx, px). */
  narrow: (dst: number, src: number, rows: number, nx: number, px: number) => void;
}

/** The part of WebAssembly.Memory used here. */
export type WasmMemory = KernelMemory;

let current: ConvKernels | null = null;

/**
 * The convolution kernels working in a memory of at least `bytes` bytes. One instance serves every
 * plan of the thread. A call that needs more memory gets a new instance with a new, larger memory; the
 * old one is left to the garbage collector and is never grown: growing a WebAssembly memory detaches
 * its ArrayBuffer, and in V8 the first detach in a thread switches every typed-array access of all
 * later optimised code to a slower checked form (a plain summing loop took twice as long afterwards,
 * measured in Node 20).
 * @param radii - kernel radii the caller will use (e.g. [rx, ry, rz]); checked here
 * @param bytes - memory the caller needs. __Default value:__ one 64 KiB page
 * @returns memory (and its size), conv, widen and narrow
 * @throws BoldsweepError INVALID_ARGUMENT when a radius is not an integer in 0..4096 or bytes is not a
 *   non-negative integer below 4 GiB; KERNEL_MISSING when the package is not built
 * @example const k = convKernels([3, 3, 2], 1 << 20); k.conv(dst, src, len, offs, w, 3)
 */
export function convKernels(radii: readonly number[], bytes = 65536): ConvKernels {
  for (const r of radii) if (!Number.isInteger(r) || r < 0 || r > 4096) fail('INVALID_ARGUMENT', `kernel radius must be an integer in 0..4096, got ${r}`);
  if (!Number.isInteger(bytes) || bytes < 0 || bytes >= 2 ** 32) fail('INVALID_ARGUMENT', `memory size must be an integer number of bytes below 4 GiB, got ${bytes}`);
  if (current && current.bytes >= bytes) return current;
  // a quarter more than asked when it grows: plans for slightly wider kernels on the same grid (a
  // sweep of widths) then fit without another instance
  const grown = current !== null;
  const pages = Math.max(1, Math.ceil((grown ? bytes * 1.25 : bytes) / 65536));
  const { memory, exports } = loadKernelModule('gaussian-conv').instantiate(pages);
  type RowCopy = ConvKernels['widen'];
  current = { memory, bytes: pages * 65536, conv: exports.conv as ConvKernels['conv'], widen: exports.widen as RowCopy, narrow: exports.narrow as RowCopy };
  return current;
}
