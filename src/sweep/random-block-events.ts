import { createRng } from '../core/random.js';
import type { BoldEvent } from '../io/run-types.js';

/** A random block design used as a null task (see the spec's `events`). */
export interface RandomBlocks {
  /** Duration of every block, seconds. */
  onSec: number;
  /** Shortest and longest rest before each block, seconds (drawn uniformly). */
  offMinSec: number;
  offMaxSec: number;
  /** Trial type of the blocks. */
  trialType: string;
}

/**
 * A block design with random rest periods: each block of `onSec` follows a rest drawn uniformly
 * from [offMinSec, offMaxSec]. Fitting such designs to data with no task (rest data or a simulated
 * run without activation) measures false alarms under the null, the approach of Eklund A, Nichols TE
 * & Knutsson H (2016) PNAS 113:7900-7905 with resting-state data and made-up designs.
 * @param seed - seed of the rests (a sweep uses one per repeat)
 * @param runSec - run length, seconds (blocks start before it)
 * @param design - block and rest durations, trial type
 * @returns events, onsets ascending
 * @example randomBlockEvents(7, 300, { onSec: 20, offMinSec: 10, offMaxSec: 40, trialType: 'null' })
 */
export function randomBlockEvents(seed: number, runSec: number, design: RandomBlocks): BoldEvent[] {
  const rng = createRng(seed);
  const out: BoldEvent[] = [];
  let t = 0;
  for (;;) {
    t += design.offMinSec + rng.uniform() * (design.offMaxSec - design.offMinSec);
    if (t >= runSec) break;
    out.push({ onsetSec: t, durationSec: design.onSec, trialType: design.trialType, modulation: 1 });
    t += design.onSec;
  }
  return out;
}
