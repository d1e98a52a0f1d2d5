import { fail } from '../core/fail.js';
import type { BoldEvent } from '../io/run-types.js';
import { eventRegressors, type EventRegressorOptions } from '../model/event-regressors.js';

/** Options of {@link plantTimeCourse}: the model's event-regressor options plus which trial type. */
export interface PlantTimeCourseOptions extends Omit<EventRegressorOptions, 'conditions' | 'derivative'> {
  /** Trial type whose events drive the planted activation. __Default value:__ the only trial type (required when there are several). */
  condition?: string;
}

/**
 * The time course of a planted activation: the task regressor (the condition's events convolved with
 * the canonical HRF and sampled per volume, exactly as the GLM design builds it) scaled to a maximum
 * of 1, so a planted amplitude is the percent signal change at the response peak.
 * @param events - rows of the events table (not modified)
 * @param nt - number of volumes
 * @param trSec - repetition time, seconds
 * @param options - condition, HRF and sampling options (same names as the design's)
 * @returns one value per volume, maximum 1
 * @throws BoldsweepError INVALID_ARGUMENT when the condition is ambiguous or its regressor is never positive;
 *   the model's errors for bad events
 * @example const tc = plantTimeCourse(run.events!, run.volume.dims[3], run.volume.trSec)
 */
export function plantTimeCourse(events: readonly BoldEvent[], nt: number, trSec: number, options: PlantTimeCourseOptions = {}): Float64Array {
  const types = [...new Set(events.map((e) => e.trialType))].sort();
  const condition = options.condition ?? (types.length === 1 ? types[0] : undefined);
  if (condition === undefined) fail('INVALID_ARGUMENT', `the events have ${types.length} trial types (${types.join(', ') || 'none'}): name the condition to plant`);
  const { condition: _c, ...regressorOptions } = options;
  const column = eventRegressors(events, nt, trSec, { ...regressorOptions, conditions: [condition] }).columns[0];
  let max = -Infinity;
  for (const x of column) if (x > max) max = x;
  if (!(max > 0)) fail('INVALID_ARGUMENT', `the regressor of condition '${condition}' is never positive within the run; no activation can be planted`);
  return column.map((x) => x / max);
}
