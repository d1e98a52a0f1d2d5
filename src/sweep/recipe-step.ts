import type { Frame, Grid } from '../core/grid-frame.js';
import type { Volume } from '../core/volume.js';
import { getStep, parseStepParams } from '../steps/registry.js';
import type { StepContext, StepResult } from '../steps/step-types.js';
import { maskOnGrid } from '../resample/mask-on-grid.js';
import type { RecipeStep } from './spec.js';

/** A step's result as the sweep carries it on: its context always states the output's frame. */
export interface RecipeStepResult extends StepResult {
  context: StepContext;
  frame: Frame;
}

/** The 3D grid of a run. */
export function gridOf(v: Pick<Volume, 'dims' | 'affine'>): Grid {
  return { dims: [v.dims[0], v.dims[1], v.dims[2]], affine: new Float64Array(v.affine) };
}

/**
 * Run one recipe step through the step registry (parameters validated, defaults filled) and work out
 * where its output lives: the frame the step's result declares, else its definition's `outputFrame`,
 * else the input's frame. When the output is on another grid than the input, the context's brain
 * mask is carried onto it (trilinear, kept at >= 0.5: see maskOnGrid) unless the step already did.
 * @param step - name and parameters
 * @param volume - the run (not modified)
 * @param context - sidecar, events, mask, frame (raw when absent), slice times
 * @param estimate - what the step estimated from the unplanted run for these parameters, if anything
 * @returns the step's result, its context stating the output frame
 * @example const r = await runRecipeStep({ step: 'smooth', params: { fwhmMm: 6 } }, run.volume, context)
 */
export async function runRecipeStep(step: RecipeStep, volume: Volume, context: StepContext, estimate?: unknown): Promise<RecipeStepResult> {
  const def = getStep(step.step);
  const params = parseStepParams(step.step, step.params);
  const input: Frame = context.frame ?? { kind: 'raw' };
  const given: StepContext = { ...context, frame: input };
  const r = await def.apply(volume, params, given, estimate);
  const frame = r.frame ?? def.outputFrame?.(params, input, given) ?? input;
  const next: StepContext = { ...(r.context ?? given), frame };
  const n = r.volume.dims[0] * r.volume.dims[1] * r.volume.dims[2];
  if (next.mask && next.mask.length !== n) next.mask = maskOnGrid(next.mask, gridOf(volume), gridOf(r.volume));
  return { ...r, context: next, frame };
}
