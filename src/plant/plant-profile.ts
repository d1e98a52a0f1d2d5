import { invertAffine, type Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';

/** FWHM = 2 sqrt(2 ln 2) sigma for a Gaussian (REFERENCES.md §1). */
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/**
 * Gaussian blobs are cut off at 4 sigma (weight below exp(-8) = 3.4e-4 of the peak), the same
 * truncation scipy.ndimage uses for its Gaussian kernels; what is cut off is never added to the run,
 * so the stored profile is exactly what was planted.
 */
const GAUSSIAN_SUPPORT_SIGMAS = 4;

/**
 * The spatial shape of one planted activation.
 * - `gaussian`: weight exp(-r^2 / (2 sigma^2)) with sigma = fwhmMm / 2.35482, 1 at the centre.
 * - `sphere`: weight 1 inside radiusMm - edgeMm/2, 0 beyond radiusMm + edgeMm/2, and a raised-cosine
 *   ramp between, so the weight is exactly 0.5 at radiusMm (the half-maximum surface is the sphere).
 */
export type BlobShapeSpec =
  | { shape: 'gaussian'; fwhmMm: number }
  | { shape: 'sphere'; radiusMm: number; edgeMm: number };

/**
 * Check a blob shape's sizes and return it.
 * @param spec - shape and sizes
 * @returns the same spec
 * @throws BoldsweepError INVALID_ARGUMENT for non-positive or non-finite sizes, or an edge wider than the sphere
 * @example checkBlobShape({ shape: 'gaussian', fwhmMm: 6 })
 */
export function checkBlobShape(spec: BlobShapeSpec): BlobShapeSpec {
  if (spec.shape === 'gaussian') {
    if (!(spec.fwhmMm > 0) || !Number.isFinite(spec.fwhmMm)) fail('INVALID_ARGUMENT', `fwhmMm must be a positive number of mm, got ${spec.fwhmMm}`);
  } else if (spec.shape === 'sphere') {
    if (!(spec.radiusMm > 0) || !Number.isFinite(spec.radiusMm)) fail('INVALID_ARGUMENT', `radiusMm must be a positive number of mm, got ${spec.radiusMm}`);
    if (!(spec.edgeMm >= 0) || spec.edgeMm > 2 * spec.radiusMm) fail('INVALID_ARGUMENT', `edgeMm must be in 0..2*radiusMm (0..${2 * spec.radiusMm}), got ${spec.edgeMm}`);
  } else {
    fail('INVALID_ARGUMENT', `shape must be 'gaussian' or 'sphere', got '${(spec as { shape: unknown }).shape}'`);
  }
  return spec;
}

/**
 * The characteristic size of a blob in mm, used for spacing blobs apart and as the default
 * peak-search radius: the FWHM of a Gaussian, the diameter (2 * radiusMm) of a sphere.
 * @param spec - shape and sizes
 * @returns size in mm
 * @example blobSizeMm({ shape: 'sphere', radiusMm: 4, edgeMm: 2 }) // 8
 */
export function blobSizeMm(spec: BlobShapeSpec): number {
  return spec.shape === 'gaussian' ? spec.fwhmMm : 2 * spec.radiusMm;
}

/**
 * Distance from the centre beyond which a blob's weight is zero.
 * @param spec - shape and sizes
 * @returns radius in mm (4 sigma for a Gaussian, radiusMm + edgeMm/2 for a sphere)
 * @example blobSupportMm({ shape: 'gaussian', fwhmMm: 6 }) // 10.19...
 */
export function blobSupportMm(spec: BlobShapeSpec): number {
  return spec.shape === 'gaussian' ? (GAUSSIAN_SUPPORT_SIGMAS * spec.fwhmMm) / FWHM_PER_SIGMA : spec.radiusMm + spec.edgeMm / 2;
}

/**
 * Weight of a blob at a distance from its centre (1 at the centre).
 * @param spec - shape and sizes
 * @param rMm - distance from the centre in mm
 * @returns weight in [0, 1]
 * @example blobWeight({ shape: 'gaussian', fwhmMm: 6 }, 3) // 0.5 (half maximum at half the FWHM)
 */
export function blobWeight(spec: BlobShapeSpec, rMm: number): number {
  if (rMm > blobSupportMm(spec)) return 0;
  if (spec.shape === 'gaussian') {
    const sigma = spec.fwhmMm / FWHM_PER_SIGMA;
    return Math.exp((-rMm * rMm) / (2 * sigma * sigma));
  }
  const inner = spec.radiusMm - spec.edgeMm / 2;
  if (rMm <= inner) return spec.edgeMm === 0 && rMm === spec.radiusMm ? 0.5 : 1;
  if (spec.edgeMm === 0) return 0;
  // raised cosine from 1 at `inner` to 0 at inner + edgeMm: smooth, and 0.5 at radiusMm
  return 0.5 * (1 + Math.cos((Math.PI * (rMm - inner)) / spec.edgeMm));
}

/** The voxels one blob touches and their weights (sparse; voxels in NIfTI order). */
export interface SparseProfile {
  /** Voxel indices i + nx*(j + ny*k), ascending. */
  index: Int32Array;
  /** Weight at each of those voxels, > 0. */
  weight: Float32Array;
}

/**
 * The spatial weight of one blob sampled at the voxel centres of a grid. Distances are measured in
 * world mm through the affine, so anisotropic and oblique grids are handled.
 * @param dims - [nx, ny, nz] of the grid
 * @param affine - voxel -> world (mm)
 * @param centreVoxel - blob centre in (possibly fractional) voxel indices
 * @param spec - shape and sizes
 * @returns voxels with weight > 0 and their weights
 * @example const p = blobProfile([64, 64, 36], run.volume.affine, [30, 31, 18], { shape: 'gaussian', fwhmMm: 6 })
 */
export function blobProfile(dims: readonly number[], affine: Affine, centreVoxel: readonly [number, number, number], spec: BlobShapeSpec): SparseProfile {
  const [nx, ny, nz] = dims;
  const support = blobSupportMm(spec);
  const ext = indexExtent(affine, support);
  const [ci, cj, ck] = centreVoxel;
  const a = affine;
  const index: number[] = [];
  const weight: number[] = [];
  const k0 = Math.max(0, Math.ceil(ck - ext[2])), k1 = Math.min(nz - 1, Math.floor(ck + ext[2]));
  const j0 = Math.max(0, Math.ceil(cj - ext[1])), j1 = Math.min(ny - 1, Math.floor(cj + ext[1]));
  const i0 = Math.max(0, Math.ceil(ci - ext[0])), i1 = Math.min(nx - 1, Math.floor(ci + ext[0]));
  for (let k = k0; k <= k1; k++) {
    for (let j = j0; j <= j1; j++) {
      for (let i = i0; i <= i1; i++) {
        const di = i - ci, dj = j - cj, dk = k - ck;
        const x = a[0] * di + a[1] * dj + a[2] * dk;
        const y = a[4] * di + a[5] * dj + a[6] * dk;
        const z = a[8] * di + a[9] * dj + a[10] * dk;
        const w = blobWeight(spec, Math.sqrt(x * x + y * y + z * z));
        if (w > 0) {
          index.push(i + nx * (j + ny * k));
          weight.push(w);
        }
      }
    }
  }
  return { index: Int32Array.from(index), weight: Float32Array.from(weight) };
}

/**
 * Half-widths in voxel indices of the box that holds a world-space ball of radius r: along index
 * axis i it is r * |row i of the inverse 3x3 part| (exact for oblique grids too).
 * @param affine - voxel -> world
 * @param rMm - ball radius in mm
 * @returns half-widths along i, j, k (fractional)
 * @example indexExtent(diagonalAffine([3, 3, 3]), 6) // [2, 2, 2]
 */
export function indexExtent(affine: Affine, rMm: number): [number, number, number] {
  const inv = invertAffine(affine);
  const row = (r: number) => Math.hypot(inv[4 * r], inv[4 * r + 1], inv[4 * r + 2]);
  return [rMm * row(0), rMm * row(1), rMm * row(2)];
}
