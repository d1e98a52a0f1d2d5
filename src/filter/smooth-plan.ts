import { boundaryIndex, type BoundaryMode } from '../core/boundary-mode.js';
import { convKernels, type ConvKernels } from './conv-wasm.js';

/**
 * Everything the separable smoothing kernel needs, computed once per grid and width and reused
 * for every volume of a run (and shipped to worker threads as plain data).
 */
export interface SmoothPlan {
  /** Voxels along x, y, z. */
  dims: [number, number, number];
  /** Boundary mode. */
  mode: BoundaryMode;
  /** Symmetric 1-D kernels along x, y, z (length 2r + 1 each). */
  kernels: [Float64Array, Float64Array, Float64Array];
  /** Mask (1 = inside) when smoothing by normalised convolution, else null. */
  mask: Uint8Array | null;
  /** The smoothed mask (denominator of the normalised convolution), when `mask` is set. */
  maskWeights: Float64Array | null;
}

/**
 * Working memory for {@link applySmoothPlan}: byte addresses inside the WebAssembly memory of the
 * convolution kernels (one memory per thread, see conv-wasm.ts). Layout: weights, tap offsets, a
 * zero region ('constant' mode points missing rows and planes there), Float32 input/output, and two
 * Float64 volumes whose rows are padded by the x radius on both sides.
 */
export interface SmoothScratch {
  kernels: ConvKernels;
  /** Padded row length nx + 2 rx. */
  px: number;
  rx: number;
  weights: number;
  offsets: number;
  zero: number;
  io: number;
  p: number;
  a: number;
}

const align16 = (n: number): number => Math.ceil(n / 16) * 16;

/**
 * Lay out the WebAssembly memory a plan needs (the kernels come with a memory at least that large,
 * made at that size: see conv-wasm.ts).
 * @param plan - the plan
 * @returns the layout for {@link applySmoothPlan}
 * @example const s = makeSmoothScratch(plan)
 */
export function makeSmoothScratch(plan: Pick<SmoothPlan, 'dims' | 'kernels'>): SmoothScratch {
  const [nx, ny, nz] = plan.dims;
  const radii = plan.kernels.map((k) => (k.length - 1) / 2);
  const rmax = Math.max(...radii);
  const rx = radii[0];
  const px = nx + 2 * rx;
  const plane = px * ny;
  const weights = 0;
  const offsets = align16(weights + 3 * (rmax + 1) * 8);
  const zero = align16(offsets + Math.max(1, 2 * rmax) * 4);
  const io = align16(zero + plane * 8);
  const p = align16(io + nx * ny * nz * 4);
  const a = align16(p + plane * nz * 8);
  const bytes = a + plane * nz * 8 + 64;
  const kernels = convKernels(radii, bytes);
  return { kernels, px, rx, weights, offsets, zero, io, p, a };
}

/**
 * Build a plan; with a mask, smooth the mask itself once (the normalised-convolution denominator).
 * @param dims - voxels along x, y, z
 * @param kernels - 1-D kernels along x, y, z (symmetric, odd length)
 * @param mode - boundary mode
 * @param mask - optional mask (1 = inside), length nx*ny*nz
 * @returns the plan
 * @example makeSmoothPlan([64,64,36], [k, k, k], 'reflect', null)
 */
export function makeSmoothPlan(dims: [number, number, number], kernels: [Float64Array, Float64Array, Float64Array], mode: BoundaryMode, mask: Uint8Array | null): SmoothPlan {
  const plan: SmoothPlan = { dims, mode, kernels, mask: null, maskWeights: null };
  if (mask) {
    const n = dims[0] * dims[1] * dims[2];
    const ones = new Float32Array(n);
    for (let i = 0; i < n; i++) ones[i] = mask[i] ? 1 : 0;
    const weights = new Float64Array(n);
    const scratch = makeSmoothScratch(plan);
    separablePasses(ones, null, plan, scratch);
    readResult(plan, scratch, weights);
    plan.mask = mask;
    plan.maskWeights = weights;
  }
  return plan;
}

/**
 * Smooth one volume with a plan: x, y and z passes in Float64 (WebAssembly SIMD, see conv-wasm.ts),
 * result rounded once to Float32. With a mask: out = smooth(data*mask) / smooth(mask) inside, 0
 * outside. `out` may be `src` (the source is fully read before the output is written).
 * @param plan - from {@link makeSmoothPlan}
 * @param src - one volume, length nx*ny*nz
 * @param out - where to write, same length
 * @param scratch - working memory from {@link makeSmoothScratch}
 * @returns out
 * @example applySmoothPlan(plan, volumeData, new Float32Array(volumeData.length), makeSmoothScratch(plan))
 */
export function applySmoothPlan(plan: SmoothPlan, src: Float32Array, out: Float32Array, scratch: SmoothScratch): Float32Array {
  separablePasses(src, plan.mask, plan, scratch);
  const [nx, ny, nz] = plan.dims;
  const { kernels, px, rx, io, a } = scratch;
  const mask = plan.mask;
  const weights = plan.maskWeights;
  const n = nx * ny * nz;
  if (mask && weights) {
    const f64 = new Float64Array(kernels.memory.buffer);
    for (let q = 0; q < ny * nz; q++) {
      const row = a / 8 + q * px + rx;
      const o = q * nx;
      for (let i = 0; i < nx; i++) out[o + i] = mask[o + i] ? f64[row + i] / weights[o + i] : 0;
    }
  } else {
    kernels.narrow(io, a + rx * 8, ny * nz, nx, px);
    out.set(new Float32Array(kernels.memory.buffer, io, n));
  }
  return out;
}

/** Copy the Float64 result rows (valid part) of the last passes into `out`. */
function readResult(plan: Pick<SmoothPlan, 'dims'>, scratch: SmoothScratch, out: Float64Array): void {
  const [nx, ny, nz] = plan.dims;
  const f64 = new Float64Array(scratch.kernels.memory.buffer);
  for (let q = 0; q < ny * nz; q++) {
    const row = scratch.a / 8 + q * scratch.px + scratch.rx;
    out.set(f64.subarray(row, row + nx), q * nx);
  }
}

/**
 * The three separable passes, leaving the result in the padded Float64 volume at `scratch.a`.
 * x: rows are widened to Float64 with the boundary extension written into their padding, then one
 * kernel call sweeps the whole padded volume. y and z: each block of interior rows (planes) is one
 * call with neighbours at a fixed distance; the r rows (planes) at each edge get their own offsets
 * from {@link boundaryIndex}.
 */
function separablePasses(src: Float32Array, mask: Uint8Array | null, plan: Pick<SmoothPlan, 'dims' | 'kernels' | 'mode'>, scratch: SmoothScratch): void {
  const [nx, ny, nz] = plan.dims;
  const { kernels, px, rx, weights, offsets, zero, io, p, a } = scratch;
  const buf = kernels.memory.buffer;
  const f64 = new Float64Array(buf);
  const i32 = new Int32Array(buf);
  const n = nx * ny * nz;
  const rows = ny * nz;
  const plane = px * ny;
  const radii = plan.kernels.map((k) => (k.length - 1) / 2);
  const stride = Math.max(...radii) + 1;
  plan.kernels.forEach((k, axis) => {
    const r = radii[axis];
    for (let d = 0; d <= r; d++) f64[weights / 8 + axis * stride + d] = k[r + d];
  });
  const wAddr = (axis: number) => weights + axis * stride * 8;
  // the memory is shared by every plan with these radii in this thread: re-zero what 'constant' reads
  if (plan.mode === 'constant') f64.fill(0, zero / 8, zero / 8 + plane);

  // x pass: src -> p (padded Float64 rows) -> a
  new Float32Array(buf, io, n).set(src);
  kernels.widen(p + rx * 8, io, rows, nx, px);
  const ext: number[] = [];
  for (let t = 0; t < rx; t++) ext.push(boundaryIndex(t - rx, nx, plan.mode));
  for (let t = 0; t < rx; t++) ext.push(boundaryIndex(nx + t, nx, plan.mode));
  for (let q = 0; q < rows; q++) {
    const row = p / 8 + q * px;
    const o = q * nx;
    if (mask) for (let i = 0; i < nx; i++) if (!mask[o + i]) f64[row + rx + i] = 0;
    for (let t = 0; t < 2 * rx; t++) {
      const idx = ext[t];
      const v = idx < 0 || (mask && !mask[o + idx]) ? 0 : src[o + idx];
      f64[row + (t < rx ? t : nx + t)] = v;
    }
  }
  for (let d = 1; d <= rx; d++) {
    i32[offsets / 4 + 2 * (d - 1)] = -8 * d;
    i32[offsets / 4 + 2 * (d - 1) + 1] = 8 * d;
  }
  kernels.conv(a, p, plane * nz, offsets, wAddr(0), rx);

  // y pass: a -> p; z pass: p -> a
  for (let k = 0; k < nz; k++) axisPass(kernels, radii[1], p + k * plane * 8, a + k * plane * 8, ny, px, plan.mode, offsets, zero, wAddr(1), i32);
  axisPass(kernels, radii[2], a, p, nz, plane, plan.mode, offsets, zero, wAddr(2), i32);
}

/**
 * One pass along an axis of `nAxis` rows of `inner` Float64 values each (y: rows of a plane; z:
 * planes of the volume), from byte address `src` to `dst`.
 */
function axisPass(kernels: ConvKernels, r: number, dst: number, src: number, nAxis: number, inner: number, mode: BoundaryMode, offsets: number, zero: number, w: number, i32: Int32Array): void {
  const step = inner * 8;
  if (nAxis > 2 * r) {
    for (let d = 1; d <= r; d++) {
      i32[offsets / 4 + 2 * (d - 1)] = -step * d;
      i32[offsets / 4 + 2 * (d - 1) + 1] = step * d;
    }
    kernels.conv(dst + r * step, src + r * step, (nAxis - 2 * r) * inner, offsets, w, r);
  }
  for (let j = 0; j < nAxis; j++) {
    if (j >= r && j < nAxis - r) continue;
    const here = src + j * step;
    for (let d = 1; d <= r; d++) {
      const jm = boundaryIndex(j - d, nAxis, mode);
      const jp = boundaryIndex(j + d, nAxis, mode);
      i32[offsets / 4 + 2 * (d - 1)] = jm < 0 ? zero - here : (jm - j) * step;
      i32[offsets / 4 + 2 * (d - 1) + 1] = jp < 0 ? zero - here : (jp - j) * step;
    }
    kernels.conv(dst + j * step, here, inner, offsets, w, r);
  }
}
