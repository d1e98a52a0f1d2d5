import { composeAffine, type Affine } from '../core/affine.js';
import type { FixedLevel } from './prepare-fixed-level.js';
import type { MovingLevel } from './moving-level.js';

/**
 * The moving image (trilinear) at a level's samples moved by a transform, packed: the samples that
 * land inside the moving grid are written to the front of the outputs, in order.
 * @param level - the fixed level
 * @param moving - the moving image at this level
 * @param transform - fixed world -> moving world
 * @param fixedOut - fixed values of the kept samples (length >= level.count)
 * @param movingOut - moving values of the kept samples
 * @param weightsOut - weights of the kept samples
 * @returns how many samples were kept and their total weight
 * @example const { kept } = sampleMoving(level, moving, transform, f, m, w)
 */
export function sampleMoving(level: FixedLevel, moving: MovingLevel, transform: Affine, fixedOut: Float32Array, movingOut: Float32Array, weightsOut: Float32Array): { kept: number; validWeight: number } {
  const L = composeAffine(moving.voxelFromWorld, transform);
  const [nx, ny, nz] = moving.dims;
  const nxy = nx * ny;
  const xMax = nx - 1, yMax = ny - 1, zMax = nz - 1;
  const data = moving.data;
  const world = level.world;
  let kept = 0, validWeight = 0;
  for (let s = 0; s < level.count; s++) {
    const x = world[3 * s], y = world[3 * s + 1], z = world[3 * s + 2];
    const u = L[0] * x + L[1] * y + L[2] * z + L[3];
    const v = L[4] * x + L[5] * y + L[6] * z + L[7];
    const t = L[8] * x + L[9] * y + L[10] * z + L[11];
    if (!(u >= 0 && u <= xMax && v >= 0 && v <= yMax && t >= 0 && t <= zMax)) continue;
    let i = u | 0, j = v | 0, k = t | 0;
    if (i === xMax) i--;
    if (j === yMax) j--;
    if (k === zMax) k--;
    const fu = u - i, fv = v - j, ft = t - k;
    const p = i + nx * j + nxy * k;
    const c00 = data[p] + fu * (data[p + 1] - data[p]);
    const c10 = data[p + nx] + fu * (data[p + nx + 1] - data[p + nx]);
    const c01 = data[p + nxy] + fu * (data[p + nxy + 1] - data[p + nxy]);
    const c11 = data[p + nxy + nx] + fu * (data[p + nxy + nx + 1] - data[p + nxy + nx]);
    const c0 = c00 + fv * (c10 - c00);
    const c1 = c01 + fv * (c11 - c01);
    fixedOut[kept] = level.values[s];
    movingOut[kept] = c0 + ft * (c1 - c0);
    weightsOut[kept] = level.weights[s];
    validWeight += level.weights[s];
    kept++;
  }
  return { kept, validWeight };
}
