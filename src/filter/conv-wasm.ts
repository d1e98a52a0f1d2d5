import { fail } from '../core/fail.js';
import { section, simdOp, sleb, uleb, vec, wasmName } from '../core/wasm-encoding.js';

/**
 * A symmetric 1-D convolution kernel compiled to WebAssembly SIMD (two Float64 lanes), generated
 * here byte by byte for each radius r with the taps unrolled. For i = 0..len-1 it computes
 *   dst[i] = w0 src[i] + w1 (src[i + m1] + src[i + p1]) + ... + wr (src[i + mr] + src[i + pr])
 * summed left to right in Float64 (WebAssembly never fuses multiply-add, so every thread and lane
 * gives the same bits as the scalar expression). Offsets are relative, in bytes, so one call can sweep
 * a whole block of rows or planes whose neighbours lie at a fixed distance.
 *
 * Call signature of `conv[r]`: (dst, src, len, offs, w) with dst/src byte addresses in `memory`,
 * len the number of Float64 values, offs the address of 2r Int32 byte offsets [m1, p1, m2, p2, ...]
 * and w the address of r + 1 Float64 weights [w0 .. wr].
 */
export interface ConvKernels {
  memory: WasmMemory;
  /** Bytes of `memory` (fixed: it is never grown). */
  bytes: number;
  conv: Map<number, (dst: number, src: number, len: number, offs: number, w: number) => void>;
  /** Float32 rows (stride nx values) -> Float64 rows (stride px values): (dst, src, rows, nx, px). */
  widen: (dst: number, src: number, rows: number, nx: number, px: number) => void;
  /** Float64 rows (stride px values) -> Float32 rows (stride nx values), rounded to nearest: (dst, src, rows, nx, px). */
  narrow: (dst: number, src: number, rows: number, nx: number, px: number) => void;
}

/** The part of WebAssembly.Memory used here (the project's TypeScript lib has no WebAssembly types). */
export interface WasmMemory {
  readonly buffer: ArrayBuffer;
}
interface WasmApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: Record<string, Record<string, unknown>>) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number }) => WasmMemory;
}
const wasm = (globalThis as unknown as { WebAssembly: WasmApi }).WebAssembly;

// opcodes (WebAssembly core spec 1.0 and the fixed-width SIMD proposal)
const OP = {
  block: 0x02, loop: 0x03, if: 0x04, end: 0x0b, br: 0x0c, brIf: 0x0d, void: 0x40,
  localGet: 0x20, localSet: 0x21, i32Load: 0x28, f64Load: 0x2b, f64Store: 0x39, i32Const: 0x41,
  i32GeU: 0x4f, i32Add: 0x6a, i32Mul: 0x6c, i32And: 0x71, i32Shl: 0x74, f64Add: 0xa0, f64Mul: 0xa2, simd: 0xfd,
  f32Load: 0x2a, f32Store: 0x38, f32DemoteF64: 0xb6, f64PromoteF32: 0xbb,
} as const;
const SIMD = { v128Load: 0x00, v128Store: 0x0b, f64x2Splat: 0x14, f64x2Add: 0xf0, f64x2Mul: 0xf2 } as const;
const T = { i32: 0x7f, f64: 0x7c, v128: 0x7b, func: 0x60 } as const;

const str = wasmName;
const simd = simdOp;

/** Body of conv for radius r (see {@link ConvKernels}). */
function convBody(r: number): number[] {
  // params: 0 dst, 1 src, 2 len, 3 offs, 4 w; locals: 5 i, 6 end2, then bases, vector and scalar weights
  const I = 5, END = 6;
  const bm = (d: number) => 7 + 2 * (d - 1);
  const bp = (d: number) => 8 + 2 * (d - 1);
  const wv = (d: number) => 7 + 2 * r + d;
  const ws = (d: number) => 8 + 3 * r + d;
  const get = (l: number) => [OP.localGet, ...uleb(l)];
  const set = (l: number) => [OP.localSet, ...uleb(l)];
  const code: number[] = [];
  // prologue: absolute tap bases (src + offset) and weights
  for (let d = 1; d <= r; d++) {
    code.push(...get(1), ...get(3), OP.i32Load, 2, ...uleb(8 * (d - 1)), OP.i32Add, ...set(bm(d)));
    code.push(...get(1), ...get(3), OP.i32Load, 2, ...uleb(8 * (d - 1) + 4), OP.i32Add, ...set(bp(d)));
  }
  for (let d = 0; d <= r; d++) {
    code.push(...get(4), OP.f64Load, 3, ...uleb(8 * d), ...set(ws(d)));
    code.push(...get(ws(d)), ...simd(SIMD.f64x2Splat), ...set(wv(d)));
  }
  // end2 = (len & ~1) * 8 bytes
  code.push(...get(2), OP.i32Const, ...sleb(-2), OP.i32And, OP.i32Const, 3, OP.i32Shl, ...set(END));
  code.push(OP.i32Const, 0, ...set(I));
  // vector loop, two values per step
  code.push(OP.block, OP.void, OP.loop, OP.void);
  code.push(...get(I), ...get(END), OP.i32GeU, OP.brIf, 1);
  code.push(...get(0), ...get(I), OP.i32Add); // store address
  code.push(...get(1), ...get(I), OP.i32Add, ...simd(SIMD.v128Load, 3, 0), ...get(wv(0)), ...simd(SIMD.f64x2Mul));
  for (let d = 1; d <= r; d++) {
    code.push(...get(bm(d)), ...get(I), OP.i32Add, ...simd(SIMD.v128Load, 3, 0));
    code.push(...get(bp(d)), ...get(I), OP.i32Add, ...simd(SIMD.v128Load, 3, 0));
    code.push(...simd(SIMD.f64x2Add), ...get(wv(d)), ...simd(SIMD.f64x2Mul), ...simd(SIMD.f64x2Add));
  }
  code.push(...simd(SIMD.v128Store, 3, 0));
  code.push(...get(I), OP.i32Const, 16, OP.i32Add, ...set(I), OP.br, 0, OP.end, OP.end);
  // odd tail: one scalar value at i = end2
  code.push(...get(2), OP.i32Const, 1, OP.i32And, OP.if, OP.void);
  code.push(...get(0), ...get(END), OP.i32Add);
  code.push(...get(1), ...get(END), OP.i32Add, OP.f64Load, 3, 0, ...get(ws(0)), OP.f64Mul);
  for (let d = 1; d <= r; d++) {
    code.push(...get(bm(d)), ...get(END), OP.i32Add, OP.f64Load, 3, 0);
    code.push(...get(bp(d)), ...get(END), OP.i32Add, OP.f64Load, 3, 0);
    code.push(OP.f64Add, ...get(ws(d)), OP.f64Mul, OP.f64Add);
  }
  code.push(OP.f64Store, 3, 0, OP.end);
  code.push(OP.end);
  const locals = vec([[...uleb(2 + 2 * r), T.i32], [...uleb(r + 1), T.v128], [...uleb(r + 1), T.f64]]);
  const body = [...locals, ...code];
  return [...uleb(body.length), ...body];
}

/**
 * Body of a row copy with type change: params dst, src, rows, nx, px (Float64 rows have stride px,
 * Float32 rows stride nx); `widen` reads Float32 and writes Float64, `narrow` the reverse.
 */
function copyRowsBody(widen: boolean): number[] {
  const Q = 5, I = 6, DP = 7, SP = 8;
  const get = (l: number) => [OP.localGet, l];
  const set = (l: number) => [OP.localSet, l];
  const [dstShift, srcShift] = widen ? [3, 2] : [2, 3];
  const code: number[] = [
    ...get(0), ...set(DP), ...get(1), ...set(SP), OP.i32Const, 0, ...set(Q),
    OP.block, OP.void, OP.loop, OP.void,
    ...get(Q), ...get(2), OP.i32GeU, OP.brIf, 1,
    OP.i32Const, 0, ...set(I),
    OP.block, OP.void, OP.loop, OP.void,
    ...get(I), ...get(3), OP.i32GeU, OP.brIf, 1,
    ...get(DP), ...get(I), OP.i32Const, dstShift, OP.i32Shl, OP.i32Add,
    ...get(SP), ...get(I), OP.i32Const, srcShift, OP.i32Shl, OP.i32Add,
    ...(widen ? [OP.f32Load, 2, 0, OP.f64PromoteF32, OP.f64Store, 3, 0] : [OP.f64Load, 3, 0, OP.f32DemoteF64, OP.f32Store, 2, 0]),
    ...get(I), OP.i32Const, 1, OP.i32Add, ...set(I), OP.br, 0, OP.end, OP.end,
    // next row: Float64 side advances px values, Float32 side nx values
    ...get(DP), ...get(widen ? 4 : 3), OP.i32Const, dstShift, OP.i32Shl, OP.i32Add, ...set(DP),
    ...get(SP), ...get(widen ? 3 : 4), OP.i32Const, srcShift, OP.i32Shl, OP.i32Add, ...set(SP),
    ...get(Q), OP.i32Const, 1, OP.i32Add, ...set(Q), OP.br, 0, OP.end, OP.end,
    OP.end,
  ];
  const body = [...vec([[4, T.i32]]), ...code];
  return [...uleb(body.length), ...body];
}

/**
 * Bytes of a WebAssembly module importing `env.memory` and exporting one function `conv<r>` per
 * radius, `widen` and `narrow`.
 * @param radii - distinct kernel radii (0 allowed)
 * @returns the module bytes
 * @example new WebAssembly.Module(convModuleBytes([3]))
 */
export function convModuleBytes(radii: readonly number[]): Uint8Array {
  const type = [T.func, ...vec([[T.i32], [T.i32], [T.i32], [T.i32], [T.i32]]), 0];
  const bytes = [
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, vec([type])),
    ...section(2, vec([[...str('env'), ...str('memory'), 0x02, 0x00, 1]])), // imported memory, at least one 64 KiB page
    ...section(3, vec([...radii.map(() => [0]), [0], [0]])),
    ...section(7, vec([
      ...radii.map((r, k) => [...str(`conv${r}`), 0x00, ...uleb(k)]),
      [...str('widen'), 0x00, ...uleb(radii.length)],
      [...str('narrow'), 0x00, ...uleb(radii.length + 1)],
    ])),
    ...section(10, vec([...radii.map((r) => convBody(r)), copyRowsBody(true), copyRowsBody(false)])),
  ];
  return Uint8Array.from(bytes);
}

let current: { maxRadius: number; module: object; kernels: ConvKernels } | null = null;

/**
 * The convolution kernels for radii 0..R (R at least the largest requested and at least 8) working in
 * a memory of at least `bytes` bytes. The module is compiled once per thread (again only for a larger
 * radius) and one instance serves every plan of the thread. A call that needs more memory gets a new
 * instance with a new, larger memory; the old one is left to the garbage collector and is never grown:
 * growing a WebAssembly memory detaches its ArrayBuffer, and in V8 the first detach in a thread
 * switches every typed-array access of all later optimised code to a slower checked form (a plain
 * summing loop took twice as long afterwards, measured in Node 20; see src/look/voxel-sums-wasm.ts).
 * @param radii - kernel radii needed (e.g. [rx, ry, rz])
 * @param bytes - memory the caller needs. __Default value:__ one 64 KiB page
 * @returns memory (and its size), one function per radius 0..R, widen and narrow
 * @throws BoldsweepError INVALID_ARGUMENT when a radius is not an integer in 0..4096 or bytes is not a
 *   non-negative integer below 4 GiB
 * @example const k = convKernels([3, 3, 2], 1 << 20); k.conv.get(3)!(dst, src, len, offs, w)
 */
export function convKernels(radii: readonly number[], bytes = 65536): ConvKernels {
  for (const r of radii) if (!Number.isInteger(r) || r < 0 || r > 4096) fail('INVALID_ARGUMENT', `kernel radius must be an integer in 0..4096, got ${r}`);
  if (!Number.isInteger(bytes) || bytes < 0 || bytes >= 2 ** 32) fail('INVALID_ARGUMENT', `memory size must be an integer number of bytes below 4 GiB, got ${bytes}`);
  const need = Math.max(0, ...radii);
  if (current && current.maxRadius >= need && current.kernels.bytes >= bytes) return current.kernels;
  const maxRadius = Math.max(8, need, current?.maxRadius ?? 0);
  const all = Array.from({ length: maxRadius + 1 }, (_, r) => r);
  const module = current && current.maxRadius === maxRadius ? current.module : new wasm.Module(convModuleBytes(all));
  // never smaller than the memory it replaces, and a quarter more than asked when it grows: plans for
  // slightly wider kernels on the same grid (a sweep of widths) then fit without another instance
  const grown = current !== null && bytes > current.kernels.bytes;
  const pages = Math.max(1, Math.ceil(Math.max(grown ? bytes * 1.25 : bytes, current?.kernels.bytes ?? 0) / 65536));
  const memory = new wasm.Memory({ initial: pages });
  const instance = new wasm.Instance(module, { env: { memory } });
  type Conv = (dst: number, src: number, len: number, offs: number, w: number) => void;
  type RowCopy = (dst: number, src: number, rows: number, nx: number, px: number) => void;
  const conv = new Map<number, Conv>();
  for (const r of all) conv.set(r, instance.exports[`conv${r}`] as Conv);
  current = { maxRadius, module, kernels: { memory, bytes: pages * 65536, conv, widen: instance.exports.widen as RowCopy, narrow: instance.exports.narrow as RowCopy } };
  return current.kernels;
}
