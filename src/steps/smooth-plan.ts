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
  a: Float64Array;
  b: Float64Array;
  line: Float64Array;
  plane: Float64Array;
}

/**
 * Working memory for a plan: two Float64 copies of one volume, one extended line, one plane.
 * @param plan - the plan
 * @returns scratch buffers sized for it
 * @example const s = makeSmoothScratch(plan)
 */
export function makeSmoothScratch(plan: Pick<SmoothPlan, 'dims' | 'kernels'>): SmoothScratch {
  const [nx, ny, nz] = plan.dims;
  const rx = (plan.kernels[0].length - 1) / 2;
  return { a: new Float64Array(nx * ny * nz), b: new Float64Array(nx * ny * nz), line: new Float64Array(nx + 2 * rx), plane: new Float64Array(nx * ny) };
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
    separablePasses(ones, null, plan, makeSmoothScratch(plan), (acc, off) => weights.set(acc, off));
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
  separablePasses(src, mask, plan, scratch, (acc, off) => {
    const n = acc.length;
    if (mask && weights) {
      for (let p = 0; p < n; p++) out[off + p] = mask[off + p] ? acc[p] / weights[off + p] : 0;
    } else {
      for (let p = 0; p < n; p++) out[off + p] = acc[p];
    }
  });
  return out;
}

/** Neighbour offsets per output index along one axis: for tap d (1..r), index of i-d and i+d (or -1). */
function neighbourTable(n: number, r: number, mode: BoundaryMode): { minus: Int32Array; plus: Int32Array } {
  const minus = new Int32Array(n * (r + 1));
  const plus = new Int32Array(n * (r + 1));
  for (let i = 0; i < n; i++) {
    for (let d = 0; d <= r; d++) {
      minus[i * (r + 1) + d] = boundaryIndex(i - d, n, mode);
      plus[i * (r + 1) + d] = boundaryIndex(i + d, n, mode);
    }
  }
  return { minus, plus };
}

/**
 * The three separable passes. x: each row is copied (times the mask) into an extended line and
 * convolved; y and z: whole rows / planes are combined with the kernel weights, which walks memory
 * in order (no strided gathers). Symmetry halves the multiplies: w_d * (left + right).
 */
function separablePasses(
  src: Float32Array,
  mask: Uint8Array | null,
  plan: Pick<SmoothPlan, 'dims' | 'kernels' | 'mode'>,
  scratch: SmoothScratch,
  storePlane: (acc: Float64Array, offset: number) => void,
): void {
  const [nx, ny, nz] = plan.dims;
  const [kx, ky, kz] = plan.kernels;
  const { a, b, line, plane } = scratch;
  const rx = (kx.length - 1) / 2;
  const ry = (ky.length - 1) / 2;
  const rz = (kz.length - 1) / 2;
  const nxy = nx * ny;

  // x pass: src -> a
  const ext = new Int32Array(nx + 2 * rx);
  for (let t = 0; t < ext.length; t++) ext[t] = boundaryIndex(t - rx, nx, plan.mode);
  const w0x = kx[rx];
  for (let row = 0; row < ny * nz; row++) {
    const base = row * nx;
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
    for (let i = 0; i < nx; i++) {
      const c = i + rx;
      let acc = w0x * line[c];
      for (let d = 1; d <= rx; d++) acc += kx[rx + d] * (line[c - d] + line[c + d]);
      a[base + i] = acc;
    }
  }

  // y pass: a -> b, row by row within each plane
  const ty = neighbourTable(ny, ry, plan.mode);
  const w0y = ky[ry];
  for (let k = 0; k < nz; k++) {
    const pz = k * nxy;
    for (let j = 0; j < ny; j++) {
      const o = pz + j * nx;
      for (let i = 0; i < nx; i++) b[o + i] = w0y * a[o + i];
      for (let d = 1; d <= ry; d++) {
        const w = ky[ry + d];
        const jm = ty.minus[j * (ry + 1) + d];
        const jp = ty.plus[j * (ry + 1) + d];
        if (jm >= 0 && jp >= 0) {
          const om = pz + jm * nx;
          const op = pz + jp * nx;
          for (let i = 0; i < nx; i++) b[o + i] += w * (a[om + i] + a[op + i]);
        } else if (jm >= 0 || jp >= 0) {
          const oq = pz + (jm >= 0 ? jm : jp) * nx;
          for (let i = 0; i < nx; i++) b[o + i] += w * a[oq + i];
        }
      }
    }
  }

  // z pass: b -> plane accumulator -> storePlane
  const tz = neighbourTable(nz, rz, plan.mode);
  const w0z = kz[rz];
  for (let k = 0; k < nz; k++) {
    const o = k * nxy;
    for (let p = 0; p < nxy; p++) plane[p] = w0z * b[o + p];
    for (let d = 1; d <= rz; d++) {
      const w = kz[rz + d];
      const km = tz.minus[k * (rz + 1) + d];
      const kp = tz.plus[k * (rz + 1) + d];
      if (km >= 0 && kp >= 0) {
        const om = km * nxy;
        const op = kp * nxy;
        for (let p = 0; p < nxy; p++) plane[p] += w * (b[om + p] + b[op + p]);
      } else if (km >= 0 || kp >= 0) {
        const oq = (km >= 0 ? km : kp) * nxy;
        for (let p = 0; p < nxy; p++) plane[p] += w * b[oq + p];
      }
    }
    storePlane(plane, o);
  }
}
