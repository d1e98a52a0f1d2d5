import { affineDeterminant, type Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';

/** A named space: a voxel grid placed in its own world (world mm). */
export interface TransformSpace {
  /** What the space is, e.g. 'run-mean', 'structural', 'template' (letters, digits, '-', '_', '.'). */
  name: string;
  /** The space's voxel grid (dims and voxel -> world mm). */
  grid: Grid;
}

/**
 * A world-to-world affine between two spaces, with the grids it connects, as boldsweep stores it:
 * a point p (world mm of `from`) is the point `matrix` p (world mm of `to`). To resample an image of
 * `from` onto the grid of `to`, each target voxel's world position is mapped back by the inverse
 * (resampling transforms map target world -> source world: {@link resampleAffineOf}).
 */
export interface StoredTransform {
  from: TransformSpace;
  to: TransformSpace;
  /** from-world mm -> to-world mm, row-major 4x4, last row 0 0 0 1. */
  matrix: Affine;
}

/**
 * Make a stored transform, checking the matrix (finite, invertible, last row 0 0 0 1) and the grids.
 * @param from - the space the matrix maps from
 * @param to - the space it maps into
 * @param matrix - from-world -> to-world, row-major 4x4
 * @returns the transform (copies of the inputs)
 * @throws BoldsweepError INVALID_ARGUMENT for a bad name, grid or matrix
 * @example storedTransform({ name: 'structural', grid: t1wGrid }, { name: 'template', grid: templateGrid }, templateFromStructural)
 */
export function storedTransform(from: TransformSpace, to: TransformSpace, matrix: ArrayLike<number>): StoredTransform {
  checkSpace(from, 'from');
  checkSpace(to, 'to');
  const m = checkMatrix(matrix, 'matrix');
  return { from: copySpace(from), to: copySpace(to), matrix: m };
}

function copySpace(s: TransformSpace): TransformSpace {
  return { name: s.name, grid: { dims: [s.grid.dims[0], s.grid.dims[1], s.grid.dims[2]], affine: new Float64Array(s.grid.affine) } };
}

/**
 * Check a space's name and grid.
 * @param s - the space
 * @param what - its role, for the message
 * @throws BoldsweepError INVALID_ARGUMENT
 */
export function checkSpace(s: TransformSpace, what: string): void {
  if (typeof s?.name !== 'string' || !/^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$/.test(s.name)) fail('INVALID_ARGUMENT', `${what}.name must be 1-64 letters, digits, '.', '-' or '_', got ${JSON.stringify(s?.name)}`);
  const d = s.grid?.dims;
  if (!Array.isArray(d) || d.length !== 3 || d.some((n) => !Number.isInteger(n) || n < 1)) fail('INVALID_ARGUMENT', `${what}.grid.dims must be three positive integers, got ${JSON.stringify(d)}`);
  checkMatrix(s.grid.affine, `${what}.grid.affine`);
}

/**
 * Check a 4x4 affine: 16 finite numbers, last row 0 0 0 1, invertible 3x3 part.
 * @param m - the matrix, row-major
 * @param what - its name, for the message
 * @returns a Float64Array copy
 * @throws BoldsweepError INVALID_ARGUMENT
 */
export function checkMatrix(m: ArrayLike<number>, what: string): Affine {
  if (!m || m.length !== 16 || !Array.from(m).every(Number.isFinite)) fail('INVALID_ARGUMENT', `${what} must be 16 finite numbers (a row-major 4x4)`);
  const a = Float64Array.from(m);
  if (a[12] !== 0 || a[13] !== 0 || a[14] !== 0 || a[15] !== 1) fail('INVALID_ARGUMENT', `${what} must end in the row 0 0 0 1, got ${Array.from(a.subarray(12)).join(' ')}`);
  const det = affineDeterminant(a);
  // a voxel of 1e-9 mm^3 or a 10^9-fold blow-up is no mapping between head images
  if (!(Math.abs(det) > 1e-9) || !(Math.abs(det) < 1e9)) fail('INVALID_ARGUMENT', `${what} is singular or degenerate (determinant ${det})`);
  return a;
}
