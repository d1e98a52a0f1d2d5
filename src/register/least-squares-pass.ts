import { composeAffine, type Affine } from '../core/affine.js';
import type { FixedLevel } from './prepare-fixed-level.js';
import type { MovingLevel } from './moving-level.js';

/** Sums of one least-squares pass. */
export interface LeastSquaresSums {
  /** Weighted mean of (moving - (scale * fixed + offset))^2 over the samples inside the moving grid. */
  cost: number;
  /** Weight of the samples inside the moving grid. */
  validWeight: number;
  /** Intensity scale and offset fitted over those samples (moving ~ scale * fixed + offset). */
  scale: number;
  offset: number;
}

/**
 * One pass of the inverse compositional Gauss-Newton scheme over a level's samples, with a global
 * linear intensity fit: the moving image (trilinear) at the transformed sample positions, the scale
 * a and offset b of the weighted least-squares line moving ~ a fixed + b over the samples inside the
 * moving grid (so a brighter volume, as the first volumes of a run before the steady state, or a
 * global drift, is not taken for movement), the residual r = moving - a fixed - b, the right-hand
 * side sum w J r, and the part of the Gauss-Newton matrix that belongs to samples falling outside
 * the moving grid (to be taken off the level's precomputed matrix). The fit uses sums over the
 * samples (the fixed sums precomputed per level, less the outside samples' terms), so it costs one
 * pass.
 * @param level - the fixed level with its Jacobian (least squares)
 * @param moving - the moving image at this level
 * @param transform - fixed world -> moving world
 * @param b - output, length level.columns (overwritten): sum w J r
 * @param outside - output, columns x columns (overwritten)
 * @returns the cost, the weight inside the moving grid, the intensity scale and offset
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
  // sums over the samples inside: w M, w M^2, w M F, w J M; over the samples outside: w, w F, w F^2, w J F, w J
  let sM = 0, sMM = 0, sMF = 0;
  let oW = 0, oF = 0, oFF = 0;
  const oJF = new Float64Array(nc), oJ = new Float64Array(nc);
  let b0 = 0, b1 = 0, b2 = 0, b3 = 0, b4 = 0, b5 = 0;
  const n = level.count;
  for (let s = 0; s < n; s++) {
    const x = world[3 * s], y = world[3 * s + 1], z = world[3 * s + 2];
    const u = l0 * x + l1 * y + l2 * z + l3;
    const v = l4 * x + l5 * y + l6 * z + l7;
    const t = l8 * x + l9 * y + l10 * z + l11;
    const w = weights[s];
    const o = s * nc;
    if (!(u >= 0 && u <= xMax && v >= 0 && v <= yMax && t >= 0 && t <= zMax)) {
      const f = values[s];
      oW += w; oF += w * f; oFF += w * f * f;
      for (let r = 0; r < nc; r++) {
        const wr = w * J[o + r];
        oJF[r] += wr * f; oJ[r] += wr;
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
    const m = c0 + ft * (c1 - c0);
    const wm = w * m;
    sM += wm; sMM += wm * m; sMF += wm * values[s];
    if (nc === 6) {
      b0 += wm * J[o]; b1 += wm * J[o + 1]; b2 += wm * J[o + 2]; b3 += wm * J[o + 3]; b4 += wm * J[o + 4]; b5 += wm * J[o + 5];
    } else {
      for (let q = 0; q < nc; q++) b[q] += wm * J[o + q];
    }
  }
  if (nc === 6) { b[0] = b0; b[1] = b1; b[2] = b2; b[3] = b3; b[4] = b4; b[5] = b5; }
  for (let r = 0; r < nc; r++) for (let c = 0; c < r; c++) outside[r * nc + c] = outside[c * nc + r];
  const sW = level.weightSum - oW;
  if (!(sW > 0)) return { cost: Infinity, validWeight: 0, scale: 1, offset: 0 };
  const sF = level.sumF - oF, sFF = level.sumF2 - oFF;
  // weighted least-squares line M ~ a F + b over the inside samples, from centred sums
  const meanF = sF / sW, meanM = sM / sW;
  const varF = sFF - sF * meanF;
  const covMF = sMF - sF * meanM;
  const varM = sMM - sM * meanM;
  const scale = varF > 0 ? covMF / varF : 1;
  const offset = meanM - scale * meanF;
  // sum w (M - aF - b)^2 = varM - a^2 varF (at the fitted line)
  const cost = Math.max(0, varM - scale * covMF) / sW;
  const sumJF = level.sumJF as Float64Array, sumJ = level.sumJ as Float64Array;
  for (let q = 0; q < nc; q++) b[q] -= scale * (sumJF[q] - oJF[q]) + offset * (sumJ[q] - oJ[q]);
  return { cost, validWeight: sW, scale, offset };
}
