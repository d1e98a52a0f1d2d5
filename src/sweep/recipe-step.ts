import type { Volume } from '../core/volume.js';
import { applyStep } from '../steps/registry.js';
import type { StepContext, StepResult } from '../steps/step-types.js';
import type { RecipeStep } from './spec.js';

/**
 * Run one recipe step through the step registry (parameters validated, defaults filled).
 * @param step - name and parameters
 * @param volume - the run (not modified)
 * @param context - sidecar, events, mask
 * @returns the step's result
 * @example const r = await runRecipeStep({ step: 'smooth', params: { fwhmMm: 6 } }, run.volume, context)
 */
export function runRecipeStep(step: RecipeStep, volume: Volume, context: StepContext): Promise<StepResult> {
  return applyStep(step.step, volume, step.params, context);
}
