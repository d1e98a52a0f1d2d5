import { boundaryIndex, type BoundaryMode } from './boundary-index.js';

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

/** Reusable Float64 working memory for {@link applySmoothPlan} (one per thread). */
export interface SmoothScratch {
  /** One volume after the x and y passes, plus a plane of zeros at the end ('constant' mode reads it). */
  volume: Float64Array;
  /** One plane after the x pass, plus a row of zeros at the end. */
  planeX: Float64Array;
  /** One plane after the z pass. */
  planeZ: Float64Array;
  /** One row extended past both ends by the x radius. */
  line: Float64Array;
  /** Row offsets of the taps of the row being computed. */
  offsets: Int32Array;
}

/**
 * Working memory for a plan: one Float64 volume, two planes, one extended line.
 * @param plan - the plan
 * @returns scratch buffers sized for it
 * @example const s = makeSmoothScratch(plan)
 */
export function makeSmoothScratch(plan: Pick<SmoothPlan, 'dims' | 'kernels'>): SmoothScratch {
  const [nx, ny, nz] = plan.dims;
  const rx = (plan.kernels[0].length - 1) / 2;
  const nxy = nx * ny;
  // the zero tails let 'constant' mode point missing rows/planes inside the same array, so the
  // inner loops read a single array (V8 compiles that much better than choosing arrays per tap)
  return {
    volume: new Float64Array(nxy * nz + nxy),
    planeX: new Float64Array(nxy + nx),
    planeZ: new Float64Array(nxy),
    line: new Float64Array(nx + 2 * rx),
    offsets: new Int32Array(Math.max(...plan.kernels.map((k) => k.length))),
  };
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
    separablePasses(ones, null, plan, makeSmoothScratch(plan), null, weights);
    plan.mask = mask;
    plan.maskWeights = weights;
  }
  return plan;
}

/**
 * Smooth one volume with a plan: x, y and z passes in Float64, result rounded once to Float32.
 * With a mask: out = smooth(data*mask) / smooth(mask) inside, 0 outside. `out` may be `src`
 * (the source is fully read before the output is written).
 * @param plan - from {@link makeSmoothPlan}
 * @param src - one volume, length nx*ny*nz
 * @param out - where to write, same length
 * @param scratch - working memory from {@link makeSmoothScratch}
 * @returns out
 * @example applySmoothPlan(plan, volumeData, new Float32Array(volumeData.length), makeSmoothScratch(plan))
 */
export function applySmoothPlan(plan: SmoothPlan, src: Float32Array, out: Float32Array, scratch: SmoothScratch): Float32Array {
  const mask = plan.mask;
  const weights = plan.maskWeights;
  separablePasses(src, mask, plan, scratch, out, null);
  return out;
}

/**
 * The weighted sum at the heart of every pass, for one output row of `len` values:
 * dst[dOff + i] = w0 src[c + i] + w1 (src[m1 + i] + src[p1 + i]) + ... + wr (src[mr + i] + src[pr + i])
 * with offsets = [c, m1, p1, m2, p2, ...]. Summed left to right in Float64 in one fixed order, so every
 * caller (main thread or worker) gets the same bits. Up to three taps go in the first sweep and two
 * per later sweep: unrolled loops over a single array are what V8 compiles well.
 */
function weightedRows(dst: Float64Array, dOff: number, len: number, src: Float64Array, offsets: Int32Array, w: Float64Array, r: number): void {
  const c = offsets[0];
  const w0 = w[0];
  if (r === 0) {
    for (let i = 0; i < len; i++) dst[dOff + i] = w0 * src[c + i];
    return;
  }
  const m1 = offsets[1], p1 = offsets[2], w1 = w[1];
  if (r === 1) {
    for (let i = 0; i < len; i++) dst[dOff + i] = w0 * src[c + i] + w1 * (src[m1 + i] + src[p1 + i]);
    return;
  }
  const m2 = offsets[3], p2 = offsets[4], w2 = w[2];
  if (r === 2) {
    for (let i = 0; i < len; i++) dst[dOff + i] = w0 * src[c + i] + w1 * (src[m1 + i] + src[p1 + i]) + w2 * (src[m2 + i] + src[p2 + i]);
    return;
  }
  const m3 = offsets[5], p3 = offsets[6], w3 = w[3];
  for (let i = 0; i < len; i++) {
    dst[dOff + i] = w0 * src[c + i] + w1 * (src[m1 + i] + src[p1 + i]) + w2 * (src[m2 + i] + src[p2 + i]) + w3 * (src[m3 + i] + src[p3 + i]);
  }
  for (let d = 4; d <= r; d += 2) {
    const ma = offsets[2 * d - 1], pa = offsets[2 * d], wa = w[d];
    if (d === r) {
      for (let i = 0; i < len; i++) dst[dOff + i] = dst[dOff + i] + wa * (src[ma + i] + src[pa + i]);
      break;
    }
    const mb = offsets[2 * d + 1], pb = offsets[2 * d + 2], wb = w[d + 1];
    for (let i = 0; i < len; i++) dst[dOff + i] = dst[dOff + i] + wa * (src[ma + i] + src[pa + i]) + wb * (src[mb + i] + src[pb + i]);
  }
}

/** Right half of a symmetric kernel: w[d] = k[r + d], d = 0..r. */
function halfKernel(k: Float64Array): Float64Array {
  const r = (k.length - 1) / 2;
  return k.slice(r);
}

/** Fill `offsets` with the row offsets of the taps around row j of nAxis rows of `inner` values from `base`. */
function tapOffsets(offsets: Int32Array, base: number, j: number, nAxis: number, inner: number, r: number, mode: BoundaryMode, zeroOffset: number): void {
  offsets[0] = base + j * inner;
  for (let d = 1; d <= r; d++) {
    const jm = boundaryIndex(j - d, nAxis, mode);
    const jp = boundaryIndex(j + d, nAxis, mode);
    offsets[2 * d - 1] = jm < 0 ? zeroOffset : base + jm * inner;
    offsets[2 * d] = jp < 0 ? zeroOffset : base + jp * inner;
  }
}

/** y pass of one plane: rows of `inner` values of `src` (from 0) combined into `dst` from `dstBase`. */
function axisPass(src: Float64Array, dst: Float64Array, dstBase: number, nAxis: number, inner: number, w: Float64Array, mode: BoundaryMode, offsets: Int32Array, zeroOffset: number): void {
  const r = w.length - 1;
  for (let j = 0; j < nAxis; j++) {
    tapOffsets(offsets, 0, j, nAxis, inner, r, mode, zeroOffset);
    weightedRows(dst, dstBase + j * inner, inner, src, offsets, w, r);
  }
}

/** z pass for output plane k: planes of `inner` values of `src` combined into `dst` (from 0). */
function axisPlane(src: Float64Array, dst: Float64Array, k: number, nAxis: number, inner: number, w: Float64Array, mode: BoundaryMode, offsets: Int32Array, zeroOffset: number): void {
  const r = w.length - 1;
  tapOffsets(offsets, 0, k, nAxis, inner, r, mode, zeroOffset);
  weightedRows(dst, 0, inner, src, offsets, w, r);
}

/**
 * The three separable passes. Plane by plane: x (each row copied, times the mask, into an extended
 * line, then combined) and y (rows of the plane combined) into `scratch.volume`; then z: whole planes
 * combined into one plane, which is stored (Float32, with the normalised-convolution division when a
 * mask is given) or, for the mask weights, kept in Float64. Every step walks memory in order.
 */
function separablePasses(src: Float32Array, mask: Uint8Array | null, plan: SmoothPlan | Pick<SmoothPlan, 'dims' | 'kernels' | 'mode'>, scratch: SmoothScratch, out: Float32Array | null, outF64: Float64Array | null): void {
  const [nx, ny, nz] = plan.dims;
  const { volume, planeX, planeZ, line, offsets } = scratch;
  const nxy = nx * ny;
  const n = nxy * nz;
  const wx = halfKernel(plan.kernels[0]);
  const wy = halfKernel(plan.kernels[1]);
  const wz = halfKernel(plan.kernels[2]);
  const rx = wx.length - 1;
  const ext = new Int32Array(nx + 2 * rx);
  for (let t = 0; t < ext.length; t++) ext[t] = boundaryIndex(t - rx, nx, plan.mode);
  const xOffsets = new Int32Array(2 * rx + 1);
  xOffsets[0] = rx;
  for (let d = 1; d <= rx; d++) {
    xOffsets[2 * d - 1] = rx - d;
    xOffsets[2 * d] = rx + d;
  }

  for (let k = 0; k < nz; k++) {
    // x pass: plane k of src -> planeX
    for (let j = 0; j < ny; j++) {
      const base = k * nxy + j * nx;
      if (mask) {
        for (let t = 0; t < ext.length; t++) {
          const q = ext[t];
          line[t] = q < 0 ? 0 : mask[base + q] ? src[base + q] : 0;
        }
      } else {
        for (let t = 0; t < ext.length; t++) {
          const q = ext[t];
          line[t] = q < 0 ? 0 : src[base + q];
        }
      }
      weightedRows(planeX, j * nx, nx, line, xOffsets, wx, rx);
    }
    // y pass: planeX -> plane k of volume
    axisPass(planeX, volume, k * nxy, ny, nx, wy, plan.mode, offsets, nxy);
  }

  // z pass: volume -> planeZ, one output plane at a time, then store it
  const weights = 'maskWeights' in plan ? plan.maskWeights : null;
  for (let k = 0; k < nz; k++) {
    axisPlane(volume, planeZ, k, nz, nxy, wz, plan.mode, offsets, n);
    const o = k * nxy;
    if (outF64) {
      for (let p = 0; p < nxy; p++) outF64[o + p] = planeZ[p];
    } else if (out && mask && weights) {
      for (let p = 0; p < nxy; p++) out[o + p] = mask[o + p] ? planeZ[p] / weights[o + p] : 0;
    } else if (out) {
      for (let p = 0; p < nxy; p++) out[o + p] = planeZ[p];
    }
  }
}
