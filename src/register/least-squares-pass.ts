import { composeAffine, type Affine } from '../core/affine.js';
import type { FixedLevel } from './prepare-fixed-level.js';
import type { MovingLevel } from './moving-level.js';

/** Sums of one least-squares pass. */
export interface LeastSquaresSums {
  /** Weighted mean of (moving - fixed)^2 over the samples inside the moving grid. */
  cost: number;
  /** Weight of the samples inside the moving grid. */
  validWeight: number;
}

/**
 * One pass of the inverse compositional Gauss-Newton scheme over a level's samples: the moving image
 * (trilinear) at the transformed sample positions, the residual r = moving - fixed, the right-hand
 * side b = sum w J r, and the part of the Gauss-Newton matrix that belongs to samples falling
 * outside the moving grid (to be taken off the level's precomputed matrix).
 * @param level - the fixed level with its Jacobian (least squares)
 * @param moving - the moving image at this level
 * @param transform - fixed world -> moving world
 * @param b - output, length level.columns (overwritten)
 * @param outside - output, columns x columns (overwritten)
 * @returns the cost and the weight inside the moving grid
 * @example const { cost } = leastSquaresPass(level, moving, transform, b, outside)
 */
export function leastSquaresPass(level: FixedLevel, moving: MovingLevel, transform: Affine, b: Float64Array, outside: Float64Array): LeastSquaresSums {
  const L = composeAffine(moving.voxelFromWorld, transform);
  const l0 = L[0], l1 = L[1], l2 = L[2], l3 = L[3], l4 = L[4], l5 = L[5], l6 = L[6], l7 = L[7], l8 = L[8], l9 = L[9], l10 = L[10], l11 = L[11];
  const [nx, ny, nz] = moving.dims;
  const nxy = nx * ny;
  const xMax = nx - 1, yMax = ny - 1, zMax = nz - 1;
  const data = moving.data;
  const world = level.world, values = level.values, weights = level.weights;
  const J = level.jacobian as Float64Array;
  const nc = level.columns;
  b.fill(0);
  outside.fill(0);
  let b0 = 0, b1 = 0, b2 = 0, b3 = 0, b4 = 0, b5 = 0;
  let sum = 0, validWeight = 0;
  const n = level.count;
  for (let s = 0; s < n; s++) {
    const x = world[3 * s], y = world[3 * s + 1], z = world[3 * s + 2];
    const u = l0 * x + l1 * y + l2 * z + l3;
    const v = l4 * x + l5 * y + l6 * z + l7;
    const t = l8 * x + l9 * y + l10 * z + l11;
    const w = weights[s];
    const o = s * nc;
    if (!(u >= 0 && u <= xMax && v >= 0 && v <= yMax && t >= 0 && t <= zMax)) {
      for (let r = 0; r < nc; r++) {
        const wr = w * J[o + r];
        for (let c = r; c < nc; c++) outside[r * nc + c] += wr * J[o + c];
      }
      continue;
    }
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
    const r = c0 + ft * (c1 - c0) - values[s];
    const wr = w * r;
    sum += wr * r;
    validWeight += w;
    if (nc === 6) {
      b0 += wr * J[o]; b1 += wr * J[o + 1]; b2 += wr * J[o + 2]; b3 += wr * J[o + 3]; b4 += wr * J[o + 4]; b5 += wr * J[o + 5];
    } else {
      for (let q = 0; q < nc; q++) b[q] += wr * J[o + q];
    }
  }
  if (nc === 6) { b[0] = b0; b[1] = b1; b[2] = b2; b[3] = b3; b[4] = b4; b[5] = b5; }
  for (let r = 0; r < nc; r++) for (let c = 0; c < r; c++) outside[r * nc + c] = outside[c * nc + r];
  return { cost: validWeight > 0 ? sum / validWeight : Infinity, validWeight };
}
