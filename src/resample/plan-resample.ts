import { composeAffine, invertAffine, type Affine } from '../core/affine.js';
import { BOUNDARY_MODES, type BoundaryMode } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';
import { checkKernel, type InterpolationKernel } from './interpolation-kernel.js';
import { checkGridSize, checkInvertible } from './target-grid.js';

/**
 * A displacement field on the target grid: the target voxel at world position p takes the source
 * at world position p + d(p), d in mm (RAS+), three values per target voxel (x, y, z interleaved,
 * voxels x fastest).
 */
export interface DisplacementField {
  /** Grid the field is defined on; it must be the target grid. */
  grid: Grid;
  /** d per target voxel, mm, length 3 * nx * ny * nz. */
  vectorsMm: Float32Array;
}

/** Options of resampleVolume and resampleRun. */
export interface ResampleOptions {
  /** The grid to resample onto. __Default value:__ the source's own grid */
  grid?: Grid;
  /** Interpolation kernel: 'nearest', 'linear', 'cubic' or 'lanczos3'. */
  kernel: InterpolationKernel;
  /**
   * Boundary mode (scipy.ndimage's names and map_coordinates meanings; 'wrap' has period n).
   * __Default value:__ `'constant'` (outside the acquired field of view there is no signal)
   */
  mode?: BoundaryMode;
  /** Value outside the source grid in `constant` mode. __Default value:__ 0 */
  cval?: number;
  /**
   * Target world -> source world: a 4x4 affine (e.g. the inverse of a head movement), or a
   * displacement field on the target grid. __Default value:__ the identity
   */
  transform?: Affine | DisplacementField;
}

/** Validated resampling of one source grid onto a target grid (plain data). */
export interface ResamplePlan {
  sourceDims: [number, number, number];
  grid: Grid;
  kernel: InterpolationKernel;
  mode: BoundaryMode;
  cval: number;
  /** Target voxel -> source voxel. */
  srcFromOut: Affine;
  /** Displacement in source voxel units per target voxel (x, y, z interleaved), or null. */
  displacementVox: Float32Array | null;
}

/**
 * Whether two grids are the same: dims equal, affines within 1e-6 mm.
 * @param a - first grid
 * @param b - second grid
 * @returns true when they match
 * @example sameGridWithin(field.grid, target) // false for a field on another grid
 */
export function sameGridWithin(a: Grid, b: Grid): boolean {
  return a.dims.every((d, i) => d === b.dims[i]) && Array.from(a.affine).every((v, i) => Math.abs(v - b.affine[i]) <= 1e-6);
}

/**
 * Validate resampling options for a source grid and turn them into voxel maps.
 * @param source - the source grid
 * @param options - grid, kernel, mode, cval, transform
 * @param volumes - number of volumes to be resampled (sizes the memory check)
 * @returns the plan
 * @throws BoldsweepError UNKNOWN_KERNEL, INVALID_ARGUMENT (mode, cval), TARGET_GRID_TOO_LARGE,
 *   SINGULAR_TRANSFORM (source, target or transform affine), GRID_MISMATCH (a displacement field on another grid)
 * @example const plan = planResample({ dims: [64, 64, 36], affine }, { kernel: 'cubic' })
 */
export function planResample(source: Grid, options: ResampleOptions, volumes = 1): ResamplePlan {
  const kernel = checkKernel(options.kernel);
  const mode = options.mode ?? 'constant';
  if (!BOUNDARY_MODES.includes(mode)) fail('INVALID_ARGUMENT', `mode must be one of ${BOUNDARY_MODES.join(', ')}, got '${String(mode)}'`);
  const cval = options.cval ?? 0;
  if (!Number.isFinite(cval)) fail('INVALID_ARGUMENT', `cval must be a finite number, got ${cval}`);
  checkInvertible(source.affine, 'source grid affine');
  const grid = options.grid ?? { dims: [...source.dims] as [number, number, number], affine: new Float64Array(source.affine) };
  checkGridSize(grid.dims, 'target grid');
  const outVoxels = grid.dims[0] * grid.dims[1] * grid.dims[2];
  if (outVoxels * volumes > 2 ** 31) fail('TARGET_GRID_TOO_LARGE', `the resampled run would hold ${outVoxels} x ${volumes} = ${(outVoxels * volumes).toExponential(2)} values (at most 2^31)`);
  checkInvertible(grid.affine, 'target grid affine');
  const t = options.transform;
  const sourceFromWorld = invertAffine(source.affine);
  let srcFromOut: Affine;
  let displacementVox: Float32Array | null = null;
  if (t === undefined) {
    srcFromOut = composeAffine(sourceFromWorld, grid.affine);
  } else if (ArrayBuffer.isView(t)) {
    checkInvertible(t, 'transform (target world -> source world)');
    srcFromOut = composeAffine(sourceFromWorld, composeAffine(t, grid.affine));
  } else {
    if (!sameGridWithin(t.grid, grid)) fail('GRID_MISMATCH', `the displacement field is on a ${t.grid.dims.join('x')} grid that is not the target grid (${grid.dims.join('x')}, affines within 1e-6 mm); define it on the target grid`);
    if (t.vectorsMm.length !== 3 * outVoxels) fail('INVALID_ARGUMENT', `the displacement field has ${t.vectorsMm.length} values, the target grid needs 3 x ${outVoxels}`);
    srcFromOut = composeAffine(sourceFromWorld, grid.affine);
    displacementVox = new Float32Array(3 * outVoxels);
    const m = sourceFromWorld;
    const v = t.vectorsMm;
    for (let p = 0; p < 3 * outVoxels; p += 3) {
      const dx = v[p], dy = v[p + 1], dz = v[p + 2];
      if (!Number.isFinite(dx + dy + dz)) fail('INVALID_ARGUMENT', `the displacement field has a non-finite vector at target voxel ${p / 3}`);
      displacementVox[p] = m[0] * dx + m[1] * dy + m[2] * dz;
      displacementVox[p + 1] = m[4] * dx + m[5] * dy + m[6] * dz;
      displacementVox[p + 2] = m[8] * dx + m[9] * dy + m[10] * dz;
    }
  }
  return { sourceDims: [...source.dims] as [number, number, number], grid, kernel, mode, cval, srcFromOut, displacementVox };
}
