import type { Affine } from './affine.js';
import { fail } from './fail.js';

/** Image dimensions: voxels along x, y, z and the number of volumes (1 for a 3D image). */
export type Dims4 = [nx: number, ny: number, nz: number, nt: number];

/**
 * One image or run held in memory once, as Float32 in NIfTI order (x fastest, then y, z, t):
 * voxel (i, j, k) of volume t is at `i + nx*(j + ny*(k + nz*t))`.
 */
export interface Volume {
  /** [nx, ny, nz, nt]; nt is 1 for a 3D image. */
  readonly dims: Dims4;
  /** Voxel size in mm along i, j, k. */
  readonly spacingMm: [number, number, number];
  /** Repetition time in seconds; 0 when unknown or for a 3D image. */
  readonly trSec: number;
  /** Voxel index -> world (RAS+ mm). */
  readonly affine: Affine;
  /** Voxel values, length nx*ny*nz*nt. */
  readonly data: Float32Array;
}

/**
 * Number of voxels in one volume (nx*ny*nz).
 * @param v - volume or dims
 * @returns voxel count per volume
 * @example voxelsPerVolume(run.volume)
 */
export function voxelsPerVolume(v: Pick<Volume, 'dims'>): number {
  return v.dims[0] * v.dims[1] * v.dims[2];
}

/**
 * Check a volume's fields agree with each other and return it; the single validation point for
 * anything that constructs a Volume from outside data.
 * @param v - fields of the volume
 * @returns the same volume
 * @throws BoldsweepError INVALID_ARGUMENT when dims, spacing or data length disagree
 * @example makeVolume({ dims: [2,2,2,1], spacingMm: [1,1,1], trSec: 0, affine: identityAffine(), data: new Float32Array(8) })
 */
export function makeVolume(v: Volume): Volume {
  if (v.dims.length !== 4 || v.dims.some((d) => !Number.isInteger(d) || d < 1)) fail('INVALID_ARGUMENT', `dims must be four positive integers, got [${v.dims.join(', ')}]`);
  if (v.spacingMm.some((s) => !(s > 0) || !Number.isFinite(s))) fail('INVALID_ARGUMENT', `spacingMm must be positive, got [${v.spacingMm.join(', ')}]`);
  if (!(v.trSec >= 0) || !Number.isFinite(v.trSec)) fail('INVALID_ARGUMENT', `trSec must be >= 0, got ${v.trSec}`);
  if (v.affine.length !== 16) fail('INVALID_ARGUMENT', `affine must have 16 elements, got ${v.affine.length}`);
  const n = v.dims[0] * v.dims[1] * v.dims[2] * v.dims[3];
  if (v.data.length !== n) fail('INVALID_ARGUMENT', `data length ${v.data.length} does not match dims product ${n}`);
  return v;
}

/**
 * A new volume with the same geometry and TR, fresh data and the given number of volumes.
 * @param like - volume whose grid to copy
 * @param nt - number of volumes of the result (default 1)
 * @param data - data to wrap (default zeros)
 * @returns the new volume
 * @example const meanMap = volumeLike(run.volume, 1)
 */
export function volumeLike(like: Volume, nt = 1, data?: Float32Array): Volume {
  const n = voxelsPerVolume(like) * nt;
  return makeVolume({
    dims: [like.dims[0], like.dims[1], like.dims[2], nt],
    spacingMm: [...like.spacingMm],
    trSec: like.trSec,
    affine: new Float64Array(like.affine),
    data: data ?? new Float32Array(n),
  });
}

/**
 * A view (no copy) of volume `t` of a run.
 * @param v - the run
 * @param t - volume index, 0-based
 * @returns a Float32Array sharing memory with `v.data`
 * @example const first = volumeAt(run.volume, 0)
 */
export function volumeAt(v: Volume, t: number): Float32Array {
  const n = voxelsPerVolume(v);
  if (!Number.isInteger(t) || t < 0 || t >= v.dims[3]) fail('INVALID_ARGUMENT', `volume index ${t} outside 0..${v.dims[3] - 1}`);
  return v.data.subarray(n * t, n * (t + 1));
}

/**
 * True when two volumes share a voxel grid (dims x,y,z and affine within 1e-4 mm).
 * @param a - first volume
 * @param b - second volume
 * @returns whether they share a grid
 * @example sameGrid(mask, run.volume)
 */
export function sameGrid(a: Pick<Volume, 'dims' | 'affine'>, b: Pick<Volume, 'dims' | 'affine'>): boolean {
  for (let i = 0; i < 3; i++) if (a.dims[i] !== b.dims[i]) return false;
  for (let i = 0; i < 16; i++) if (Math.abs(a.affine[i] - b.affine[i]) > 1e-4) return false;
  return true;
}

/**
 * Throw GRID_MISMATCH unless two volumes share a grid.
 * @param a - first volume
 * @param b - second volume
 * @param what - names for the message, e.g. ['mask', 'run']
 * @example assertSameGrid(mask, run.volume, ['mask', 'run'])
 */
export function assertSameGrid(a: Pick<Volume, 'dims' | 'affine'>, b: Pick<Volume, 'dims' | 'affine'>, what: [string, string]): void {
  if (!sameGrid(a, b)) {
    fail('GRID_MISMATCH', `${what[0]} grid [${a.dims.slice(0, 3).join('x')}] differs from ${what[1]} grid [${b.dims.slice(0, 3).join('x')}] (or their voxel-to-world mappings differ)`);
  }
}

/**
 * Bytes a run of these dims occupies in memory as Float32 (the README quotes this).
 * @param dims - [nx, ny, nz, nt]
 * @returns bytes
 * @example runBytes([64,64,36,200]) // 117964800 (~113 MiB)
 */
export function runBytes(dims: Readonly<Dims4>): number {
  return dims[0] * dims[1] * dims[2] * dims[3] * 4;
}
