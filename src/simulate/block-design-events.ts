import { fail } from '../core/fail.js';
import type { BoldEvent } from '../io/run-types.js';

/** A regular on/off block design. */
export interface BlockDesign {
  /** Onset of the first block, seconds. */
  firstOnsetSec: number;
  /** Duration of each block, seconds. */
  onSec: number;
  /** Rest between blocks, seconds. */
  offSec: number;
  /** Condition name written in the trial_type column. */
  trialType: string;
}

/**
 * Events of a block design: blocks of `onSec` every `onSec + offSec` seconds from `firstOnsetSec`,
 * as long as a block ends within the run.
 * @param design - timing and condition name
 * @param runSec - run length, seconds (number of volumes x TR)
 * @returns events in onset order, modulation 1
 * @example blockDesignEvents({ firstOnsetSec: 20, onSec: 20, offSec: 20, trialType: 'flicker' }, 300) // 7 blocks
 */
export function blockDesignEvents(design: BlockDesign, runSec: number): BoldEvent[] {
  const { firstOnsetSec, onSec, offSec, trialType } = design;
  if (!(firstOnsetSec >= 0) || !(onSec > 0) || !(offSec >= 0)) fail('INVALID_ARGUMENT', `block design needs firstOnsetSec >= 0, onSec > 0, offSec >= 0, got ${firstOnsetSec}, ${onSec}, ${offSec}`);
  if (trialType.length === 0 || /[\t\n]/.test(trialType)) fail('INVALID_ARGUMENT', `trialType must be a non-empty name without tabs or newlines, got '${trialType}'`);
  const events: BoldEvent[] = [];
  for (let onset = firstOnsetSec; onset + onSec <= runSec + 1e-9; onset += onSec + offSec) {
    events.push({ onsetSec: onset, durationSec: onSec, trialType, modulation: 1 });
  }
  return events;
}
