import type { Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { checkInvertible } from '../resample/target-grid.js';
import { gridCentreMm } from '../acquire/grid-centre-mm.js';
import { scanNonFinite } from '../io/non-finite.js';
import { motionParametersAffine } from './motion-parameters-affine.js';
import { prepareFixedLevel } from './prepare-fixed-level.js';
import { registerPrepared, type PreparedFixed } from './register-prepared.js';
import { REGISTRATION_COSTS, REGISTRATION_MODELS, type ImageOnGrid, type RegisterOptions, type RegistrationResult } from './registration-types.js';

/** Default multi-resolution levels (subsampling factors, coarse to fine). */
export const DEFAULT_LEVELS: readonly number[] = [4, 2, 1];
/** Seed of the sample positions' jitter (prepareFixedLevel): fixed, so a registration is reproducible. */
export const SAMPLING_SEED = 20260101;
/** Default histogram bins per image for mutual information. */
export const DEFAULT_BINS = 32;

/** Check one image of a pair: dims, data length, affine, finite values. */
function checkImage(image: ImageOnGrid, which: string): void {
  const dims = image?.grid?.dims;
  if (!dims || dims.length !== 3 || dims.some((d) => !Number.isInteger(d) || d < 2)) fail('INVALID_ARGUMENT', `the ${which} image's grid needs three dims of at least 2 voxels, got [${String(dims)}]`);
  if (!(image.data instanceof Float32Array) || image.data.length !== dims[0] * dims[1] * dims[2]) fail('INVALID_ARGUMENT', `the ${which} image has ${image.data?.length} values, its grid ${dims.join('x')} needs ${dims[0] * dims[1] * dims[2]} (as a Float32Array)`);
  checkInvertible(image.grid.affine, `the ${which} image's voxel -> world affine`);
  const scan = scanNonFinite(image.data, false);
  if (scan.count > 0) fail('NON_FINITE_VOXELS', `the ${which} image has ${scan.count} NaN or infinite values (first at index ${scan.firstIndex})`);
}

/**
 * Prepare a fixed image for registration (checks the options, then builds every level), so many
 * moving images can be registered to it (estimateRunMotion does this once per worker task).
 * @param fixed - the fixed image (not modified)
 * @param options - see RegisterOptions
 * @returns the prepared fixed image
 * @throws BoldsweepError INVALID_ARGUMENT, NON_FINITE_VOXELS, SINGULAR_TRANSFORM
 * @example const prep = prepareFixed(reference, { model: 'rigid' })
 */
export function prepareFixed(fixed: ImageOnGrid, options: RegisterOptions = {}): PreparedFixed {
  checkImage(fixed, 'fixed');
  const model = options.model ?? 'rigid';
  const cost = options.cost ?? 'least-squares';
  if (!REGISTRATION_MODELS.includes(model)) fail('INVALID_ARGUMENT', `model must be one of ${REGISTRATION_MODELS.join(', ')}, got '${String(model)}'`);
  if (!REGISTRATION_COSTS.includes(cost)) fail('INVALID_ARGUMENT', `cost must be one of ${REGISTRATION_COSTS.join(', ')}, got '${String(cost)}'`);
  const levels = [...(options.levels ?? DEFAULT_LEVELS)];
  if (levels.length === 0 || levels.some((f) => !Number.isInteger(f) || f < 1 || f > 32)) fail('INVALID_ARGUMENT', `levels must be a non-empty list of integers from 1 to 32 (coarse to fine, e.g. [4, 2, 1]), got [${levels.join(', ')}]`);
  const bins = options.bins ?? DEFAULT_BINS;
  if (!Number.isInteger(bins) || bins < 8 || bins > 256) fail('INVALID_ARGUMENT', `bins must be an integer from 8 to 256, got ${bins}`);
  const toleranceMm = options.toleranceMm ?? 0.002;
  if (!(toleranceMm > 0) || !Number.isFinite(toleranceMm)) fail('INVALID_ARGUMENT', `toleranceMm must be a positive number, got ${toleranceMm}`);
  if (options.maxIterations !== undefined && (!Number.isInteger(options.maxIterations) || options.maxIterations < 1)) fail('INVALID_ARGUMENT', `maxIterations must be a positive integer, got ${options.maxIterations}`);
  const centreMm: Vec3 = options.centreMm ? [...options.centreMm] as Vec3 : gridCentreMm(fixed.grid);
  if (centreMm.length !== 3 || centreMm.some((c) => !Number.isFinite(c))) fail('INVALID_ARGUMENT', `centreMm must be three finite numbers, got [${centreMm.join(', ')}]`);
  const finestFwhmVoxels = options.finestFwhmVoxels ?? 1;
  if (!(finestFwhmVoxels >= 0) || finestFwhmVoxels > 8) fail('INVALID_ARGUMENT', `finestFwhmVoxels must be from 0 to 8, got ${finestFwhmVoxels}`);
  const mask = options.mask ?? null;
  const prepared = levels.map((f) => prepareFixedLevel(fixed, f, { model, cost, centreMm, mask, finestFwhmVoxels, seed: SAMPLING_SEED }));
  return { model, cost, centreMm, levels: prepared, bins, toleranceMm, maxIterations: options.maxIterations };
}

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
