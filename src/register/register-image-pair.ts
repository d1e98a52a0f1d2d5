import { fail } from '../core/fail.js';
import { motionParametersAffine } from './motion-parameters-affine.js';
import { checkImage, prepareFixed } from './prepare-fixed.js';
import { registerPrepared } from './register-prepared.js';
import type { ImageOnGrid, RegisterOptions, RegistrationResult } from './registration-types.js';

/**
 * Register a moving image to a fixed one: find the transform T (fixed world mm -> moving world mm)
 * for which moving(T x) best matches fixed(x) over the fixed image's (weighted) voxels. The two
 * images may be on different grids (e.g. a run's mean and a finer structural image).
 * - Model: `rigid` (shifts in mm and rotations in degrees about `centreMm`, the motion-table
 *   convention of rigidMotionAffine, so a run's motion table and these parameters mean the same) or
 *   `affine` (plus scales and shears: p' = R S H (p - c) + c + t, shear first).
 * - Cost: `least-squares` (weighted mean squared difference; Gauss-Newton on the inverse
 *   compositional scheme of Baker and Matthews 2004, with the fixed image's gradients computed once),
 *   `normalised-correlation` (1 - r) or `normalised-mutual-information` (2 - NMI of Studholme et al.
 *   1999; `bins` per image, cubic B-spline Parzen window on the moving values as in Mattes et al.
 *   2003), both by Nelder-Mead on the parameters.
 * - Multi-resolution: levels of subsampling (default 4, 2, 1) with Gaussian pre-smoothing of both
 *   images (FWHM sqrt(f^2 - 1 + s^2) x the fixed grid's largest voxel size, s = finestFwhmVoxels, default 1: level f at f voxels); samples are fixed voxels,
 *   weighted by `mask`; the moving image is read by trilinear interpolation, and samples that fall
 *   outside it are left out.
 * @param fixed - the image registered to ({ data, grid }; not modified)
 * @param moving - the image moved ({ data, grid }; not modified)
 * @param options - model, cost, levels, finestFwhmVoxels, centreMm, mask, initialParameters, bins, toleranceMm, maxIterations, label
 * @returns the fixed -> moving world affine, the parameters, final cost, iterations per level
 * @throws BoldsweepError INVALID_ARGUMENT (bad options, grids or mask), NON_FINITE_VOXELS, SINGULAR_TRANSFORM,
 *   REGISTRATION_NOT_CONVERGED (iteration cap reached, or the cost rose; names the image, level and last cost),
 *   REGISTRATION_NO_OVERLAP, CONSTANT_DATA (an image without contrast)
 * @example
 * const r = registerImagePair({ data: meanData, grid: runGrid }, { data: volumeData, grid: runGrid }, { model: 'rigid' });
 * r.parameters // shiftXMm, shiftYMm, shiftZMm, rotXDeg, rotYDeg, rotZDeg
 */
export function registerImagePair(fixed: ImageOnGrid, moving: ImageOnGrid, options: RegisterOptions = {}): RegistrationResult {
  const prep = prepareFixed(fixed, options);
  checkImage(moving, 'moving');
  const n = prep.model === 'rigid' ? 6 : 12;
  let start = motionParametersAffine(n === 6 ? [0, 0, 0, 0, 0, 0] : [0, 0, 0, 0, 0, 0, 1, 1, 1, 0, 0, 0], prep.centreMm);
  if (options.initialParameters !== undefined) {
    if (options.initialParameters.length !== n) fail('INVALID_ARGUMENT', `initialParameters has ${options.initialParameters.length} values; the ${prep.model} model has ${n}`);
    start = motionParametersAffine(options.initialParameters, prep.centreMm);
  }
  return registerPrepared(prep, moving, start, options.label ?? 'the moving image');
}
