import { fail } from '../core/fail.js';
import type { BoldEvent } from '../io/run-types.js';
import { eventRegressors } from '../model/event-regressors.js';
import type { PlantTimeCourseOptions } from './plant-time-course.js';

/** Options of {@link plantTimeCourses}: those of plantTimeCourse plus the slice times. */
export interface PlantTimeCoursesOptions extends PlantTimeCourseOptions {
  /** Acquisition time of each slice, seconds from the start of its volume (AcquisitionModel.sliceTimesSec). __Default value:__ none */
  sliceTimesSec?: ArrayLike<number> | null;
}

/** The time courses of a planting, all on one scale. */
export interface PlantTimeCourses {
  /** The regressor sampled at the model's sample time of each volume (`sampleTimeSec`, mid-volume by default), maximum 1. */
  timeCourse: Float64Array;
  /** One per slice: the regressor sampled at t*TR + sliceTimesSec[s], on the same scale as `timeCourse`; null without slice times. */
  sliceTimeCourses: Float64Array[] | null;
}

/**
 * The time courses of a planted activation: the condition's events convolved with the HRF (the
 * model's own event-regressor code, so the planting and the GLM use one haemodynamic model), sampled
 * (a) at the time the model samples each volume (`sampleTimeSec`, by default TR/2, mid-volume: the
 * reference the truth's time course and the design share) and (b) when slices are timed, at each
 * slice's own acquisition time t*TR + sliceTimesSec[s]. Time 0 is the start of volume 0, as for the
 * events' onsets. Both are divided by the largest value of (a), so without slice times `timeCourse`
 * equals plantTimeCourse's output.
 * @param events - rows of the events table (not modified)
 * @param nt - number of volumes
 * @param trSec - repetition time, seconds
 * @param options - condition, HRF and sampling options, slice times
 * @returns the reference time course and the per-slice ones
 * @throws BoldsweepError INVALID_ARGUMENT for an ambiguous condition, a regressor never positive, or
 *   slice times outside 0..trSec; the model's errors for bad events
 * @example const { timeCourse, sliceTimeCourses } = plantTimeCourses(run.events!, nt, trSec, { sliceTimesSec: model.sliceTimesSec })
 */
export function plantTimeCourses(events: readonly BoldEvent[], nt: number, trSec: number, options: PlantTimeCoursesOptions = {}): PlantTimeCourses {
  const { condition: chosen, sliceTimesSec, ...regressorOptions } = options;
  const types = [...new Set(events.map((e) => e.trialType))].sort();
  const condition = chosen ?? (types.length === 1 ? types[0] : undefined);
  if (condition === undefined) fail('INVALID_ARGUMENT', `the events have ${types.length} trial types (${types.join(', ') || 'none'}): name the condition to plant`);
  const sampled = (sampleTimeSec?: number) => eventRegressors(events, nt, trSec, { ...regressorOptions, ...(sampleTimeSec === undefined ? {} : { sampleTimeSec }), conditions: [condition] }).columns[0];
  const reference = sampled(regressorOptions.sampleTimeSec);
  let max = -Infinity;
  for (const x of reference) if (x > max) max = x;
  if (!(max > 0)) fail('INVALID_ARGUMENT', `the regressor of condition '${condition}' is never positive within the run; no activation can be planted`);
  const timeCourse = reference.map((x) => x / max);
  if (!sliceTimesSec) return { timeCourse, sliceTimeCourses: null };
  // slices read at the same moment (multiband) share one column
  const byTime = new Map<number, Float64Array>();
  const sliceTimeCourses = Array.from(sliceTimesSec, (s) => {
    let column = byTime.get(s);
    if (!column) {
      column = sampled(s).map((x) => x / max);
      byTime.set(s, column);
    }
    return column;
  });
  return { timeCourse, sliceTimeCourses };
}
