import { fail } from '../core/fail.js';

/**
 * FWHM of a Gaussian divided by its standard deviation: 2 sqrt(2 ln 2) = 2.3548200450309493
 * (solve exp(-x^2 / (2 sigma^2)) = 1/2 for x and double it).
 */
export const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/** Default truncation: the kernel stops at `truncate` standard deviations, as scipy.ndimage does (4.0). */
export const DEFAULT_TRUNCATE = 4.0;

/**
 * Standard deviation of a Gaussian from its full width at half maximum.
 * @param fwhm - full width at half maximum (any unit)
 * @returns sigma in the same unit
 * @example fwhmToSigma(8) // 3.3972872...
 */
export function fwhmToSigma(fwhm: number): number {
  return fwhm / FWHM_PER_SIGMA;
}

/**
 * Full width at half maximum of a Gaussian from its standard deviation.
 * @param sigma - standard deviation (any unit)
 * @returns FWHM in the same unit
 * @example sigmaToFwhm(1) // 2.3548200450309493
 */
export function sigmaToFwhm(sigma: number): number {
  return sigma * FWHM_PER_SIGMA;
}

/**
 * Kernel sigma along each voxel axis, in voxels: a width in mm divided by that axis's voxel size,
 * so anisotropic voxels get a kernel that is isotropic in mm.
 * @param fwhmMm - FWHM in mm, one number for all axes or one per axis
 * @param spacingMm - voxel size in mm along i, j, k
 * @returns sigma in voxels along i, j, k
 * @example sigmaVoxels(6, [3, 3, 4]) // [0.8493, 0.8493, 0.6370]
 */
export function sigmaVoxels(fwhmMm: number | readonly [number, number, number], spacingMm: readonly [number, number, number]): [number, number, number] {
  const f = typeof fwhmMm === 'number' ? [fwhmMm, fwhmMm, fwhmMm] : fwhmMm;
  return [0, 1, 2].map((a) => fwhmToSigma(f[a]) / spacingMm[a]) as [number, number, number];
}

/**
 * Half-width of the sampled kernel: int(truncate * sigma + 0.5) voxels, the rule scipy.ndimage's
 * gaussian_filter1d uses, so the two agree tap for tap.
 * @param sigma - standard deviation in voxels (>= 0)
 * @param truncate - how many standard deviations to keep (default 4)
 * @returns radius in voxels; the kernel has 2*radius + 1 taps
 * @example kernelRadius(0.8493) // 3
 */
export function kernelRadius(sigma: number, truncate: number = DEFAULT_TRUNCATE): number {
  return Math.floor(truncate * sigma + 0.5);
}

/**
 * Sampled, normalised 1-D Gaussian: w[r + d] = exp(-d^2 / (2 sigma^2)) / sum, d = -r..r, with r from
 * {@link kernelRadius}. Sampling (not integrating over the voxel) matches scipy.ndimage; the sum is 1
 * so smoothing keeps the mean. sigma 0 gives the identity kernel [1].
 * @param sigma - standard deviation in voxels (>= 0, finite)
 * @param truncate - standard deviations kept each side (default 4)
 * @returns weights, length 2r + 1, symmetric
 * @throws BoldsweepError INVALID_ARGUMENT for negative or non-finite sigma or truncate
 * @example gaussianKernel1d(1) // 9 taps, centre 0.3990503
 */
export function gaussianKernel1d(sigma: number, truncate: number = DEFAULT_TRUNCATE): Float64Array {
  if (!(sigma >= 0) || !Number.isFinite(sigma)) fail('INVALID_ARGUMENT', `sigma must be a finite number >= 0 voxels, got ${sigma}`);
  if (!(truncate > 0) || !Number.isFinite(truncate)) fail('INVALID_ARGUMENT', `truncate must be a finite number > 0, got ${truncate}`);
  const r = kernelRadius(sigma, truncate);
  // sigma below ~1e-15 (scipy skips such axes) or a zero radius: identity
  if (r === 0 || sigma < 1e-15) return Float64Array.of(1);
  const w = new Float64Array(2 * r + 1);
  const c = -0.5 / (sigma * sigma);
  let sum = 0;
  for (let d = -r; d <= r; d++) {
    const v = Math.exp(c * d * d);
    w[r + d] = v;
    sum += v;
  }
  for (let i = 0; i < w.length; i++) w[i] /= sum;
  return w;
}
