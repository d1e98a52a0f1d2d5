import type { Affine } from '../core/affine.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import { extendIndex } from './extend-index.js';
import { foldCoordinate } from './fold-coordinate.js';
import { kernelTaps, LANCZOS_RADIUS, type InterpolationKernel } from './interpolation-kernel.js';
import { LIST_AT, LIST_ENTRY_BYTES, trilinearKernel } from './trilinear-wasm.js';

/** What {@link resampleVoxels} reads and writes (plain data: it also travels to worker threads). */
export interface ResampleVoxelsInput {
  /**
   * What is interpolated, x fastest: the source voxel values, or for `cubic` the B-spline
   * coefficients from cubicBSplinePrefilter (possibly padded, see `pad`).
   */
  source: Float32Array | Float64Array;
  /** Dimensions of `source` (including padding). */
  sourceDims: readonly [number, number, number];
  /** Voxels of padding each side of `source` (cubic `nearest` only; else 0). */
  pad: number;
  /**
   * Planes of mode-extended values each side of `source` beyond `pad` (extendCoefficients), so that
   * positions near the edges read them directly. __Default value:__ 0
   */
  margin?: number;
  /**
   * Linear kernel, `constant` or `nearest` mode, no displacement field only: positions are taken as
   * if `virtualMargin` planes of mode-extended values surrounded `source` (same positions, same bytes
   * as an extended source with that margin), but the source holds none: in these modes the fast path
   * reads a margin value only with weight 0, and then reads the edge voxel instead. It spares the copy
   * into a larger array. __Default value:__ 0
   */
  virtualMargin?: number;
  /** Row-major 4x4: output voxel index -> source voxel index (unpadded). */
  srcFromOut: Affine;
  /**
   * Added to the mapped position of each output voxel, in source voxel units, three per output
   * voxel (x, y, z interleaved), e.g. a displacement field. __Default value:__ none
   */
  displacementVox?: Float32Array | null;
  /** Output dimensions. */
  outDims: readonly [number, number, number];
  kernel: InterpolationKernel;
  mode: BoundaryMode;
  /** Value written for positions outside the grid in `constant` mode. */
  cval: number;
}

const COS_THIRDS = Float64Array.from({ length: 6 }, (_, m) => Math.cos((m * Math.PI) / 3));
const SIN_THIRDS = Float64Array.from({ length: 6 }, (_, m) => Math.sin((m * Math.PI) / 3));

// per-axis taps: source offsets (index times stride) and weights, reused across calls
const offX = new Int32Array(8), offY = new Int32Array(8), offZ = new Int32Array(8);
const wX = new Float64Array(8), wY = new Float64Array(8), wZ = new Float64Array(8);

/**
 * Taps of one axis at position x: fills offsets (index times stride) and weights.
 * @returns false when the position is outside the line in `constant` mode
 */
function axisTaps(x: number, n: number, stride: number, shift: number, kernel: InterpolationKernel, mode: BoundaryMode, off: Int32Array, w: Float64Array): boolean {
  const f = foldCoordinate(x, n, mode);
  if (f !== f) return false;
  switch (kernel) {
    case 'nearest': {
      off[0] = (extendIndex(Math.floor(f + 0.5), n, mode) + shift) * stride;
      w[0] = 1;
      return true;
    }
    case 'linear': {
      const i0 = Math.floor(f), t = f - i0;
      off[0] = (extendIndex(i0, n, mode) + shift) * stride;
      off[1] = (extendIndex(i0 + 1, n, mode) + shift) * stride;
      w[0] = 1 - t; w[1] = t;
      return true;
    }
    case 'cubic': {
      const i0 = Math.floor(f), t = f - i0, u = 1 - t, t2 = t * t, t3 = t2 * t;
      if (i0 >= 1 && i0 + 2 < n) {
        const o = (i0 - 1 + shift) * stride;
        off[0] = o; off[1] = o + stride; off[2] = o + 2 * stride; off[3] = o + 3 * stride;
      } else {
        for (let m = 0; m < 4; m++) off[m] = (extendIndex(i0 - 1 + m, n, mode) + shift) * stride;
      }
      w[0] = (u * u * u) / 6;
      w[1] = (4 - 6 * t2 + 3 * t3) / 6;
      w[2] = (1 + 3 * t + 3 * t2 - 3 * t3) / 6;
      w[3] = t3 / 6;
      return true;
    }
    case 'lanczos3': {
      // L(d) = 3 sin(pi d) sin(pi d / 3) / (pi d)^2 at d = t + 2 - m, m = 0..5: sin(pi d) =
      // (-1)^m sin(pi t) and sin(pi d / 3) = sin(a - m pi / 3) with a = pi (t + 2) / 3, so two
      // sines and a cosine serve all six taps
      const i0 = Math.floor(f), t = f - i0, start = i0 - LANCZOS_RADIUS + 1;
      for (let m = 0; m < 6; m++) off[m] = (extendIndex(start + m, n, mode) + shift) * stride;
      if (t === 0) {
        for (let m = 0; m < 6; m++) w[m] = m === 2 ? 1 : 0;
        return true;
      }
      const spt = Math.sin(Math.PI * t), a = (Math.PI * (t + 2)) / 3, sa = Math.sin(a), ca = Math.cos(a);
      let sum = 0;
      for (let m = 0; m < 6; m++) {
        const d = t + 2 - m;
        const sd3 = sa * COS_THIRDS[m] - ca * SIN_THIRDS[m];
        const v = (3 * (m & 1 ? -spt : spt) * sd3) / (Math.PI * Math.PI * d * d);
        w[m] = v;
        sum += v;
      }
      for (let m = 0; m < 6; m++) w[m] /= sum;
      return true;
    }
  }
}

/**
 * Resample a 3D image: output voxel (i, j, k) takes the kernel's value of the source at
 * srcFromOut [i, j, k, 1] (plus its displacement). Positions and taps follow scipy.ndimage 1.10
 * (map_coordinates): the position is folded by the boundary mode, the nearest kernel rounds half up,
 * taps outside the grid read the mode's extension, and `constant` writes cval for a position outside
 * [0, n-1] on any axis. Float64 sums, Float32 out.
 * @param input - source (values or cubic coefficients), maps, kernel, mode, cval
 * @param out - where to write, length of outDims' product
 * @returns `out`
 * @example resampleVoxels({ source: img, sourceDims: [64, 64, 36], pad: 0, srcFromOut, outDims: [64, 64, 36], kernel: 'linear', mode: 'constant', cval: 0 }, out)
 */
export function resampleVoxels(input: ResampleVoxelsInput, out: Float32Array): Float32Array {
  const { kernel } = input;
  if (kernel === 'linear' && !input.displacementVox) return linearByKernel(input, out);
  if (input.virtualMargin) fail('INVALID_ARGUMENT', 'virtualMargin is for the linear kernel without a displacement field only');
  // one row routine per kernel keeps each loop monomorphic (linear reads Float32 voxels, cubic
  // Float64 coefficients) and lets the interior of the grid skip the boundary handling
  const row = kernel === 'linear' ? rowLinear : kernel === 'cubic' ? rowCubic : rowGeneric;
  const m = input.srcFromOut, pad = input.pad + (input.margin ?? 0);
  const [ox, oy, oz] = input.outDims;
  for (let k = 0; k < oz; k++) {
    for (let j = 0; j < oy; j++) {
      // position of (0, j, k) in the source array's voxels (past pad and margin); stepping i adds the first column
      const x = m[1] * j + m[2] * k + m[3] + pad;
      const y = m[5] * j + m[6] * k + m[7] + pad;
      const z = m[9] * j + m[10] * k + m[11] + pad;
      row(input, out, ox * (j + oy * k), ox, x, y, z);
    }
  }
  return out;
}

/** One output voxel by the generic tap tables (any kernel, any position in the source array's voxels). */
function generic(input: ResampleVoxelsInput, px: number, py: number, pz: number): number {
  const { source, sourceDims, kernel, mode } = input;
  const e = input.margin ?? 0;
  const sx = sourceDims[0], sxy = sx * sourceDims[1];
  // fold and extend on the array without its margin, then read through the margin's offsets
  const nx = sx - 2 * e, ny = sourceDims[1] - 2 * e, nz = sourceDims[2] - 2 * e;
  if (!axisTaps(px - e, nx, 1, e, kernel, mode, offX, wX) || !axisTaps(py - e, ny, sx, e, kernel, mode, offY, wY) || !axisTaps(pz - e, nz, sxy, e, kernel, mode, offZ, wZ)) return input.cval;
  const taps = kernelTaps(kernel);
  let s = 0;
  for (let c = 0; c < taps; c++) {
    const oz2 = offZ[c], wz = wZ[c];
    for (let b = 0; b < taps; b++) {
      const o = oz2 + offY[b], wzy = wz * wY[b];
      let r = 0;
      for (let a = 0; a < taps; a++) r += wX[a] * source[o + offX[a]];
      s += wzy * r;
    }
  }
  return s;
}

type Row = (input: ResampleVoxelsInput, out: Float32Array, p0: number, count: number, x: number, y: number, z: number) => void;

const rowGeneric: Row = (input, out, p0, count, x, y, z) => {
  const m = input.srcFromOut, disp = input.displacementVox ?? null;
  for (let i = 0, p = p0; i < count; i++, p++, x += m[0], y += m[4], z += m[8]) {
    let px = x, py = y, pz = z;
    if (disp !== null) { px += disp[3 * p]; py += disp[3 * p + 1]; pz += disp[3 * p + 2]; }
    out[p] = generic(input, px, py, pz);
  }
};

/**
 * Where rowLinear takes its fast path and where constant mode writes cval without the generic path.
 * Fast path: both taps of every axis inside the array; with a margin (extendCoefficients) a position
 * up to the grid's last voxel reads it directly, and in constant and nearest mode a position outside
 * the grid proper is left to the generic path (cval, or the clamped position). Grid proper: the array
 * without its margin, [e, g] on each axis.
 */
function linearBounds(input: ResampleVoxelsInput): { lx: number; hx: number; ly: number; hy: number; lz: number; hz: number; e: number; gx: number; gy: number; gz: number } {
  const vm = 2 * (input.virtualMargin ?? 0);
  const nx = input.sourceDims[0] + vm, ny = input.sourceDims[1] + vm, nz = input.sourceDims[2] + vm;
  const e = (input.margin ?? 0) + (input.virtualMargin ?? 0), edge = input.mode === 'constant' || input.mode === 'nearest';
  const lx = edge ? e : 0;
  return {
    lx, ly: lx, lz: lx,
    hx: edge ? Math.min(nx - 2, nx - 1 - e) : nx - 2, hy: edge ? Math.min(ny - 2, ny - 1 - e) : ny - 2, hz: edge ? Math.min(nz - 2, nz - 1 - e) : nz - 2,
    e, gx: nx - 1 - e, gy: ny - 1 - e, gz: nz - 1 - e,
  };
}

/**
 * The linear kernel without a displacement field: the WebAssembly kernel (trilinear-wasm.ts) does the
 * fast path and constant mode's cval, with the positions and operations of rowLinear, so the bytes are
 * the same; the voxels it leaves (near the edges in the other modes) go through the generic path here.
 * A source already in the kernel's memory at its source address (resampleVolumesTask puts it there)
 * is not copied.
 */
function linearByKernel(input: ResampleVoxelsInput, out: Float32Array): Float32Array {
  const src = input.source as Float32Array;
  const [nx, ny, nz] = input.sourceDims;
  const vm = input.virtualMargin ?? 0;
  if (vm !== 0 && input.mode !== 'constant' && input.mode !== 'nearest') fail('INVALID_ARGUMENT', `virtualMargin is for constant and nearest mode only, not ${input.mode}`);
  const [ox, oy, oz] = input.outDims;
  const count = ox * oy * oz;
  const k = trilinearKernel(src.length, count);
  const buffer = k.memory.buffer;
  if (src.buffer !== buffer || src.byteOffset !== k.sourceAt) new Float32Array(buffer, k.sourceAt, src.length).set(src);
  const b = linearBounds(input);
  const params = new Float64Array(buffer, 0, LIST_AT >> 3);
  params.set(input.srcFromOut.subarray(0, 12));
  params[12] = input.pad + b.e;
  params[13] = b.lx; params[14] = b.hx; params[15] = b.ly; params[16] = b.hy; params[17] = b.lz; params[18] = b.hz;
  params[19] = b.e; params[20] = b.gx; params[21] = b.gy; params[22] = b.gz; params[23] = input.cval;
  const left = k.linearVolume(0, k.sourceAt, nx, ny, nz, vm, k.outAt, ox, oy, oz, input.mode === 'constant' ? 1 : 0, LIST_AT);
  out.set(new Float32Array(buffer, k.outAt, count));
  if (left > 0) listedByGeneric(input, new Int32Array(buffer, LIST_AT, (left * LIST_ENTRY_BYTES) >> 2), params[12], out);
  return out;
}

/**
 * The voxels the trilinear kernel listed (output indices, ascending), by the generic taps. Each
 * position is the kernel's: the row's start, then its running sum replayed up to the voxel (the same
 * additions in the same order, so the same number); positions count the virtual margin, which
 * generic, reading the source as it is, does not.
 */
function listedByGeneric(input: ResampleVoxelsInput, listed: Int32Array, pad: number, out: Float32Array): void {
  const m = input.srcFromOut, vm = input.virtualMargin ?? 0;
  const [ox, oy] = input.outDims;
  let row = -1, at = 0, x = 0, y = 0, z = 0;
  for (let q = 0; q < listed.length; q++) {
    const p = listed[q], r = Math.floor(p / ox), i = p - r * ox;
    if (r !== row) {
      const j = r % oy, k = Math.floor(r / oy);
      x = m[1] * j + m[2] * k + m[3] + pad;
      y = m[5] * j + m[6] * k + m[7] + pad;
      z = m[9] * j + m[10] * k + m[11] + pad;
      row = r; at = 0;
    }
    for (; at < i; at++) { x += m[0]; y += m[4]; z += m[8]; }
    out[p] = generic(input, x - vm, y - vm, z - vm);
  }
}

const rowLinear: Row = (input, out, p0, count, x, y, z) => {
  const m = input.srcFromOut, disp = input.displacementVox ?? null, src = input.source as Float32Array;
  const nx = input.sourceDims[0], sxy = nx * input.sourceDims[1];
  const { lx, hx, ly, hy, lz, hz, e, gx, gy, gz } = linearBounds(input);
  // constant mode: a position outside the grid proper is cval, as foldCoordinate decides, without the
  // generic path's call
  const constant = input.mode === 'constant', cval = input.cval;
  const dx = m[0], dy = m[4], dz = m[8];
  for (let p = p0, end = p0 + count; p < end; p++, x += dx, y += dy, z += dz) {
    let px = x, py = y, pz = z;
    if (disp !== null) { px += disp[3 * p]; py += disp[3 * p + 1]; pz += disp[3 * p + 2]; }
    if (px >= lx && px <= hx && py >= ly && py <= hy && pz >= lz && pz <= hz) out[p] = trilinear(src, nx, sxy, px, py, pz);
    else if (constant && !(px >= e && px <= gx && py >= e && py <= gy && pz >= e && pz <= gz)) out[p] = cval;
    else out[p] = generic(input, px, py, pz);
  }
};

/** Trilinear value at a position (>= 0, so truncation is floor) whose eight taps are inside `src`. */
function trilinear(src: Float32Array, nx: number, sxy: number, px: number, py: number, pz: number): number {
  const i0 = px | 0, j0 = py | 0, k0 = pz | 0;
  const fx = px - i0, fy = py - j0, fz = pz - k0;
  const q = i0 + nx * j0 + sxy * k0;
  const a = src[q], b = src[q + 1], c = src[q + nx], d = src[q + nx + 1];
  const e = src[q + sxy], f = src[q + sxy + 1], g = src[q + sxy + nx], h = src[q + sxy + nx + 1];
  const ab = a + fx * (b - a), cd = c + fx * (d - c), ef = e + fx * (f - e), gh = g + fx * (h - g);
  const lo = ab + fy * (cd - ab), hi = ef + fy * (gh - ef);
  return lo + fz * (hi - lo);
}

const rowCubic: Row = (input, out, p0, count, x, y, z) => {
  const m = input.srcFromOut, disp = input.displacementVox ?? null, src = input.source;
  const nx = input.sourceDims[0], ny = input.sourceDims[1], nz = input.sourceDims[2], sxy = nx * ny;
  // in constant mode a position outside the grid proper (without margin) gets cval, and in nearest
  // mode it is clamped first: both leave such positions to the generic path
  const e = input.margin ?? 0, constant = input.mode === 'constant' || input.mode === 'nearest';
  const lo = e, hx = nx - 1 - e, hy = ny - 1 - e, hz = nz - 1 - e;
  const cvalOutside = input.mode === 'constant' && input.pad === 0, cval = input.cval;
  for (let i = 0, p = p0; i < count; i++, p++, x += m[0], y += m[4], z += m[8]) {
    let px = x, py = y, pz = z;
    if (disp !== null) { px += disp[3 * p]; py += disp[3 * p + 1]; pz += disp[3 * p + 2]; }
    // interior: all four taps of every axis inside the array (margin included)
    if (px >= 1 && px < nx - 2 && py >= 1 && py < ny - 2 && pz >= 1 && pz < nz - 2 &&
        (!constant || (px >= lo && px <= hx && py >= lo && py <= hy && pz >= lo && pz <= hz))) {
      const i0 = px | 0, j0 = py | 0, k0 = pz | 0;
      const tx = px - i0, ty = py - j0, tz = pz - k0;
      const ux = 1 - tx, uy = 1 - ty, uz = 1 - tz;
      const tx2 = tx * tx, ty2 = ty * ty, tz2 = tz * tz;
      const x0 = (ux * ux * ux) / 6, x1 = (4 - 6 * tx2 + 3 * tx2 * tx) / 6, x2 = (1 + 3 * tx + 3 * tx2 - 3 * tx2 * tx) / 6, x3 = (tx2 * tx) / 6;
      const y0 = (uy * uy * uy) / 6, y1 = (4 - 6 * ty2 + 3 * ty2 * ty) / 6, y2 = (1 + 3 * ty + 3 * ty2 - 3 * ty2 * ty) / 6, y3 = (ty2 * ty) / 6;
      const z0 = (uz * uz * uz) / 6, z1 = (4 - 6 * tz2 + 3 * tz2 * tz) / 6, z2 = (1 + 3 * tz + 3 * tz2 - 3 * tz2 * tz) / 6, z3 = (tz2 * tz) / 6;
      // 4 x 4 rows of 4 taps, written out: the small loops were not unrolled by the compiler
      let q = i0 - 1 + nx * (j0 - 1) + sxy * (k0 - 1);
      let r0 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      let r1 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      let r2 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      let r3 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += sxy - 3 * nx;
      let s = z0 * (y0 * r0 + y1 * r1 + y2 * r2 + y3 * r3);
      r0 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r1 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r2 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r3 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += sxy - 3 * nx;
      s += z1 * (y0 * r0 + y1 * r1 + y2 * r2 + y3 * r3);
      r0 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r1 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r2 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r3 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += sxy - 3 * nx;
      s += z2 * (y0 * r0 + y1 * r1 + y2 * r2 + y3 * r3);
      r0 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r1 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r2 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3]; q += nx;
      r3 = x0 * src[q] + x1 * src[q + 1] + x2 * src[q + 2] + x3 * src[q + 3];
      s += z3 * (y0 * r0 + y1 * r1 + y2 * r2 + y3 * r3);
      out[p] = s;
    } else if (cvalOutside && !(px >= lo && px <= hx && py >= lo && py <= hy && pz >= lo && pz <= hz)) {
      // constant mode, outside the grid proper: cval, as foldCoordinate decides, without the generic call
      out[p] = cval;
    } else {
      out[p] = generic(input, px, py, pz);
    }
  }
};
