import { composeAffine, invertAffine, type Affine } from '../core/affine.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';
import { makeVolume, type Volume } from '../core/volume.js';
import type { InterpolationKernel } from '../resample/interpolation-kernel.js';
import { resampleRun } from '../resample/resample-run.js';
import { targetGrid } from '../resample/target-grid.js';
import type { AlignmentEstimate } from './alignment-estimate.js';
import { concatenatedResampleAffines } from './concatenated-resample-affines.js';

/** Options of {@link alignRun}. */
export interface AlignRunOptions {
  /** true: one resampling from the raw grid to the final grid (the maps composed first); false: one resampling per stage. */
  concatenate: boolean;
  /** Interpolation kernel of every resampling. */
  kernel: InterpolationKernel;
  /** Boundary mode. __Default value:__ 'constant' (no signal outside the field of view) */
  mode?: BoundaryMode;
  /** Output grid in template world. __Default value:__ the template's own grid */
  grid?: Grid;
  /** Worker threads for resampling. __Default value:__ resampleRun's default */
  workers?: number;
}

/** A run aligned to the template grid. */
export interface AlignedRun {
  /** The run on the output grid; its affine is the grid's in TEMPLATE world. */
  volume: Volume;
  /** How many times each voxel was interpolated (1 when concatenated; 2 or 3 otherwise). */
  resamplings: number;
  /** The output grid in template world. */
  grid: Grid;
  /** Reference-frame world -> template world, as used. */
  templateFromReference: Affine;
}

/**
 * Carry a run from its raw grid to the template grid with an alignment estimate. Concatenated: each
 * volume is interpolated once, with its pose (when the estimate has poses), the run-to-structural and
 * the structural-to-template maps composed into one affine. Not concatenated: one resampling per
 * stage in turn: to the reference pose on the run's grid (when there are poses), then to the
 * structural image's field of view at the run's voxel size (the usual intermediate; the structural's
 * own fine grid would multiply the run's size for no gain), then to the template grid.
 * @param volume - the run on its raw grid (not modified)
 * @param estimate - what alignment estimated (grids and maps)
 * @param options - concatenate, kernel, mode, grid, workers
 * @returns the aligned run (template world), the number of resamplings, the grid and the map used
 * @throws BoldsweepError GRID_MISMATCH when the run is not on the estimate's run grid; as resampleRun
 * @example const { volume } = await alignRun(run.volume, estimate, { concatenate: true, kernel: 'cubic' })
 */
export async function alignRun(volume: Volume, estimate: AlignmentEstimate, options: AlignRunOptions): Promise<AlignedRun> {
  const [nx, ny, nz, nt] = volume.dims;
  const rg = estimate.runGrid;
  if (rg.dims[0] !== nx || rg.dims[1] !== ny || rg.dims[2] !== nz) fail('GRID_MISMATCH', `the run has ${nx}x${ny}x${nz} voxels, the alignment was estimated on ${rg.dims.join('x')}`);
  const mode = options.mode ?? 'constant';
  const grid = options.grid ?? estimate.templateGrid;
  const structuralFromReference = Float64Array.from(estimate.structuralFromReference);
  const templateFromStructural = Float64Array.from(estimate.templateFromStructural);
  const templateFromReference = composeAffine(templateFromStructural, structuralFromReference);
  const poses = estimate.volumeFromReference;
  const common = { kernel: options.kernel, mode, ...(options.workers ? { workers: options.workers } : {}) };
  if (options.concatenate) {
    const perVolume = concatenatedResampleAffines(templateFromReference, poses, nt);
    const out = await resampleRun(volume, { ...common, grid, perVolume });
    return { volume: out, resamplings: 1, grid, templateFromReference };
  }
  let current = volume;
  let resamplings = 0;
  if (poses) {
    current = await resampleRun(current, { ...common, grid: { dims: [nx, ny, nz], affine: volume.affine }, perVolume: poses.map((p) => Float64Array.from(p)) });
    resamplings++;
  }
  // the structural image's field of view and orientation at the run's voxel size
  const runSpacing: [number, number, number] = [volume.spacingMm[0], volume.spacingMm[1], volume.spacingMm[2]];
  const structuralAtRunSize = targetGrid(estimate.structuralGrid, { voxelSizeMm: runSpacing });
  current = await resampleRun(current, { ...common, grid: structuralAtRunSize, transform: invertAffine(structuralFromReference) });
  current = await resampleRun(current, { ...common, grid, transform: invertAffine(templateFromStructural) });
  resamplings += 2;
  return { volume: makeVolume({ ...current, affine: new Float64Array(grid.affine) }), resamplings, grid, templateFromReference };
}
