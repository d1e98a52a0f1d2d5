import { fail } from '../core/fail.js';

/**
 * How a resampled value is made from the voxels around a position:
 * - `nearest`: the nearest voxel (B-spline of order 0);
 * - `linear`: trilinear interpolation (B-spline of order 1);
 * - `cubic`: cubic B-spline interpolation, on coefficients from the exact prefilter of Unser (1999);
 * - `lanczos3`: windowed sinc, sinc(x) sinc(x/3) for |x| < 3 (Lanczos window of radius 3 voxels;
 *   Duchon 1979), the six weights of each axis normalised to sum 1 so a constant stays constant.
 */
export type InterpolationKernel = 'nearest' | 'linear' | 'cubic' | 'lanczos3';

/** All kernels, simplest first (nearest < linear < cubic < lanczos3: taps per axis 1, 2, 4, 6). */
export const INTERPOLATION_KERNELS: readonly InterpolationKernel[] = ['nearest', 'linear', 'cubic', 'lanczos3'];

/** Radius of the Lanczos window in voxels. */
export const LANCZOS_RADIUS = 3;

/**
 * Taps per axis of each kernel (the voxels one output value reads along one axis).
 * @param kernel - the kernel
 * @returns 1, 2, 4 or 6
 * @example kernelTaps('cubic') // 4
 */
export function kernelTaps(kernel: InterpolationKernel): number {
  switch (kernel) {
    case 'nearest': return 1;
    case 'linear': return 2;
    case 'cubic': return 4;
    case 'lanczos3': return 2 * LANCZOS_RADIUS;
  }
}

/**
 * Check a kernel name and return it typed.
 * @param kernel - a name from user input
 * @returns the kernel
 * @throws BoldsweepError UNKNOWN_KERNEL listing the known kernels
 * @example checkKernel('cubic')
 */
export function checkKernel(kernel: unknown): InterpolationKernel {
  if (typeof kernel === 'string' && (INTERPOLATION_KERNELS as readonly string[]).includes(kernel)) return kernel as InterpolationKernel;
  fail('UNKNOWN_KERNEL', `no interpolation kernel named '${String(kernel)}'; known kernels: ${INTERPOLATION_KERNELS.join(', ')}`, { details: { kernel: String(kernel), known: [...INTERPOLATION_KERNELS] } });
}
