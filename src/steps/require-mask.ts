import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import type { StepContext } from './step-types.js';

/**
 * The brain mask a step needs from its context, checked against the run's grid.
 * @param volume - the run
 * @param context - the step context
 * @param step - step name for messages
 * @returns the mask (1 = brain)
 * @throws BoldsweepError INVALID_ARGUMENT when there is no mask, GRID_MISMATCH when it has another size
 * @example const mask = requireMask(volume, context, 'percent-signal-change')
 */
export function requireMask(volume: Volume, context: StepContext, step: string): Uint8Array {
  const mask = context.mask;
  if (!mask) fail('INVALID_ARGUMENT', `${step}: the step context has no brain mask; compute one first (look module) and pass it as context.mask`);
  const n = voxelsPerVolume(volume);
  if (mask.length !== n) fail('GRID_MISMATCH', `${step}: the mask has ${mask.length} voxels, the run's grid ${volume.dims.slice(0, 3).join('x')} has ${n}`);
  let inside = 0;
  for (let i = 0; i < n; i++) if (mask[i]) inside++;
  if (inside === 0) fail('INVALID_ARGUMENT', `${step}: the brain mask is empty`);
  return mask;
}
