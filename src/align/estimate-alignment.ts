import { invertAffine, type Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';
import type { Volume } from '../core/volume.js';
import { meanImage } from '../look/mean-image.js';
import { estimateRunMotion } from '../register/estimate-run-motion.js';
import { registerImagePair } from '../register/register-image-pair.js';
import type { ImageOnGrid, RegistrationCost } from '../register/registration-types.js';
import { resampleRun } from '../resample/resample-run.js';
import { plainGrid, type AlignmentEstimate } from './alignment-estimate.js';

/** Options of {@link estimateAlignment}. */
export interface AlignmentOptions {
  /** Estimate each volume's pose (rigid, least squares, to volume 0) and undo it in the same resampling. __Default value:__ true */
  motion?: boolean;
  /** Cost of run mean -> structural (rigid). __Default value:__ 'normalised-mutual-information' (the two contrasts differ) */
  structuralCost?: RegistrationCost;
  /** Cost of structural -> template (affine). __Default value:__ 'normalised-correlation' (both T1-weighted) */
  templateCost?: RegistrationCost;
  /**
   * Multi-resolution levels of structural -> template. __Default value:__ [4, 2] (a smooth template
   * has no detail at its own voxel size; the finest level would multiply the time by about ten for
   * an affine that the 2-voxel level already fixes to under 0.5 %, measured on the demo phantom)
   */
  templateLevels?: number[];
  /** Brain mask on the run's grid, weights of the run-mean registration. __Default value:__ every voxel */
  mask?: Uint8Array | null;
  /** Worker threads for motion estimation and resampling. __Default value:__ their defaults */
  workers?: number;
}

/**
 * Estimate everything that carries a run to a template, on the UNPLANTED run: (1) optionally each
 * volume's pose (estimateRunMotion: rigid, least squares, reference volume 0, so the reference frame
 * is the motion table's); (2) the run mean (of the motion-corrected volumes) -> the structural image,
 * rigid, normalised mutual information (the contrasts differ); (3) the structural image -> the
 * template, affine (12 parameters), normalised correlation (both T1-weighted), levels 4 and 2. Registration is registerImagePair's (multi-resolution 4, 2, 1).
 * @param run - the run on its raw grid
 * @param structural - the structural image with its grid (readAnatomyImage)
 * @param template - the template with its grid
 * @param options - motion, costs, mask, workers
 * @returns the grids and maps as plain data (see AlignmentEstimate)
 * @throws BoldsweepError as registerImagePair and estimateRunMotion (REGISTRATION_NOT_CONVERGED names the image and the last cost)
 * @example const estimate = await estimateAlignment(run.volume, t1w, template, { motion: true })
 */
export async function estimateAlignment(run: Volume, structural: ImageOnGrid, template: ImageOnGrid, options: AlignmentOptions = {}): Promise<AlignmentEstimate> {
  const [nx, ny, nz, nt] = run.dims;
  const runGrid: Grid = { dims: [nx, ny, nz], affine: new Float64Array(run.affine) };
  if (options.mask && options.mask.length !== nx * ny * nz) fail('GRID_MISMATCH', `the mask has ${options.mask.length} voxels, the run's grid ${nx * ny * nz}`);
  const workers = options.workers ? { workers: options.workers } : {};
  let poses: Affine[] | null = null;
  let mean: Float32Array;
  const diagnostics: Record<string, number | string> = {};
  if ((options.motion ?? true) && nt > 1) {
    const motion = await estimateRunMotion(run, { model: 'rigid', cost: 'least-squares', reference: 'first', ...(options.mask ? { mask: options.mask } : {}), ...workers });
    poses = motion.transforms;
    const corrected = await resampleRun(run, { kernel: 'linear', grid: runGrid, perVolume: poses, ...workers });
    mean = Float32Array.from(meanImage(corrected));
    diagnostics.motionReference = 'volume 0';
  } else {
    mean = Float32Array.from(meanImage(run));
  }
  const toStructural = registerImagePair({ data: mean, grid: runGrid }, structural, { model: 'rigid', cost: options.structuralCost ?? 'normalised-mutual-information', mask: options.mask ?? null, label: 'the run mean (to the structural image)' });
  // fixed = template, moving = structural: the result maps template world -> structural world
  const toTemplate = registerImagePair(template, structural, { model: 'affine', cost: options.templateCost ?? 'normalised-correlation', levels: options.templateLevels ?? [4, 2], label: 'the structural image (to the template)' });
  diagnostics.structuralCost = toStructural.cost;
  diagnostics.templateCost = toTemplate.cost;
  diagnostics.structuralCostName = toStructural.costName;
  diagnostics.templateCostName = toTemplate.costName;
  return {
    runGrid: plainGrid(runGrid),
    structuralGrid: plainGrid(structural.grid),
    templateGrid: plainGrid(template.grid),
    structuralFromReference: Array.from(toStructural.affine),
    templateFromStructural: Array.from(invertAffine(toTemplate.affine)),
    volumeFromReference: poses ? poses.map((p) => Array.from(p)) : null,
    diagnostics,
  };
}
