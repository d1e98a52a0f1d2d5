import type { Affine, Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Rng } from '../core/random.js';
import { indexExtent } from './plant-profile.js';

/** How {@link placeCentres} chooses centres. */
export interface PlacementOptions {
  /** Number of centres wanted (integer >= 1). */
  count: number;
  /** Smallest allowed distance in mm between any two centres. */
  minDistanceMm: number;
  /** Every voxel centre within this distance (mm) of a chosen centre must lie inside the mask. */
  marginMm: number;
  /** Random draws allowed in total before giving up. */
  maxAttempts: number;
}

/**
 * Voxels of a mask far enough from its edge: a voxel qualifies when every voxel centre within
 * `marginMm` of it (world distance) is inside the grid and inside the mask.
 * @param mask - nonzero = in, length nx*ny*nz
 * @param dims - [nx, ny, nz]
 * @param affine - voxel -> world (mm)
 * @param marginMm - distance to keep from the edge (0 = every mask voxel)
 * @returns qualifying voxel indices, ascending
 * @example const eligible = interiorVoxels(greyMatter, [64, 64, 36], affine, 3)
 */
export function interiorVoxels(mask: ArrayLike<number>, dims: readonly number[], affine: Affine, marginMm: number): Int32Array {
  const [nx, ny, nz] = dims;
  const ball = ballOffsets(affine, marginMm);
  const out: number[] = [];
  for (let k = 0; k < nz; k++) {
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const v = i + nx * (j + ny * k);
        if (!mask[v]) continue;
        let inside = true;
        for (const [di, dj, dk] of ball) {
          const ii = i + di, jj = j + dj, kk = k + dk;
          if (ii < 0 || jj < 0 || kk < 0 || ii >= nx || jj >= ny || kk >= nz || !mask[ii + nx * (jj + ny * kk)]) { inside = false; break; }
        }
        if (inside) out.push(v);
      }
    }
  }
  return Int32Array.from(out);
}

/**
 * Choose blob centres at random voxels of a mask, away from its edge and from each other.
 * Each draw takes a uniformly random qualifying voxel and keeps it when it is at least
 * `minDistanceMm` from every centre kept so far; draws stop when `count` are kept.
 * @param mask - nonzero = allowed, length nx*ny*nz
 * @param dims - [nx, ny, nz]
 * @param affine - voxel -> world (mm)
 * @param options - count, spacing, margin, attempts
 * @param rng - seeded stream (the only randomness)
 * @returns centres as integer voxel indices [i, j, k], in the order chosen
 * @throws BoldsweepError PLANTING_DOES_NOT_FIT when fewer than `count` fit within `maxAttempts` draws
 * @example placeCentres(greyMatter, dims, affine, { count: 5, minDistanceMm: 12, marginMm: 3, maxAttempts: 1000 }, createRng(1))
 */
export function placeCentres(mask: ArrayLike<number>, dims: readonly number[], affine: Affine, options: PlacementOptions, rng: Rng): Vec3[] {
  const [nx, ny] = dims;
  const eligible = interiorVoxels(mask, dims, affine, options.marginMm);
  const centres: Vec3[] = [];
  const world: Vec3[] = [];
  const min2 = options.minDistanceMm * options.minDistanceMm;
  let attempts = 0;
  while (centres.length < options.count && attempts < options.maxAttempts && eligible.length > 0) {
    attempts++;
    const v = eligible[rng.int(eligible.length)];
    const k = Math.floor(v / (nx * ny)), j = Math.floor((v - k * nx * ny) / nx), i = v - nx * (j + ny * k);
    const p = toWorld(affine, i, j, k);
    if (world.every((q) => (p[0] - q[0]) ** 2 + (p[1] - q[1]) ** 2 + (p[2] - q[2]) ** 2 >= min2)) {
      centres.push([i, j, k]);
      world.push(p);
    }
  }
  if (centres.length < options.count) {
    fail('PLANTING_DOES_NOT_FIT', `only ${centres.length} of ${options.count} planted activations fitted in the mask after ${attempts} attempts `
      + `(${eligible.length} voxels are at least ${options.marginMm} mm inside the mask; centres must be ${options.minDistanceMm} mm apart)`,
    { details: { fitted: centres.length, requested: options.count, attempts, eligibleVoxels: eligible.length } });
  }
  return centres;
}

function toWorld(a: Affine, i: number, j: number, k: number): Vec3 {
  return [a[0] * i + a[1] * j + a[2] * k + a[3], a[4] * i + a[5] * j + a[6] * k + a[7], a[8] * i + a[9] * j + a[10] * k + a[11]];
}

/** Integer voxel offsets whose world distance from the origin is <= rMm (origin excluded). */
function ballOffsets(affine: Affine, rMm: number): Vec3[] {
  if (!(rMm > 0)) return [];
  const ext = indexExtent(affine, rMm).map((e) => Math.floor(e + 1e-9));
  const out: Vec3[] = [];
  const a = affine;
  for (let dk = -ext[2]; dk <= ext[2]; dk++) for (let dj = -ext[1]; dj <= ext[1]; dj++) for (let di = -ext[0]; di <= ext[0]; di++) {
    if (di === 0 && dj === 0 && dk === 0) continue;
    const x = a[0] * di + a[1] * dj + a[2] * dk, y = a[4] * di + a[5] * dj + a[6] * dk, z = a[8] * di + a[9] * dj + a[10] * dk;
    if (x * x + y * y + z * z <= rMm * rMm * (1 + 1e-12)) out.push([di, dj, dk]);
  }
  return out;
}
