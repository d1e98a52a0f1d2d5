import type { Affine, Vec3 } from '../core/affine.js';
import type { Grid } from '../core/grid-frame.js';

/** One 3D image with its own grid (dims and voxel -> world affine); data in NIfTI order, x fastest. */
export interface ImageOnGrid {
  /** Voxel values, length dims[0] * dims[1] * dims[2]. */
  data: Float32Array;
  /** Voxels along i, j, k and the voxel -> world (mm) affine. */
  grid: Grid;
}

/**
 * Transform model: `rigid` (6 parameters: shifts x, y, z in mm, rotations about x, y, z in degrees)
 * or `affine` (12: the rigid six, then scales x, y, z (factors, 1 = none) and shears xy, xz, yz).
 */
export type RegistrationModel = 'rigid' | 'affine';

/** All transform models, for validation and schemas. */
export const REGISTRATION_MODELS: readonly RegistrationModel[] = ['rigid', 'affine'];

/**
 * What registration minimises: `least-squares` (weighted mean squared difference, Gauss-Newton),
 * `normalised-correlation` (1 - Pearson r over the weighted samples, Nelder-Mead) or
 * `normalised-mutual-information` (2 - NMI of Studholme et al. 1999, Nelder-Mead).
 */
export type RegistrationCost = 'least-squares' | 'normalised-correlation' | 'normalised-mutual-information';

/** All costs, for validation and schemas. */
export const REGISTRATION_COSTS: readonly RegistrationCost[] = ['least-squares', 'normalised-correlation', 'normalised-mutual-information'];

/** Parameter names in their order (the first 6 for rigid), as motion-table columns. */
export const MOTION_PARAMETER_NAMES = ['shiftXMm', 'shiftYMm', 'shiftZMm', 'rotXDeg', 'rotYDeg', 'rotZDeg', 'scaleX', 'scaleY', 'scaleZ', 'shearXY', 'shearXZ', 'shearYZ'] as const;

/** Options of registerImagePair. */
export interface RegisterOptions {
  /** Transform model. __Default value:__ `'rigid'` */
  model?: RegistrationModel;
  /** Cost function. __Default value:__ `'least-squares'` */
  cost?: RegistrationCost;
  /**
   * Multi-resolution levels, coarse to fine: at level f every f-th fixed voxel along each axis is a
   * sample, and both images are smoothed with an isotropic Gaussian of FWHM sqrt(f^2 - 1 + s^2)
   * times the fixed grid's largest voxel size, s = `finestFwhmVoxels` (sqrt(f^2 - 1) voxels takes
   * one-voxel resolution to f voxels). __Default value:__ `[4, 2, 1]`
   */
  levels?: readonly number[];
  /**
   * FWHM (in fixed voxels) of the smoothing at the finest level, s above. Some smoothing keeps
   * trilinear interpolation of sharp edges and noise from pulling the cost's minimum towards voxel
   * positions. __Default value:__ 1 (level f is smoothed to f voxels)
   */
  finestFwhmVoxels?: number;
  /** World point (mm) the rotations, scales and shears act about. __Default value:__ the fixed grid's centre */
  centreMm?: Readonly<Vec3>;
  /**
   * Weights on the fixed grid (a 0/1 brain mask, or fractions): each sample counts with its weight;
   * voxels of weight 0 are left out. __Default value:__ every voxel, weight 1
   */
  mask?: Uint8Array | Float32Array | null;
  /** Parameters to start from (6 or 12, the model's count). __Default value:__ the identity */
  initialParameters?: ArrayLike<number>;
  /** Histogram bins per image for mutual information. __Default value:__ 32 */
  bins?: number;
  /**
   * Largest update still counted as movement, in mm at 50 mm from the centre: a level is done when
   * an update moves no point of a 50 mm sphere by more than this times the level's factor.
   * __Default value:__ 0.002
   */
  toleranceMm?: number;
  /** Iterations per level before the optimiser is declared not converged. __Default value:__ 50 (Gauss-Newton), 200 x parameters (Nelder-Mead) */
  maxIterations?: number;
  /** Name of the moving image in messages, e.g. 'volume 17'. __Default value:__ 'the moving image' */
  label?: string;
}

/** What registerImagePair returns. */
export interface RegistrationResult {
  /** Fixed world (mm) -> moving world (mm), row-major 4x4: where each fixed-image point is in the moving image. */
  affine: Affine;
  /** The model's parameters (6 or 12, in {@link MOTION_PARAMETER_NAMES} order). */
  parameters: Float64Array;
  /** Cost at the end of the finest level (see {@link RegistrationCost} for each definition). */
  cost: number;
  /** Iterations per level (Gauss-Newton steps, or Nelder-Mead iterations), coarse to fine. */
  iterations: number[];
  /** The levels used. */
  levels: number[];
  /** FWHM (mm) of each level's smoothing. */
  fwhmMm: number[];
  /** Model, cost and centre as used. */
  model: RegistrationModel;
  costName: RegistrationCost;
  centreMm: Vec3;
}
