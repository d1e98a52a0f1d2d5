import { composeAffine, invertAffine } from '../core/affine.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import type { Frame, Grid } from '../core/grid-frame.js';
import { makeVolume, type Volume } from '../core/volume.js';
import { alignRun } from '../align/align-run.js';
import type { AlignmentEstimate } from '../align/alignment-estimate.js';
import { demoAnatomyPaths } from '../align/demo-anatomy-paths.js';
import { estimateAlignment } from '../align/estimate-alignment.js';
import { readAnatomyImage } from '../align/read-anatomy-image.js';
import { checkKernel, type InterpolationKernel } from '../resample/interpolation-kernel.js';
import { maskOnGrid } from '../resample/mask-on-grid.js';
import { targetGrid } from '../resample/target-grid.js';
import { kernelSimplicity } from './resample-step.js';
import type { StepContext, StepFunction } from './step-types.js';

/** Parameters of {@link alignStep}. */
export interface AlignStepParams {
  /** Path of the structural image (NIfTI, 3D, with an sform or qform). __Default value:__ the demo's `data-demo/sub-phantom01_T1w.nii.gz` when the run is the demo run; otherwise required */
  structural?: string;
  /** Path of the template (NIfTI, 3D). __Default value:__ the demo's `data-demo/boldsweep-phantom-template_2mm.nii.gz` when the run is the demo run; otherwise required */
  template?: string;
  /** true: each volume is resampled once, raw grid -> template grid (the maps composed); false: once per stage (to the reference pose, to the structural image's field of view, to the template). */
  concatenate: boolean;
  /** Interpolation kernel of every resampling. */
  kernel: InterpolationKernel;
  /** 'estimate': estimate each volume's pose (rigid) and undo it in the same resampling; 'none': take the head as still (e.g. after a motion-correction step). */
  motion: 'estimate' | 'none';
  /** Output voxel size over the template's field of view, mm. __Default value:__ the template's own grid */
  voxelSizeMm?: number;
  /** Boundary mode. __Default value:__ 'constant' */
  mode?: BoundaryMode;
}

/** Whether a run is boldsweep's demo run (its grid and its task), whose structural image and template ship with the package. */
function isDemoRun(volume: Volume, context: StepContext): boolean {
  return volume.dims[0] === 44 && volume.dims[1] === 52 && volume.dims[2] === 34 && Math.abs(volume.spacingMm[0] - 3.5) < 1e-6 && context.sidecar?.TaskName === 'flicker';
}

/**
 * The structural image's and the template's paths: the parameters, or the demo's files for the demo run.
 * @param params - the step's parameters
 * @param volume - the run
 * @param context - its sidecar
 * @returns both paths
 * @throws BoldsweepError ALIGN_INPUT_MISSING
 * @example alignInputPaths({ structural: 'anat/sub-01_T1w.nii.gz', template: 'template.nii.gz', ... }, run, context)
 */
export function alignInputPaths(params: Pick<AlignStepParams, 'structural' | 'template'>, volume: Volume, context: StepContext): { structural: string; template: string } {
  const demo = isDemoRun(volume, context) ? demoAnatomyPaths() : null;
  const structural = params.structural ?? demo?.structural;
  const template = params.template ?? demo?.template;
  if (!structural || !template) fail('ALIGN_INPUT_MISSING', `align: no ${!structural ? 'structural image' : 'template'} given (parameter '${!structural ? 'structural' : 'template'}')`);
  return { structural, template };
}

/**
 * What the align step estimates from the unplanted run: each volume's pose (when `motion` is
 * 'estimate' and the input is still in the raw frame), run mean -> structural (rigid, normalised
 * mutual information), structural -> template (affine). See estimateAlignment.
 * @param volume - the unplanted run after the steps before align
 * @param params - the step's parameters
 * @param context - its frame, sidecar and mask
 * @returns the estimate (plain data, cached by the sweep)
 * @throws BoldsweepError ALIGN_INPUT_MISSING, STRUCTURAL_AFFINE_UNUSABLE, INVALID_ARGUMENT (input already on another grid), registration errors
 * @example const e = await alignEstimate(run.volume, { concatenate: true, kernel: 'cubic', motion: 'estimate' }, context)
 */
export async function alignEstimate(volume: Volume, params: AlignStepParams, context: StepContext): Promise<AlignmentEstimate> {
  const frame = context.frame ?? { kind: 'raw' };
  if (frame.kind === 'target') fail('INVALID_ARGUMENT', 'align: the input is already on another grid (a resampling step came before align); put align before any step that resamples');
  const paths = alignInputPaths(params, volume, context);
  const structural = await readAnatomyImage(paths.structural, 'structural');
  const template = await readAnatomyImage(paths.template, 'template');
  const mask = context.mask && context.mask.length === volume.dims[0] * volume.dims[1] * volume.dims[2] ? context.mask : null;
  return estimateAlignment(volume, structural, template, { motion: params.motion === 'estimate' && frame.kind === 'raw', mask });
}

/**
 * The output grid placed in the run's reference world (what a target frame holds, see Frame): the
 * template grid's voxel -> template world, then template world -> reference world by the estimate.
 * @param estimate - the alignment estimate
 * @param voxelSizeMm - output voxel size over the template's field of view, or undefined for the template's grid
 * @returns the grid in template world and the same voxels in reference world
 * @example const { inTemplate, inReference } = alignOutputGrids(estimate, undefined)
 */
export function alignOutputGrids(estimate: AlignmentEstimate, voxelSizeMm: number | undefined): { inTemplate: Grid; inReference: Grid } {
  const inTemplate = voxelSizeMm === undefined ? { dims: [...estimate.templateGrid.dims] as [number, number, number], affine: new Float64Array(estimate.templateGrid.affine) } : targetGrid(estimate.templateGrid, { voxelSizeMm });
  const templateFromReference = composeAffine(Float64Array.from(estimate.templateFromStructural), Float64Array.from(estimate.structuralFromReference));
  return { inTemplate, inReference: { dims: inTemplate.dims, affine: composeAffine(invertAffine(templateFromReference), inTemplate.affine) } };
}

/**
 * Preprocessing step: carry the run to the template grid (motion, run mean -> structural ->
 * template), resampling each volume once (`concatenate: true`: the per-volume pose and both maps
 * composed) or once per stage (`false`), with the chosen kernel. The output frame is the template
 * grid, placed in the run's reference world by the estimated maps (so the sweep carries the planted
 * truth and the masks there and scores in it); the output volume's affine is that placement, and the
 * note's diagnostics give the template-world grid. Without an `estimate` (outside a sweep) it
 * estimates first, on the given run.
 * @param volume - the run (raw frame, or reference after a motion-correction step; not modified)
 * @param params - structural, template, concatenate, kernel, motion, voxelSizeMm, mode
 * @param context - frame, mask, sidecar
 * @param estimate - what alignEstimate found on the unplanted run
 * @returns the run on the template grid, its note, frame and context
 * @throws BoldsweepError as alignEstimate, alignRun and resampleRun
 * @example const r = await alignStep(run.volume, { concatenate: true, kernel: 'cubic', motion: 'estimate' }, context)
 */
export const alignStep: StepFunction<AlignStepParams, AlignmentEstimate> = async (volume, params, context, estimate) => {
  const kernel = checkKernel(params.kernel);
  const mode = params.mode ?? 'constant';
  const e = estimate ?? (await alignEstimate(volume, params, context));
  const grids = alignOutputGrids(e, params.voxelSizeMm);
  const aligned = await alignRun(volume, e, { concatenate: params.concatenate, kernel, mode, grid: grids.inTemplate });
  const out = makeVolume({ ...aligned.volume, affine: new Float64Array(grids.inReference.affine) });
  const frame: Frame = { kind: 'target', grid: grids.inReference };
  const runGrid: Grid = { dims: [volume.dims[0], volume.dims[1], volume.dims[2]], affine: volume.affine };
  const mask = context.mask ? maskOnGrid(context.mask, runGrid, grids.inReference) : null;
  const rest: StepContext = { ...context };
  delete rest.outputBuffer;
  const size = aligned.grid.dims.join(' x ');
  const mm = out.spacingMm.map((s) => Number(s.toFixed(3))).join(' x ');
  const motionText = e.volumeFromReference ? 'each volume\'s rigid pose (least squares, to the first volume), ' : '';
  const methodsText = params.concatenate
    ? `The run was aligned to a template (${size} voxels) by composing ${motionText}a rigid map of the run mean to the structural image (normalised mutual information) and an affine map of the structural image to the template, and resampled once from the acquired grid by ${kernel} interpolation.`
    : `The run was aligned to a template (${size} voxels) in ${aligned.resamplings} successive resamplings by ${kernel} interpolation: ${e.volumeFromReference ? 'to the first volume\'s pose, ' : ''}to the structural image's field of view at the run's voxel size (rigid map of the run mean, normalised mutual information), then to the template (affine).`;
  return {
    volume: out,
    frame,
    context: { ...rest, mask, frame, grid: grids.inReference },
    note: {
      step: 'align',
      params: { structural: params.structural ?? null, template: params.template ?? null, concatenate: params.concatenate, kernel, motion: params.motion, voxelSizeMm: params.voxelSizeMm ?? null, mode },
      summary: `Aligned to the template (${size}, ${mm} mm), ${params.concatenate ? 'one resampling' : `${aligned.resamplings} resamplings`}, ${kernel}`,
      diagnostics: { resamplings: aligned.resamplings, templateDims: [...aligned.grid.dims], templateVoxelToWorld: Array.from(aligned.grid.affine), motionEstimated: e.volumeFromReference !== null, ...e.diagnostics },
      methodsText,
      // from memory: pages not re-checked
      citations: ['Studholme C, Hill DLG, Hawkes DJ (1999) An overlap invariant entropy measure of 3D medical image alignment. Pattern Recognit 32:71-86 [memory]'],
    },
  };
};

/**
 * Simplicity of an align setting for the one-standard-error rule: one resampling is simpler than
 * several, then the kernel's order.
 * @param p - the parameters
 * @returns a number, lower is simpler
 * @example alignSimplicity({ concatenate: true, kernel: 'linear', motion: 'estimate' }) // 1
 */
export function alignSimplicity(p: Pick<AlignStepParams, 'concatenate' | 'kernel'>): number {
  return (p.concatenate ? 0 : 10) + kernelSimplicity(p.kernel);
}
