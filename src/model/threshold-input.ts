import { fail } from '../core/fail.js';

/** A statistic map: one value per voxel, NIfTI order (x fastest). */
export type StatMap = Float32Array | Float64Array;

/**
 * Check a probability-like argument (alpha, q) lies strictly between 0 and 1.
 * @param name - argument name for the message
 * @param value - the value
 * @returns the value
 * @throws BoldsweepError INVALID_ARGUMENT outside (0, 1)
 * @example checkOpenUnit('alpha', 0.05)
 */
export function checkOpenUnit(name: string, value: number): number {
  if (!(value > 0 && value < 1)) fail('INVALID_ARGUMENT', `${name} must be strictly between 0 and 1, got ${value}`);
  return value;
}

/**
 * Check a statistic map against its mask (and grid, when given) and count the in-mask voxels.
 * @param map - statistic values
 * @param mask - nonzero = inside the search region
 * @param dims - optional [nx, ny, nz] the map must fill
 * @returns the number of in-mask voxels (>= 1)
 * @throws BoldsweepError GRID_MISMATCH when lengths differ, NON_FINITE_VOXELS for NaN/infinite values
 *   inside the mask, INVALID_ARGUMENT for an empty mask
 * @example const m = checkMapAndMask(zMap, brainMask, [64, 64, 36])
 */
export function checkMapAndMask(map: StatMap, mask: ArrayLike<number>, dims?: readonly number[]): number {
  if (map.length !== mask.length) fail('GRID_MISMATCH', `statistic map has ${map.length} voxels but the mask has ${mask.length}`);
  if (dims !== undefined) {
    if (dims.length < 3 || dims.slice(0, 3).some((d) => !Number.isInteger(d) || d < 1)) fail('INVALID_ARGUMENT', `dims must start with three positive integers, got [${dims.join(', ')}]`);
    const n = dims[0] * dims[1] * dims[2];
    if (n !== map.length) fail('GRID_MISMATCH', `statistic map has ${map.length} voxels but dims ${dims.slice(0, 3).join('x')} need ${n}`);
  }
  let inMask = 0, bad = 0;
  for (let i = 0; i < map.length; i++) {
    if (!mask[i]) continue;
    inMask++;
    if (!Number.isFinite(map[i])) bad++;
  }
  if (bad > 0) fail('NON_FINITE_VOXELS', `statistic map has ${bad} non-finite values inside the mask`, { details: { count: bad } });
  if (inMask === 0) fail('INVALID_ARGUMENT', 'the mask is empty, so there is nothing to threshold');
  return inMask;
}
