/**
 * The per-voxel time sums behind the look, compiled to WebAssembly SIMD (two Float64 lanes = two
 * neighbouring voxels) and generated here byte by byte for each number p of drift terms.
 *
 * Why WebAssembly: every look statistic needs several Float64 operations per voxel and volume.
 * JavaScript runs them one value at a time with a bounds check per typed-array access, which costs
 * several times a plain pass over the run; two lanes per instruction, no bounds checks and accumulators
 * held in registers bring the sums close to the cost of reading the data.
 *
 * Both kernels read a block of `rows` rows of `cols` Float32 values, `stride` values apart (row i = one
 * volume's values for the block's voxels, `cols` a multiple of {@link VOXELS_PER_STEP}), and a table of
 * p Float64 weights per row, [adj_i, w_1(i) .. w_{p-1}(i)]: adj_i = 1 when row i - 1 is the volume just
 * before row i (a lag-1 pair), w_k the drift terms (orthonormal over the fit rows [fitStart, rows) and
 * orthogonal to the constant there). Per voxel, with z_i = y_i - shift and shift = y at row fitStart:
 *
 *   look  (all rows)    S = sum z, SS = sum z^2, M_k = sum z w_k (the rows must be consecutive
 *                       volumes: adj is not read);
 *         (fit rows)    c_0 = mean z, c_k = sum z w_k  (the least-squares drift fit g over the fit rows),
 *                       and with u = z - c_0 - sum_k c_k w_k: uAbs = max |u| and Lu = sum u_i u_{i-1}
 *                       over pairs of fit rows; skipped (uAbs +inf, Lu 0) when both voxels' mean over
 *                       the fit rows is below `theta`. For p <= {@link MAX_DIFFERENCE_TERMS} the drift
 *                       term of u is stepped from row to row by forward differences (p - 1 additions
 *                       instead of p - 1 weight loads and multiplications), started from V c with
 *                       V[j][k] = the j-th forward difference of w_k at fitStart (a fourth p x p matrix
 *                       at `mats`); their rounding error grows like rows^(p-1), harmless for p <= 3.
 *   exact (all rows)    S, M_k, then with the fit over all rows and u as above: SSu = sum u^2,
 *                       Lu = sum adj_i u_i u_{i-1}, uAbs (the two-pass residual sums: the rows stay in
 *                       cache between the two loops, so the run is read once).
 *
 * For p <= {@link MAX_CUMULATIVE_TERMS} the look kernel gets the drift projections without a multiply
 * per row: it keeps repeated running sums C_1 += z, C_2 += C_1, ..., C_p += C_{p-1}, which after the
 * rows equal sum_i z_i phi_m(i) for fixed polynomials phi_m of degree m - 1 (binomial coefficients of
 * the rows left), separately for the rows before fitStart and the fit rows. Any polynomial moment is
 * a fixed combination of these; the caller passes, at `mats`, three p x p matrices (row-major): A_F maps
 * the fit rows' sums to the fit c, B_F and A_h map the fit rows' and the earlier rows' sums to the
 * whole-run moments (S, M_1, ...). With the shift these sums stay far from overflow and cancellation
 * for the low orders used here (see runTimeSums).
 *
 * Outputs are Float64 arrays of `stride` values at `out`, one after another, in the order of
 * {@link lookSumNames} / {@link exactSumNames}. WebAssembly never fuses multiply-add, so the results
 * equal the scalar expressions evaluated in the order written.
 *
 * The memory is imported and made at the size a call needs, never grown: growing a WebAssembly
 * memory detaches its old ArrayBuffer, and in V8 the first detach anywhere in a process switches every
 * typed-array access of all later optimised code to a slower checked form (a plain summing loop took
 * twice as long afterwards, measured in Node 20).
 */
import { fail } from '../core/fail.js';
import { section, simdOp, sleb, uleb, vec, wasmName } from '../core/wasm-encoding.js';

/** The part of WebAssembly.Memory used here (the project's TypeScript lib has no WebAssembly types). */
export interface SumsMemory {
  readonly buffer: ArrayBuffer;
}

/**
 * Kernel call: (src, cols, rows, fitStart, weights, out, theta, stride, mats): byte addresses or counts;
 * for the look kernel, theta is the level below which a voxel pair's residual loop is skipped
 * (-Infinity: never) and mats the address of A_F, B_F, A_h, V (p x p each; the first three used when
 * p <= MAX_CUMULATIVE_TERMS); stride is the row length in values of both the block and the outputs (>= cols).
 */
export type SumsKernel = (src: number, cols: number, rows: number, fitStart: number, weights: number, out: number, theta: number, stride: number, mats: number) => void;

/** Drift terms up to which the look kernel uses repeated running sums instead of weights (see above). */
export const MAX_CUMULATIVE_TERMS = 4;

/**
 * Drift terms up to which the look kernel steps its residuals' drift by forward differences: with 3 the
 * error stayed below 1e-11 of the signal over 3000 volumes; with 4 it reached 4e-9 over 1000 volumes and
 * with 7 several percent over 500, so higher orders use the weights.
 */
export const MAX_DIFFERENCE_TERMS = 3;

/** The two kernels of one drift order and the memory they work in. */
export interface VoxelSumsKernels {
  memory: SumsMemory;
  /** Bytes of `memory`. */
  bytes: number;
  look: SumsKernel;
  exact: SumsKernel;
  /** Number of drift terms p (order + 1). */
  terms: number;
}

interface WasmApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: Record<string, Record<string, unknown>>) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number }) => SumsMemory;
}
const wasm = (globalThis as unknown as { WebAssembly: WasmApi }).WebAssembly;

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

// ---- encoding (WebAssembly core 2.0 with fixed-width SIMD) ----
const name = wasmName;
const get = (l: number): number[] => [0x20, ...uleb(l)];
const set = (l: number): number[] => [0x21, ...uleb(l)];
const i32 = (n: number): number[] => [0x41, ...sleb(n)];
const I32_ADD = 0x6a, I32_MUL = 0x6c, I32_SUB = 0x6b, I32_SHL = 0x74, I32_GE_U = 0x4f, I32_GT_U = 0x4b;
const F64_CONVERT_I32_S = 0xb7;
const BLOCK = 0x02, LOOP = 0x03, IF = 0x04, ELSE = 0x05, END = 0x0b, BR = 0x0c, BR_IF = 0x0d, VOID = 0x40;
const simd = simdOp;
const LOAD64_ZERO = (offset: number): number[] => simd(0x5d, 3, ...uleb(offset));
const LOAD64_SPLAT = (offset: number): number[] => simd(0x0a, 3, ...uleb(offset));
const STORE = (offset: number): number[] => simd(0x0b, 4, ...uleb(offset));
const PROMOTE = simd(0x5f);
const SPLAT = simd(0x14);
const ADD = simd(0xf0), SUB = simd(0xf1), MUL = simd(0xf2), DIV = simd(0xf3);
// pmin/pmax (b < a ? b : a) compile to one minpd/maxpd; min/max need a NaN- and signed-zero-exact sequence.
// A NaN value is not carried into the extremes, but such a voxel's sums are NaN and it is marked unusable.
const MIN = simd(0xf6), MAX = simd(0xf7);
const LT = simd(0x49), ALL_TRUE = simd(0xc3), NEG = simd(0xed); // f64x2.lt, i64x2.all_true, f64x2.neg
const constF64x2 = (x: number): number[] => {
  const b = new Uint8Array(16);
  const dv = new DataView(b.buffer);
  dv.setFloat64(0, x, true);
  dv.setFloat64(8, x, true);
  return simd(0x0c, ...b);
};

/**
 * Rows per loop step. The rows of a step are combined first (z_0 + z_1, max(u_0, u_1), ...) and then
 * added to each accumulator once: every accumulator is one chain of dependent additions, and with one
 * addition per row the loop could wait on that chain. Measured in Node 20 on x64: 2 rows about as fast
 * as 1, 4 slower (register spills); the knob stays at 2.
 */
const UNROLL = 2;

/**
 * for (; I + UNROLL <= END; I += UNROLL) step(UNROLL) then for (; I < END; I++) step(1); step(u) handles
 * rows I .. I + u - 1 (row k's data at PTR + ROWB_k, ROWB_0 = 0; its weights at WP + 8 p k).
 */
function rowLoop(L: { I: number; PTR: number; WP: number; ROWB: number[] }, endCode: number[], p: number, step: (rows: number) => number[]): number[] {
  const out: number[] = [];
  if (UNROLL > 1) {
    out.push(BLOCK, VOID, LOOP, VOID, ...get(L.I), ...i32(UNROLL), I32_ADD, ...endCode, I32_GT_U, BR_IF, 1);
    out.push(...step(UNROLL));
    out.push(
      ...get(L.PTR), ...get(L.ROWB[UNROLL]), I32_ADD, ...set(L.PTR),
      ...get(L.WP), ...i32(8 * p * UNROLL), I32_ADD, ...set(L.WP),
      ...get(L.I), ...i32(UNROLL), I32_ADD, ...set(L.I),
      BR, 0, END, END,
    );
  }
  out.push(
    BLOCK, VOID, LOOP, VOID, ...get(L.I), ...endCode, I32_GE_U, BR_IF, 1,
    ...step(1),
    ...get(L.PTR), ...get(L.ROWB[1]), I32_ADD, ...set(L.PTR),
    ...get(L.WP), ...i32(8 * p), I32_ADD, ...set(L.WP),
    ...get(L.I), ...i32(1), I32_ADD, ...set(L.I),
    BR, 0, END, END,
  );
  return out;
}

/** Pairwise sum (or other combination) of the code pieces, leaving one value on the stack. */
function tree(terms: number[][], op: number[]): number[] {
  if (terms.length === 1) return terms[0];
  const half = terms.length >> 1;
  return [...tree(terms.slice(0, half), op), ...tree(terms.slice(half), op), ...op];
}

/** Voxels per kernel step: one SIMD vector of two Float64 lanes (two vectors per step spilled registers and ran slower in V8). */
export const VOXELS_PER_STEP = 2;

/** Function body of the look (exact = false) or exact kernel for p drift terms. */
function kernelBody(p: number, exact: boolean): number[] {
  const SRC = 0, COLS = 1, ROWS = 2, FIT = 3, W = 4, OUT = 5, THETA = 6, STRIDE = 7, MATS = 8;
  const cumulative = !exact && p <= MAX_CUMULATIVE_TERMS;
  const differences = !exact && p <= MAX_DIFFERENCE_TERMS;
  let next = 9;
  const J = next++, PTR = next++, WP = next++, I = next++, COLB = next++;
  const ROWB = range(0, UNROLL + 1).map(() => next++); // k * row bytes
  const nI32 = next - 9;
  const firstV = next;
  const Z = range(0, UNROLL).map(() => next++);
  const SH = next++, S = next++, SS = next++;
  const M = range(0, p).map(() => next++); // weights: M[k] = sum z w_k (k >= 1); cumulative: running sums C_1..C_p
  const SNAP = range(0, p).map(() => next++); // look: the sums over rows before fitStart
  const MBAR = range(0, p).map(() => next++); // whole-run moments S, M_1, ...
  const C = range(0, p).map(() => next++); // the fit over the fit rows
  const SH2 = next++, UMAX = next++, UMIN = next++, SSU = next++, LU = next++, UPREV = next++;
  const GD = range(0, p).map(() => next++); // look: forward differences of the drift term of u
  const nV128 = next - firstV;
  const loopLocals = { I, PTR, WP, ROWB };
  const rowAddr = (k: number): number[] => (k === 0 ? get(PTR) : [...get(PTR), ...get(ROWB[k]), I32_ADD]);
  const weight = (r: number, k: number): number[] => [...get(WP), ...LOAD64_SPLAT(8 * (p * r + k))];
  const mat = (which: number, k: number, m: number): number[] => [...get(MATS), ...LOAD64_SPLAT(8 * (which * p * p + k * p + m))];

  const zero = constF64x2(0);
  const c: number[] = [];
  for (let k = 0; k <= UNROLL; k++) c.push(...get(STRIDE), ...i32(2), I32_SHL, ...i32(k), I32_MUL, ...set(ROWB[k]));
  c.push(...get(STRIDE), ...i32(3), I32_SHL, ...set(COLB));
  c.push(...i32(0), ...set(J));
  c.push(BLOCK, VOID, LOOP, VOID, ...get(J), ...get(COLS), I32_GE_U, BR_IF, 1);

  // shift: each voxel's value at row fitStart
  c.push(...get(SRC), ...get(FIT), ...get(ROWB[1]), I32_MUL, I32_ADD, ...get(J), ...i32(2), I32_SHL, I32_ADD, ...LOAD64_ZERO(0), ...PROMOTE, ...set(SH));
  for (const a of [S, SS, ...M]) c.push(...zero, ...set(a));

  // loop A: sums over all rows (look: split at fitStart to keep the sums of the rows before the fit rows)
  const aBody = (rows: number): number[] => {
    const b: number[] = [];
    const R = range(0, rows);
    for (const r of R) b.push(...rowAddr(r), ...LOAD64_ZERO(0), ...PROMOTE, ...get(SH), ...SUB, ...set(Z[r]));
    if (!exact) b.push(...get(SS), ...tree(R.map((r) => [...get(Z[r]), ...get(Z[r]), ...MUL]), ADD), ...ADD, ...set(SS));
    if (cumulative) {
      // C_1 += z; C_m += C_{m-1}, row by row (the order matters: each level sums the one below)
      for (const r of R) {
        b.push(...get(M[0]), ...get(Z[r]), ...ADD, ...set(M[0]));
        for (let m = 1; m < p; m++) b.push(...get(M[m]), ...get(M[m - 1]), ...ADD, ...set(M[m]));
      }
    } else {
      b.push(...get(S), ...tree(R.map((r) => get(Z[r])), ADD), ...ADD, ...set(S));
      for (let k = 1; k < p; k++) b.push(...get(M[k]), ...tree(R.map((r) => [...get(Z[r]), ...weight(r, k), ...MUL]), ADD), ...ADD, ...set(M[k]));
    }
    return b;
  };
  const startRows = (atRow: number[]): number[] => [
    ...get(SRC), ...atRow, ...get(ROWB[1]), I32_MUL, I32_ADD, ...get(J), ...i32(2), I32_SHL, I32_ADD, ...set(PTR),
    ...get(W), ...atRow, ...i32(8 * p), I32_MUL, I32_ADD, ...set(WP),
    ...atRow, ...set(I),
  ];
  c.push(...startRows(i32(0)));
  if (!exact) {
    c.push(...rowLoop(loopLocals, get(FIT), p, aBody));
    if (cumulative) for (let m = 0; m < p; m++) c.push(...get(M[m]), ...set(SNAP[m]), ...zero, ...set(M[m]));
    else { c.push(...get(S), ...set(SNAP[0])); for (let k = 1; k < p; k++) c.push(...get(M[k]), ...set(SNAP[k])); }
  }
  c.push(...rowLoop(loopLocals, get(ROWS), p, aBody));

  // the drift fit over the fit rows (mean and projections: the w_k are orthonormal there) and the
  // whole-run moments
  const fitCount = [...get(ROWS), ...get(FIT), I32_SUB, F64_CONVERT_I32_S, ...SPLAT];
  if (cumulative) {
    // c = A_F G, M-bar = B_F G + A_h P (G = the fit rows' running sums, now in M; P = SNAP)
    for (let k = 0; k < p; k++) {
      c.push(...tree(range(0, p).map((m) => [...mat(0, k, m), ...get(M[m]), ...MUL]), ADD), ...set(C[k]));
      c.push(...tree([...range(0, p).map((m) => [...mat(1, k, m), ...get(M[m]), ...MUL]), ...range(0, p).map((m) => [...mat(2, k, m), ...get(SNAP[m]), ...MUL])], ADD), ...set(MBAR[k]));
    }
  } else if (exact) {
    c.push(...get(S), ...fitCount, ...DIV, ...set(C[0]), ...get(S), ...set(MBAR[0]));
    for (let k = 1; k < p; k++) c.push(...get(M[k]), ...set(C[k]), ...get(M[k]), ...set(MBAR[k]));
  } else {
    c.push(...get(S), ...get(SNAP[0]), ...SUB, ...fitCount, ...DIV, ...set(C[0]), ...get(S), ...set(MBAR[0]));
    for (let k = 1; k < p; k++) c.push(...get(M[k]), ...get(SNAP[k]), ...SUB, ...set(C[k]), ...get(M[k]), ...set(MBAR[k]));
  }
  c.push(...get(SH), ...get(C[0]), ...ADD, ...set(SH2));
  if (differences) {
    // GD_j = sum_k V[j][k] c_k: the drift term and its forward differences at the first fit row
    for (let j = 0; j < p; j++) {
      if (p === 1) { c.push(...zero, ...set(GD[j])); continue; }
      c.push(...tree(range(1, p).map((k) => [...mat(3, j, k), ...get(C[k]), ...MUL]), ADD), ...set(GD[j]));
    }
  }
  c.push(...zero, ...set(SSU), ...zero, ...set(LU), ...zero, ...set(UPREV));

  // loop B: residuals of that fit over the fit rows (the rows are still in cache)
  const bBody = (rows: number): number[] => {
    const b: number[] = [];
    const R = range(0, rows);
    for (const r of R) {
      b.push(...rowAddr(r), ...LOAD64_ZERO(0), ...PROMOTE, ...get(SH2), ...SUB);
      if (!differences) for (let k = 1; k < p; k++) b.push(...get(C[k]), ...weight(r, k), ...MUL, ...SUB);
      else {
        b.push(...get(GD[0]), ...SUB);
        for (let j = 0; j + 1 < p; j++) b.push(...get(GD[j]), ...get(GD[j + 1]), ...ADD, ...set(GD[j]));
      }
      b.push(...set(Z[r])); // u of row r
    }
    b.push(...get(UMAX), ...tree(R.map((r) => get(Z[r])), MAX), ...MAX, ...set(UMAX));
    b.push(...get(UMIN), ...tree(R.map((r) => get(Z[r])), MIN), ...MIN, ...set(UMIN));
    if (exact) b.push(...get(SSU), ...tree(R.map((r) => [...get(Z[r]), ...get(Z[r]), ...MUL]), ADD), ...ADD, ...set(SSU));
    // lag-1 pairs: exact weighs each by adj; look pairs consecutive fit rows (UPREV is 0 at the first)
    b.push(...get(LU), ...tree(R.map((r) => [...get(Z[r]), ...get(r === 0 ? UPREV : Z[r - 1]), ...MUL, ...(exact ? [...weight(r, 0), ...MUL] : [])]), ADD), ...ADD, ...set(LU));
    b.push(...get(Z[rows - 1]), ...set(UPREV));
    return b;
  };
  const loopB = [
    ...constF64x2(-Infinity), ...set(UMAX), ...constF64x2(Infinity), ...set(UMIN),
    ...startRows(get(FIT)),
    ...rowLoop(loopLocals, get(ROWS), p, bBody),
  ];
  if (exact) c.push(...loopB);
  else {
    // look: voxels whose mean lies below theta (background) get no residual sums (umax +inf, umin
    // -inf: "no bound", so a screen falls back to their data; Lu 0)
    c.push(...get(SH2), ...get(THETA), ...SPLAT, ...LT, ...ALL_TRUE);
    c.push(IF, VOID, ...constF64x2(Infinity), ...set(UMAX), ...constF64x2(-Infinity), ...set(UMIN), ELSE, ...loopB, END);
  }
  c.push(...get(UMAX), ...get(UMIN), ...NEG, ...MAX, ...set(UMAX)); // uAbs = max(umax, -umin)

  // store: output array q at out + q * stride * 8, these voxels at + J * 8
  const outputs = exact ? [SH, MBAR[0], ...MBAR.slice(1), SSU, LU, UMAX] : [SH, MBAR[0], SS, ...MBAR.slice(1), ...C, UMAX, LU];
  outputs.forEach((local, q) => {
    c.push(...get(OUT), ...get(COLB), ...i32(q), I32_MUL, I32_ADD, ...get(J), ...i32(3), I32_SHL, I32_ADD, ...get(local), ...STORE(0));
  });
  c.push(...get(J), ...i32(VOXELS_PER_STEP), I32_ADD, ...set(J), BR, 0, END, END);
  c.push(END);
  const body = [...vec([[...uleb(nI32), 0x7f], [...uleb(nV128), 0x7b]]), ...c];
  return [...uleb(body.length), ...body];
}

/**
 * Bytes of a WebAssembly module importing `env.memory` and exporting `look` and `exact` for p drift terms.
 * @param p - drift terms (polynomial order + 1), 1..64
 * @returns the module bytes
 * @example new WebAssembly.Module(voxelSumsModuleBytes(3))
 */
export function voxelSumsModuleBytes(p: number): Uint8Array {
  const type = [0x60, ...vec([[0x7f], [0x7f], [0x7f], [0x7f], [0x7f], [0x7f], [0x7c], [0x7f], [0x7f]]), 0];
  const bytes = [
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, vec([type])),
    ...section(2, vec([[...name('env'), ...name('memory'), 0x02, 0x00, 1]])), // imported memory, at least one 64 KiB page
    ...section(3, vec([[0], [0]])),
    ...section(7, vec([[...name('look'), 0x00, 0], [...name('exact'), 0x00, 1]])),
    ...section(10, vec([kernelBody(p, false), kernelBody(p, true)])),
  ];
  return Uint8Array.from(bytes);
}

const modules = new Map<number, object>();
const instances = new Map<number, VoxelSumsKernels>();

/**
 * The kernels for p drift terms with a memory of at least `bytes` bytes. Each order's module is
 * compiled once per thread; its instance is kept and replaced by one with a new, larger memory when
 * a call needs more (the old memory is left to the garbage collector, never grown: see above).
 * @param p - drift terms (polynomial order + 1)
 * @param bytes - memory the call needs
 * @returns memory and the two kernels
 * @throws BoldsweepError INVALID_ARGUMENT when p is not an integer in 1..64
 * @example const k = voxelSumsKernels(3, 1 << 20); k.look(src, cols, rows, fitStart, weights, out, -Infinity, cols, mats)
 */
export function voxelSumsKernels(p: number, bytes: number): VoxelSumsKernels {
  if (!Number.isInteger(p) || p < 1 || p > 64) fail('INVALID_ARGUMENT', `detrendOrder must be an integer in 0..63, got ${p - 1}`);
  let k = instances.get(p);
  if (!k || k.bytes < bytes) {
    let module = modules.get(p);
    if (!module) { module = new wasm.Module(voxelSumsModuleBytes(p)); modules.set(p, module); }
    const pages = Math.max(1, Math.ceil(bytes / 65536));
    const memory = new wasm.Memory({ initial: pages });
    const instance = new wasm.Instance(module, { env: { memory } });
    k = { memory, bytes: pages * 65536, look: instance.exports.look as SumsKernel, exact: instance.exports.exact as SumsKernel, terms: p };
    instances.set(p, k);
  }
  return k;
}
