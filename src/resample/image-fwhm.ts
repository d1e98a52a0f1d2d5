import { fwhmFromDerivativeVariance } from '../model/smoothness-formulas.js';

/**
 * Smoothness of one image treated as a single realisation of a stationary field: inside the region
 * the image is standardised (mean 0, variance 1 over the region), lambda per axis is the mean
 * squared difference between in-region neighbours, and FWHM = sqrt(4 ln 2 / lambda) voxels (the
 * derivative-variance formula of Kiebel SJ et al. 1999, NeuroImage 10:756-766, which
 * estimateSmoothness applies to model residuals over time; here the average runs over space, so
 * it reads image structure as well as noise: compare images of the same scene, not across scenes).
 * @param data - voxel values, x fastest
 * @param dims - [nx, ny, nz]
 * @param spacingMm - voxel size along x, y, z
 * @param region - voxels to use (1 = in)
 * @returns FWHM in mm along x, y, z (Infinity along an axis with no in-region pairs or no change)
 * @example imageFwhmMm(mean, [64, 64, 36], [3, 3, 3], mask)
 */
export function imageFwhmMm(data: ArrayLike<number>, dims: readonly [number, number, number], spacingMm: readonly [number, number, number], region: Uint8Array): [number, number, number] {
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  let sum = 0, count = 0;
  for (let p = 0; p < n; p++) if (region[p]) { sum += data[p]; count++; }
  const mean = sum / Math.max(1, count);
  let ss = 0;
  for (let p = 0; p < n; p++) if (region[p]) ss += (data[p] - mean) ** 2;
  const variance = ss / Math.max(1, count - 1);
  const strides = [1, nx, nx * ny];
  const out: [number, number, number] = [Infinity, Infinity, Infinity];
  for (let axis = 0; axis < 3; axis++) {
    const s = strides[axis];
    let d2 = 0, pairs = 0;
    for (let k = 0, p = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, p++) {
      const c = axis === 0 ? i : axis === 1 ? j : k;
      if (c + 1 >= dims[axis] || !region[p] || !region[p + s]) continue;
      d2 += (data[p + s] - data[p]) ** 2;
      pairs++;
    }
    if (pairs > 0 && variance > 0 && d2 > 0) out[axis] = fwhmFromDerivativeVariance(d2 / pairs / variance) * spacingMm[axis];
  }
  return out;
}
