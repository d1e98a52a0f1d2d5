import { fail } from '../core/fail.js';
import { makeVolume, voxelsPerVolume } from '../core/volume.js';
import type { BoldEvent } from '../io/run-types.js';
import type { StepFunction } from './step-types.js';

/** Parameters of {@link dropInitialVolumesStep}. */
export interface DropInitialVolumesParams {
  /** Number of volumes removed from the start (0 = none); at least two volumes must remain. */
  count: number;
}

/** What happened to the events when volumes were dropped. */
export interface ShiftedEvents {
  events: BoldEvent[];
  /** Events that started before the new first volume but ended after it: their start was moved to 0. */
  trimmed: number;
  /** Events that ended at or before the new first volume: removed. */
  removed: number;
}

/**
 * Move event onsets to a new time zero `shiftSec` later. Events ending at or before it are removed;
 * events straddling it start at 0 with the part before it cut off.
 * @param events - events of the run (not modified)
 * @param shiftSec - seconds cut from the start (count x TR)
 * @returns the new events and how many were trimmed or removed
 * @example shiftEvents([{ onsetSec: 10, durationSec: 5, trialType: 'a', modulation: 1 }], 4) // onset 6
 */
export function shiftEvents(events: readonly BoldEvent[], shiftSec: number): ShiftedEvents {
  const out: BoldEvent[] = [];
  let trimmed = 0, removed = 0;
  for (const e of events) {
    const onset = e.onsetSec - shiftSec;
    const end = onset + e.durationSec;
    if (onset >= 0) out.push({ ...e, onsetSec: onset });
    else if (end > 0) {
      out.push({ ...e, onsetSec: 0, durationSec: end });
      trimmed++;
    } else removed++;
  }
  return { events: out, trimmed, removed };
}

/**
 * Preprocessing step: remove the first `count` volumes (those acquired before the signal reached
 * steady state). The shorter run's data is a view of the input's last volumes (no copy). Event onsets in the returned context are shifted by count x TR; events that
 * started earlier are trimmed or removed and counted. The sidecar's BIDS field
 * NumberOfVolumesDiscardedByUser is increased by `count`.
 * @param volume - the run (not modified)
 * @param params - count
 * @param context - events and sidecar to update
 * @returns the shorter run, its step note and the updated context
 * @throws BoldsweepError INVALID_ARGUMENT for a count that is not an integer in 0..nt-2; TR_MISSING when
 *   events must be shifted but the run has no TR
 * @example const { volume, context: ctx } = dropInitialVolumesStep(run.volume, { count: 3 }, context)
 */
export const dropInitialVolumesStep: StepFunction<DropInitialVolumesParams> = (volume, params, context) => {
  const { count } = params;
  const nt = volume.dims[3];
  if (!Number.isInteger(count) || count < 0 || count > nt - 2) fail('INVALID_ARGUMENT', `drop-initial-volumes: count must be an integer from 0 to ${nt - 2} (at least two volumes must remain), got ${String(count)}`);
  const shiftSec = count * volume.trSec;
  if (count > 0 && context.events && context.events.length > 0 && !(volume.trSec > 0)) {
    fail('TR_MISSING', 'drop-initial-volumes: event onsets cannot be shifted because the run has no repetition time');
  }
  const n = voxelsPerVolume(volume);
  // a view, not a copy: the kept volumes are one contiguous block at the end of the run
  const data = volume.data.subarray(count * n);
  const out = makeVolume({ dims: [volume.dims[0], volume.dims[1], volume.dims[2], nt - count], spacingMm: [...volume.spacingMm], trSec: volume.trSec, affine: new Float64Array(volume.affine), data });
  const shifted = context.events ? shiftEvents(context.events, shiftSec) : null;
  const sidecar = context.sidecar
    ? { ...context.sidecar, NumberOfVolumesDiscardedByUser: (typeof context.sidecar.NumberOfVolumesDiscardedByUser === 'number' ? context.sidecar.NumberOfVolumesDiscardedByUser : 0) + count }
    : null;
  const eventText = shifted ? ` Event onsets were moved ${shiftSec} s earlier, so that they are timed from the first kept volume${shifted.trimmed + shifted.removed > 0 ? `; ${shifted.trimmed} events were trimmed and ${shifted.removed} removed because they began before it` : ''}.` : '';
  return {
    volume: out,
    context: { ...context, events: shifted ? shifted.events : context.events, sidecar },
    note: {
      step: 'drop-initial-volumes',
      params: { count },
      summary: count === 0 ? 'No volumes dropped' : `Dropped the first ${count} volumes (${shiftSec} s)`,
      diagnostics: { count, volumesBefore: nt, volumesAfter: nt - count, shiftSec, eventsTrimmed: shifted?.trimmed ?? 0, eventsRemoved: shifted?.removed ?? 0 },
      methodsText: count === 0
        ? 'No initial volumes were discarded.'
        : `The first ${count} volumes (${shiftSec} s) were discarded to allow for T1 equilibration, leaving ${nt - count}.${eventText}`,
      citations: [],
    },
  };
};
