import { affineDeterminant, affineSpacing, applyAffine, composeAffine, invertAffine, type Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';

/** Largest voxel count along one axis of a target grid (as the NIfTI reader's limit, 2^15). */
export const MAX_TARGET_DIM = 32768;
/** Largest voxel count of one target volume: 2^27 (512 MiB as float32), far above any fMRI grid. */
export const MAX_TARGET_VOXELS = 2 ** 27;

/** Options of {@link targetGrid}. */
export interface TargetGridOptions {
  /** Voxel size of the target in mm, one number or one per axis. __Default value:__ the source's */
  voxelSizeMm?: number | readonly [number, number, number];
  /**
   * Voxel -> world affine whose lattice the target uses (orientation, voxel size and the position of
   * its voxel centres); the grid is shifted by whole voxels and sized to cover the source. Cannot be
   * combined with `voxelSizeMm`. __Default value:__ the source's orientation
   */
  affine?: Affine;
}

/**
 * Check an affine can map positions both ways.
 * @param a - the affine
 * @param what - its name in the message
 * @returns nothing
 * @throws BoldsweepError SINGULAR_TRANSFORM when it is not 16 finite numbers with a non-zero determinant
 * @example checkInvertible(grid.affine, 'target grid affine')
 */
export function checkInvertible(a: Affine, what: string): void {
  if (a.length !== 16 || !Array.from(a).every(Number.isFinite)) fail('SINGULAR_TRANSFORM', `${what} must be 16 finite numbers (row-major 4x4), got [${Array.from(a).join(', ')}]`);
  const det = affineDeterminant(a);
  const scale = Math.max(...affineSpacing(a)) ** 3;
  if (!(Math.abs(det) > 1e-12 * scale) || scale === 0) fail('SINGULAR_TRANSFORM', `${what} is singular (determinant ${det})`);
}

/**
 * Check a grid's size before anything is allocated for it.
 * @param dims - voxels per axis
 * @param what - its name in the message
 * @returns nothing
 * @throws BoldsweepError TARGET_GRID_TOO_LARGE above {@link MAX_TARGET_DIM} per axis or {@link MAX_TARGET_VOXELS} in all; INVALID_ARGUMENT for non-positive or non-integer dims
 * @example checkGridSize([64, 64, 36], 'target grid')
 */
export function checkGridSize(dims: readonly number[], what: string): void {
  if (dims.length !== 3 || dims.some((d) => !Number.isInteger(d) || d < 1)) {
    if (dims.some((d) => d > MAX_TARGET_DIM)) fail('TARGET_GRID_TOO_LARGE', `${what} would have [${dims.join(', ')}] voxels (at most ${MAX_TARGET_DIM} per axis)`);
    fail('INVALID_ARGUMENT', `${what} dims must be three positive integers, got [${dims.join(', ')}]`);
  }
  const total = dims[0] * dims[1] * dims[2];
  if (dims.some((d) => d > MAX_TARGET_DIM) || total > MAX_TARGET_VOXELS) {
    fail('TARGET_GRID_TOO_LARGE', `${what} would have ${dims.join(' x ')} = ${total.toExponential(2)} voxels (${(total * 4 / 2 ** 30).toFixed(1)} GiB per volume as float32; at most ${MAX_TARGET_DIM} per axis and ${MAX_TARGET_VOXELS} in all)`, { details: { dims: [...dims] } });
  }
}

/**
 * A grid that covers the source grid's field of view (from the outer faces of its edge voxels),
 * either in the source's orientation with another voxel size (centred on the source's field of
 * view), or on the lattice of a given affine. A voxel size equal to the source's gives the source
 * grid itself (same dims, same affine).
 * @param sourceGridOrRun - the source grid (or a run: its first three dims and its affine)
 * @param options - voxelSizeMm or affine
 * @returns the target grid
 * @throws BoldsweepError INVALID_ARGUMENT for a non-positive voxel size or both options; SINGULAR_TRANSFORM for a singular affine; TARGET_GRID_TOO_LARGE when the grid would be absurdly large (checked before anything is allocated)
 * @example targetGrid(runGrid, { voxelSizeMm: 2 }) // a 2 mm grid over the same field of view
 */
export function targetGrid(sourceGridOrRun: Grid | { dims: readonly number[]; affine: Affine }, options: TargetGridOptions = {}): Grid {
  const d = sourceGridOrRun.dims;
  const source: Grid = { dims: [d[0], d[1], d[2]], affine: sourceGridOrRun.affine };
  checkInvertible(source.affine, 'source grid affine');
  checkGridSize(source.dims, 'source grid');
  if (options.affine && options.voxelSizeMm !== undefined) fail('INVALID_ARGUMENT', 'give the target either voxelSizeMm or affine, not both (the affine sets the voxel size)');
  const [nx, ny, nz] = source.dims;
  if (options.affine) {
    const a = options.affine;
    checkInvertible(a, 'target affine');
    // source field-of-view corners in target voxel coordinates; the bounding box of their centres
    const toTarget = composeAffine(invertAffine(a), source.affine);
    const lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
    for (const ci of [-0.5, nx - 0.5]) for (const cj of [-0.5, ny - 0.5]) for (const ck of [-0.5, nz - 0.5]) {
      const p = applyAffine(toTarget, [ci, cj, ck]);
      for (let d = 0; d < 3; d++) { lo[d] = Math.min(lo[d], p[d]); hi[d] = Math.max(hi[d], p[d]); }
    }
    // voxel centres whose voxel overlaps the field of view (a 1e-9 margin absorbs rounding)
    const first = lo.map((v) => Math.ceil(v - 0.5 + 1e-9));
    const last = hi.map((v) => Math.floor(v + 0.5 - 1e-9));
    const dims = first.map((f, d) => last[d] - f + 1) as [number, number, number];
    checkGridSize(dims, 'target grid');
    const shift = new Float64Array(16);
    shift[0] = shift[5] = shift[10] = shift[15] = 1;
    shift[3] = first[0]; shift[7] = first[1]; shift[11] = first[2];
    return { dims, affine: composeAffine(a, shift) };
  }
  const spacing = affineSpacing(source.affine);
  const v = options.voxelSizeMm;
  const want = v === undefined ? spacing : typeof v === 'number' ? [v, v, v] : [...v];
  if (want.length !== 3 || want.some((s) => !(s > 0) || !Number.isFinite(s))) fail('INVALID_ARGUMENT', `voxelSizeMm must be a positive number of mm or three of them, got ${JSON.stringify(v)}`);
  // a voxel size equal to the source's (to 1e-9) keeps its grid exactly: the column lengths of an
  // oblique affine are not exact in floating point
  const ratio = want.map((s, d) => (Math.abs(s - spacing[d]) <= 1e-9 * spacing[d] ? 1 : s / spacing[d]));
  // a whole number of target voxels covering the source extent; 1e-9 keeps an exact fit exact
  const dims = source.dims.map((n, d) => Math.max(1, Math.ceil(n / ratio[d] - 1e-9))) as [number, number, number];
  checkGridSize(dims, 'target grid');
  // target voxel i sits at source voxel (n-1)/2 + (i - (n'-1)/2) * ratio: both grids share their centre
  const srcFromTarget = new Float64Array(16);
  for (let d = 0; d < 3; d++) {
    srcFromTarget[5 * d] = ratio[d];
    srcFromTarget[4 * d + 3] = (source.dims[d] - 1) / 2 - ((dims[d] - 1) / 2) * ratio[d];
  }
  srcFromTarget[15] = 1;
  return { dims, affine: composeAffine(source.affine, srcFromTarget) };
}
