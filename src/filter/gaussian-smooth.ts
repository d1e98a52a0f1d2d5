import { fail } from '../core/fail.js';
import { BOUNDARY_MODES, type BoundaryMode } from '../core/boundary-mode.js';
import { DEFAULT_TRUNCATE, gaussianKernel1d, sigmaVoxels } from './gaussian-kernel.js';
import { applySmoothPlan, makeSmoothPlan, makeSmoothScratch, type SmoothPlan } from './smooth-plan.js';

/** Options shared by {@link smoothVolume3d} and smoothRun. */
export interface SmoothOptions {
  /** Boundary mode (scipy.ndimage names and meanings). __Default value:__ `'reflect'` (half-sample symmetric). */
  mode?: BoundaryMode;
  /** Where to write the result (may be the input array itself). __Default value:__ a new array. */
  out?: Float32Array;
  /**
   * Smooth inside this mask only (1 = inside), by normalised convolution: smooth(data*mask) /
   * smooth(mask), so voxels near the mask edge are not pulled toward the zeros outside it.
   * Voxels outside the mask become 0. __Default value:__ none (smooth everything).
   */
  mask?: Uint8Array;
  /** Standard deviations kept each side of the kernel. __Default value:__ 4 (as scipy.ndimage). */
  truncate?: number;
}

/**
 * Check arguments and build the reusable plan for smoothing volumes of one grid (internal: the
 * public wrappers call it, then run the plan once per volume).
 * @param dims - voxels along x, y, z
 * @param spacingMm - voxel size in mm
 * @param fwhmMm - kernel FWHM in mm (one number, or one per axis)
 * @param options - mode, mask, truncate
 * @returns the plan
 * @example const plan = planGaussianSmooth([64,64,36], [3,3,3], 6, {})
 */
export function planGaussianSmooth(
  dims: readonly [number, number, number],
  spacingMm: readonly [number, number, number],
  fwhmMm: number | readonly [number, number, number],
  options: Pick<SmoothOptions, 'mode' | 'mask' | 'truncate'> = {},
): SmoothPlan {
  if (dims.length !== 3 || dims.some((d) => !Number.isInteger(d) || d < 1)) fail('INVALID_ARGUMENT', `dims must be three positive integers, got [${dims.join(', ')}]`);
  if (spacingMm.length !== 3 || spacingMm.some((s) => !(s > 0) || !Number.isFinite(s))) fail('INVALID_ARGUMENT', `spacingMm must be three positive numbers, got [${spacingMm.join(', ')}]`);
  const widths = typeof fwhmMm === 'number' ? [fwhmMm] : [...fwhmMm];
  if (widths.some((f) => !(f >= 0) || !Number.isFinite(f))) fail('INVALID_ARGUMENT', `fwhmMm must be finite and >= 0, got ${String(fwhmMm)}`);
  const mode = options.mode ?? 'reflect';
  if (!BOUNDARY_MODES.includes(mode)) fail('INVALID_ARGUMENT', `mode must be one of ${BOUNDARY_MODES.join(', ')}, got ${String(mode)}`);
  const n = dims[0] * dims[1] * dims[2];
  if (options.mask && options.mask.length !== n) fail('GRID_MISMATCH', `mask has ${options.mask.length} voxels, the image grid ${dims.join('x')} has ${n}`);
  const truncate = options.truncate ?? DEFAULT_TRUNCATE;
  const s = sigmaVoxels(fwhmMm, spacingMm);
  const kernels = s.map((sigma) => gaussianKernel1d(sigma, truncate)) as [Float64Array, Float64Array, Float64Array];
  return makeSmoothPlan([dims[0], dims[1], dims[2]], kernels, mode, options.mask ?? null);
}

/**
 * Smooth one 3D image with a Gaussian kernel given as FWHM in mm, separably along x, y and z.
 * Per axis sigma = fwhmMm / (2 sqrt(2 ln 2)) / spacingMm voxels, so anisotropic voxels are handled;
 * the kernel is sampled out to int(4 sigma + 0.5) voxels and normalised, as scipy.ndimage's
 * gaussian_filter does. Arithmetic is Float64; the result is rounded once to Float32.
 * @param data - voxel values, x fastest (length nx*ny*nz); not modified (unless passed as `out`)
 * @param dims - voxels along x, y, z
 * @param spacingMm - voxel size in mm along x, y, z
 * @param fwhmMm - kernel FWHM in mm (0 = no smoothing), one number or one per axis
 * @param options - boundary mode (default 'reflect'), out, mask (normalised convolution), truncate
 * @returns the smoothed image (options.out when given)
 * @throws BoldsweepError INVALID_ARGUMENT for bad sizes/width/mode, GRID_MISMATCH for a mask of another size
 * @example const s = smoothVolume3d(vol, [64, 64, 36], [3, 3, 3], 6, { mode: 'reflect' })
 */
export function smoothVolume3d(
  data: Float32Array,
  dims: readonly [number, number, number],
  spacingMm: readonly [number, number, number],
  fwhmMm: number | readonly [number, number, number],
  options: SmoothOptions = {},
): Float32Array {
  const plan = planGaussianSmooth(dims, spacingMm, fwhmMm, options);
  const n = dims[0] * dims[1] * dims[2];
  if (data.length !== n) fail('INVALID_ARGUMENT', `data has ${data.length} values, dims ${dims.join('x')} need ${n}`);
  const out = options.out ?? new Float32Array(n);
  if (out.length !== n) fail('INVALID_ARGUMENT', `out has ${out.length} values, dims ${dims.join('x')} need ${n}`);
  return applySmoothPlan(plan, data, out, makeSmoothScratch(plan));
}
