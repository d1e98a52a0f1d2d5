import { affineSpacing, invertAffine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { smoothVolume3d } from '../filter/gaussian-smooth.js';
import { createRng } from '../core/random.js';
import type { ImageOnGrid, RegistrationCost, RegistrationModel } from './registration-types.js';

/** The fixed image at one multi-resolution level: its samples and, for least squares, their Jacobian. */
export interface FixedLevel {
  /** Subsampling factor f (every f-th voxel along each axis). */
  factor: number;
  /** FWHM (mm) of the isotropic Gaussian both images are smoothed with at this level (0 = none). */
  fwhmMm: number;
  /** Number of samples (fixed voxels on the level's lattice with a weight > 0). */
  count: number;
  /** World position (mm) of each sample, x y z interleaved. */
  world: Float64Array;
  /** Smoothed fixed value at each sample. */
  values: Float32Array;
  /** Weight of each sample (the mask's value). */
  weights: Float32Array;
  /** Sum of the weights. */
  weightSum: number;
  /** [min, max] of the sampled values (the fixed histogram range). */
  range: [number, number];
  /** Columns of the least-squares Jacobian: 6 (rigid) or 12 (affine); 0 for the other costs. */
  columns: number;
  /**
   * Least squares (inverse compositional): per sample, the derivative of the fixed image warped by
   * a small update, gradient . dW/dq at q = 0 (`columns` values each; rigid: g, d x g with d = x - c;
   * affine: g, then g_a d_b for a, b in x, y, z).
   */
  jacobian: Float64Array | null;
  /** Sum over samples of w J J^T (columns x columns, row-major). */
  hessian: Float64Array | null;
  /** Sums over samples of w F and w F^2 (for the least-squares intensity fit). */
  sumF: number;
  sumF2: number;
  /** Sums over samples of w J F and w J (`columns` each; least squares). */
  sumJF: Float64Array | null;
  sumJ: Float64Array | null;
}

/** Options of {@link prepareFixedLevel}. */
export interface FixedLevelOptions {
  model: RegistrationModel;
  cost: RegistrationCost;
  centreMm: Readonly<Vec3>;
  mask: Uint8Array | Float32Array | null;
  /** FWHM of the finest level's smoothing in fixed voxels (see levelFwhmMm). */
  finestFwhmVoxels: number;
  /** Seed of the sample positions' jitter. */
  seed: number;
}

/**
 * Smoothing of a level: isotropic FWHM sqrt(f^2 - 1 + s^2) x the fixed grid's largest voxel size in
 * mm, where s is the finest level's FWHM in voxels (sqrt(f^2 - 1) voxels is the width that takes
 * one-voxel resolution to f voxels; with s = 1, level f is smoothed to f voxels).
 * @param factor - subsampling factor f >= 1
 * @param fixed - the fixed image
 * @param finestFwhmVoxels - s, the FWHM at f = 1 in voxels (0 = none)
 * @returns FWHM in mm
 * @example levelFwhmMm(4, fixed, 1) // 4 x voxel size
 */
export function levelFwhmMm(factor: number, fixed: Pick<ImageOnGrid, 'grid'>, finestFwhmVoxels: number): number {
  return Math.sqrt(Math.max(0, factor * factor - 1 + finestFwhmVoxels * finestFwhmVoxels)) * Math.max(...affineSpacing(fixed.grid.affine));
}

/**
 * Prepare the fixed image for one level: smooth it (levelFwhmMm, mode nearest), take every f-th
 * voxel along each axis with a weight > 0, and place its sample at a seeded random position within
 * half a voxel of its centre (uniform on each axis, kept inside the grid), where the fixed image is
 * read by trilinear interpolation. The jitter makes both images interpolated at random fractional
 * positions, so the smoothing that interpolation does to noise and edges no longer depends on the
 * transform (on the voxel centres alone it does, and pulls the cost's minimum towards transforms
 * that put samples between moving voxels: the interpolation artefact of Pluim et al. 2000, CVIU
 * 77:211-232 [memory]). For least squares, the image gradient at each sample (central differences
 * of the smoothed image in voxel units, one-sided at the edges, interpolated, turned into world
 * units by the inverse transpose of the grid's 3x3 part), its Jacobian row and the
 * Gauss-Newton matrix, which the inverse compositional scheme (Baker and Matthews 2004, IJCV
 * 56:221-255) keeps fixed for every volume registered to this image.
 * @param fixed - the fixed image (not modified)
 * @param factor - subsampling factor, a positive integer
 * @param options - model, cost, centre, mask (fixed grid weights), finest FWHM, jitter seed
 * @returns the level
 * @throws BoldsweepError INVALID_ARGUMENT for a bad factor or mask length, or a level with fewer than 50 samples
 * @example const level = prepareFixedLevel(reference, 2, { model: 'rigid', cost: 'least-squares', centreMm, mask: null, finestFwhmVoxels: 1, seed: 1 })
 */
export function prepareFixedLevel(fixed: ImageOnGrid, factor: number, options: FixedLevelOptions): FixedLevel {
  if (!Number.isInteger(factor) || factor < 1) fail('INVALID_ARGUMENT', `multi-resolution levels must be positive integers, got ${factor}`);
  const [nx, ny, nz] = fixed.grid.dims;
  const n = nx * ny * nz;
  const mask = options.mask;
  if (mask && mask.length !== n) fail('INVALID_ARGUMENT', `the mask has ${mask.length} voxels, the fixed grid ${nx}x${ny}x${nz} has ${n}`);
  const fwhmMm = levelFwhmMm(factor, fixed, options.finestFwhmVoxels);
  const img = fwhmMm > 0 ? smoothVolume3d(fixed.data, [nx, ny, nz], affineSpacing(fixed.grid.affine), fwhmMm, { mode: 'nearest' }) : fixed.data;
  let count = 0;
  for (let k = 0; k < nz; k += factor) for (let j = 0; j < ny; j += factor) for (let i = 0; i < nx; i += factor) {
    if (!mask || mask[i + nx * (j + ny * k)] > 0) count++;
  }
  if (count < 50) fail('INVALID_ARGUMENT', `level ${factor} leaves ${count} fixed samples (at least 50 are needed): use smaller levels or a larger mask`);
  const ls = options.cost === 'least-squares';
  const grad = ls ? gradientImages(img, nx, ny, nz) : null;
  const a = fixed.grid.affine;
  const world = new Float64Array(3 * count);
  const values = new Float32Array(count);
  const weights = new Float32Array(count);
  const columns = ls ? (options.model === 'rigid' ? 6 : 12) : 0;
  const jacobian = ls ? new Float64Array(count * columns) : null;
  const hessian = ls ? new Float64Array(columns * columns) : null;
  const sumJF = ls ? new Float64Array(columns) : null;
  const sumJ = ls ? new Float64Array(columns) : null;
  let sumF = 0, sumF2 = 0;
  const inv = invertAffine(a);
  const [cx, cy, cz] = options.centreMm;
  const rng = createRng(options.seed);
  const jitter = (q: number, nq: number): number => {
    const x = q + rng.uniform() - 0.5;
    return x < 0 ? 0 : x > nq - 1 ? nq - 1 : x;
  };
  let weightSum = 0, lo = Infinity, hi = -Infinity;
  let s = 0;
  for (let k = 0; k < nz; k += factor) for (let j = 0; j < ny; j += factor) for (let i = 0; i < nx; i += factor) {
    const p = i + nx * (j + ny * k);
    const w = mask ? mask[p] : 1;
    if (!(w > 0)) continue;
    const u = jitter(i, nx), v = jitter(j, ny), t = jitter(k, nz);
    const x = a[0] * u + a[1] * v + a[2] * t + a[3];
    const y = a[4] * u + a[5] * v + a[6] * t + a[7];
    const z = a[8] * u + a[9] * v + a[10] * t + a[11];
    world[3 * s] = x; world[3 * s + 1] = y; world[3 * s + 2] = z;
    const value = trilinear(img, nx, ny, nz, u, v, t);
    values[s] = value; weights[s] = w; weightSum += w;
    sumF += w * value; sumF2 += w * value * value;
    if (value < lo) lo = value;
    if (value > hi) hi = value;
    if (jacobian && hessian && grad) {
      const gi = trilinear(grad[0], nx, ny, nz, u, v, t);
      const gj = trilinear(grad[1], nx, ny, nz, u, v, t);
      const gk = trilinear(grad[2], nx, ny, nz, u, v, t);
      // world gradient = inverse(A)^T voxel gradient
      const gx = inv[0] * gi + inv[4] * gj + inv[8] * gk;
      const gy = inv[1] * gi + inv[5] * gj + inv[9] * gk;
      const gz = inv[2] * gi + inv[6] * gj + inv[10] * gk;
      const dx = x - cx, dy = y - cy, dz = z - cz;
      const o = s * columns;
      jacobian[o] = gx; jacobian[o + 1] = gy; jacobian[o + 2] = gz;
      if (columns === 6) {
        // d/d(omega_k) of the rotated point is e_k x d, so gradient . (e_k x d) = (d x g)_k
        jacobian[o + 3] = dy * gz - dz * gy;
        jacobian[o + 4] = dz * gx - dx * gz;
        jacobian[o + 5] = dx * gy - dy * gx;
      } else {
        const g = [gx, gy, gz], d = [dx, dy, dz];
        for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) jacobian[o + 3 + 3 * r + c] = g[r] * d[c];
      }
      for (let r = 0; r < columns; r++) {
        const wr = w * jacobian[o + r];
        (sumJF as Float64Array)[r] += wr * value;
        (sumJ as Float64Array)[r] += wr;
        for (let c = r; c < columns; c++) hessian[r * columns + c] += wr * jacobian[o + c];
      }
    }
    s++;
  }
  if (hessian) for (let r = 0; r < columns; r++) for (let c = 0; c < r; c++) hessian[r * columns + c] = hessian[c * columns + r];
  return { factor, fwhmMm, count, world, values, weights, weightSum, range: [lo, hi], columns, jacobian, hessian, sumF, sumF2, sumJF, sumJ };
}

/** Trilinear value of an image at a voxel position inside [0, n-1] on every axis. */
function trilinear(img: Float32Array, nx: number, ny: number, nz: number, u: number, v: number, t: number): number {
  let i = Math.floor(u), j = Math.floor(v), k = Math.floor(t);
  if (i >= nx - 1) i = Math.max(0, nx - 2);
  if (j >= ny - 1) j = Math.max(0, ny - 2);
  if (k >= nz - 1) k = Math.max(0, nz - 2);
  const fu = u - i, fv = v - j, ft = t - k;
  const di = nx > 1 ? 1 : 0, dj = ny > 1 ? nx : 0, dk = nz > 1 ? nx * ny : 0;
  const p = i + nx * (j + ny * k);
  const c00 = img[p] + fu * (img[p + di] - img[p]);
  const c10 = img[p + dj] + fu * (img[p + dj + di] - img[p + dj]);
  const c01 = img[p + dk] + fu * (img[p + dk + di] - img[p + dk]);
  const c11 = img[p + dk + dj] + fu * (img[p + dk + dj + di] - img[p + dk + dj]);
  const c0 = c00 + fv * (c10 - c00);
  const c1 = c01 + fv * (c11 - c01);
  return c0 + ft * (c1 - c0);
}

/** Central differences along i, j and k in voxel units (one-sided at the edges, 0 along an axis of one voxel). */
function gradientImages(img: Float32Array, nx: number, ny: number, nz: number): [Float32Array, Float32Array, Float32Array] {
  const n = nx * ny * nz;
  const gi = new Float32Array(n), gj = new Float32Array(n), gk = new Float32Array(n);
  const nxy = nx * ny;
  let p = 0;
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, p++) {
    if (nx > 1) gi[p] = (img[i < nx - 1 ? p + 1 : p] - img[i > 0 ? p - 1 : p]) / (i > 0 && i < nx - 1 ? 2 : 1);
    if (ny > 1) gj[p] = (img[j < ny - 1 ? p + nx : p] - img[j > 0 ? p - nx : p]) / (j > 0 && j < ny - 1 ? 2 : 1);
    if (nz > 1) gk[p] = (img[k < nz - 1 ? p + nxy : p] - img[k > 0 ? p - nxy : p]) / (k > 0 && k < nz - 1 ? 2 : 1);
  }
  return [gi, gj, gk];
}
