import type { BoundaryMode } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import type { Frame, Grid } from '../core/grid-frame.js';
import { makeVolume } from '../core/volume.js';
import { maskOnGrid } from '../resample/mask-on-grid.js';
import { checkKernel, INTERPOLATION_KERNELS, LANCZOS_RADIUS, type InterpolationKernel } from '../resample/interpolation-kernel.js';
import { sameGridWithin } from '../resample/plan-resample.js';
import { resampleRun } from '../resample/resample-run.js';
import { targetGrid } from '../resample/target-grid.js';
import type { StepContext, StepFunction } from './step-types.js';

/** Parameters of {@link resampleStep}. */
export interface ResampleStepParams {
  /** Interpolation kernel: 'nearest', 'linear', 'cubic' or 'lanczos3'. */
  kernel: InterpolationKernel;
  /**
   * Target voxel size in mm, one number or [x, y, z]; the target covers the input's field of view
   * in its orientation. __Default value:__ the input's voxel size (the same grid)
   */
  voxelSizeMm?: number | [number, number, number];
  /**
   * Boundary mode. __Default value:__ `'constant'` (0 outside the acquired field of view: there is
   * no signal there, and `nearest` would smear the edge voxels, often noisy or eyes, outwards).
   */
  mode?: BoundaryMode;
}

/**
 * Simplicity order of the kernels: nearest < linear < cubic < lanczos3 (fewer taps, less arithmetic).
 * @param kernel - the kernel
 * @returns 0, 1, 2 or 3
 * @example kernelSimplicity('cubic') // 2
 */
export function kernelSimplicity(kernel: InterpolationKernel): number {
  return INTERPOLATION_KERNELS.indexOf(kernel);
}

const KERNEL_TEXT: Record<InterpolationKernel, string> = {
  nearest: 'nearest-neighbour interpolation',
  linear: 'trilinear interpolation',
  cubic: 'cubic B-spline interpolation (exact B-spline prefilter)',
  lanczos3: `windowed-sinc interpolation (Lanczos window, radius ${LANCZOS_RADIUS} voxels, weights normalised to sum 1)`,
};
const KERNEL_CITATIONS: Record<InterpolationKernel, string[]> = {
  nearest: [],
  linear: [],
  // from memory: volume, issue and pages not re-checked
  cubic: ['Unser M (1999) Splines: a perfect fit for signal and image processing. IEEE Signal Process Mag 16(6):22-38 [memory]'],
  lanczos3: ['Duchon CE (1979) Lanczos filtering in one and two dimensions. J Appl Meteorol 18:1016-1022 [memory]'],
};
const MODE_TEXT: Record<BoundaryMode, string> = {
  constant: 'zeros outside the acquired field of view',
  nearest: 'the edge voxels repeated outside the acquired field of view',
  reflect: 'the image mirrored about its edge outside the acquired field of view',
  mirror: 'the image mirrored about its edge voxel outside the acquired field of view',
  wrap: 'the image wrapped around (periodic) outside the acquired field of view',
};

/**
 * The grid the step resamples onto, from its parameters and the input grid.
 * @param params - voxelSizeMm
 * @param input - the input grid
 * @returns the target grid (the input grid itself for the input's voxel size)
 * @example resampleTargetGrid({ kernel: 'cubic', voxelSizeMm: 2 }, runGrid)
 */
export function resampleTargetGrid(params: ResampleStepParams, input: Grid): Grid {
  return targetGrid(input, params.voxelSizeMm === undefined ? {} : { voxelSizeMm: params.voxelSizeMm });
}

/**
 * Output frame of the step: a target frame on the new grid, or the input's frame when the target
 * is the input grid.
 * @param params - the step's parameters
 * @param input - the input frame
 * @param context - its `grid` (the input run's grid) is used when the input frame has no grid of its own
 * @returns the output frame
 * @throws BoldsweepError INVALID_ARGUMENT when the input grid is unknown
 * @example resampleOutputFrame({ kernel: 'linear', voxelSizeMm: 2 }, { kind: 'reference' }, { ...context, grid })
 */
export function resampleOutputFrame(params: ResampleStepParams, input: Frame, context: Pick<StepContext, 'grid'>): Frame {
  const grid = input.kind === 'target' ? input.grid : context.grid;
  if (!grid) fail('INVALID_ARGUMENT', 'resample: the output frame needs the input grid (context.grid) when the input frame is not a target grid');
  const target = resampleTargetGrid(params, grid);
  return sameGridWithin(target, grid) ? input : { kind: 'target', grid: target };
}

/**
 * Preprocessing step: resample every volume onto a grid of another voxel size (same orientation,
 * same field of view), with a chosen kernel, in parallel over volumes (resampleRun). For the
 * input's own voxel size nothing moves: the data are copied and the frame stays the input's. The
 * context passes on with the new `frame` and `grid`, and its brain mask carried onto the target grid
 * (maskOnGrid: trilinear at the target voxel centres, kept at >= 0.5), so a later step that uses the
 * mask (smoothing within it, percent signal change) works on the new grid; the sweep carries the
 * planted truth and the scoring masks into the output frame.
 * @param volume - the run (not modified)
 * @param params - kernel, voxelSizeMm, mode
 * @param context - frame and grid of the input; outputBuffer used when the grid does not change
 * @returns the resampled run, its note, its frame, and the context with that frame
 * @throws BoldsweepError UNKNOWN_KERNEL, INVALID_ARGUMENT, TARGET_GRID_TOO_LARGE, NON_FINITE_VOXELS;
 *   GRID_MISMATCH for a context mask that is not on the input grid
 * @example const { volume, frame } = await resampleStep(run.volume, { kernel: 'cubic', voxelSizeMm: 2 }, context)
 */
export const resampleStep: StepFunction<ResampleStepParams> = async (volume, params, context) => {
  const kernel = checkKernel(params.kernel);
  const mode = params.mode ?? 'constant';
  const inputFrame: Frame = context.frame ?? { kind: 'raw' };
  const inputGrid: Grid = { dims: [volume.dims[0], volume.dims[1], volume.dims[2]], affine: volume.affine };
  const target = resampleTargetGrid(params, inputGrid);
  const same = sameGridWithin(target, inputGrid);
  // checked before the (long) resampling: a mask on another grid than the input is a caller's error
  const mask = context.mask && !same ? maskOnGrid(context.mask, inputGrid, target) : context.mask;
  let out;
  if (same) {
    const data = context.outputBuffer?.(volume.data.length) ?? new Float32Array(volume.data.length);
    if (data !== volume.data) data.set(volume.data);
    out = makeVolume({ dims: [...volume.dims], spacingMm: [...volume.spacingMm], trSec: volume.trSec, affine: new Float64Array(volume.affine), data });
  } else {
    out = await resampleRun(volume, { kernel, mode, grid: target });
  }
  const frame: Frame = same ? inputFrame : { kind: 'target', grid: target };
  const size = out.spacingMm.map((s) => Number(s.toFixed(3))).join(' x ');
  const summary = same ? `No resampling (target grid is the input grid, ${size} mm)` : `Resampled to ${size} mm voxels (${target.dims.join(' x ')}), ${kernel}`;
  const methodsText = same
    ? 'Images were not resampled (the target grid was the acquisition grid).'
    : `Images were resampled onto a ${size} mm grid (${target.dims.join(' x ')} voxels, covering the acquired field of view in its orientation) by ${KERNEL_TEXT[kernel]}, with ${MODE_TEXT[mode]}.`;
  // the output buffer was for this step only (StepContext.outputBuffer)
  const rest: StepContext = { ...context };
  delete rest.outputBuffer;
  return {
    volume: out,
    frame,
    context: { ...rest, mask, frame, grid: { dims: [...target.dims], affine: new Float64Array(target.affine) } },
    note: {
      step: 'resample',
      params: { kernel, voxelSizeMm: params.voxelSizeMm ?? null, mode },
      summary,
      diagnostics: { kernel, mode, targetDims: [...target.dims], targetVoxelSizeMm: [...out.spacingMm], resampled: !same },
      methodsText,
      citations: same ? [] : KERNEL_CITATIONS[kernel],
    },
  };
};
