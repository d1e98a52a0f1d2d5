import { childSeed } from '../core/child-seed.js';
import { resolvePhantomSpec, type PhantomSpecInput } from './phantom-spec.js';
import type { PhantomRun } from './phantom-types.js';
import { simulatePhantomRun } from './simulate-phantom-run.js';

/** Volumes in each image of the phantom's reversed phase-encode pair. __Default value:__ 3 */
export const PHASE_ENCODE_PAIR_VOLUMES = 3;

/** The phantom's reversed phase-encode pair: two short EPI acquisitions of the same head. */
export interface PhantomPhaseEncodePair {
  /** Acquired in the run's phase-encode direction. */
  same: PhantomRun;
  /** Acquired in the opposite direction ('j' <-> 'j-'). */
  reversed: PhantomRun;
  /** BIDS `dir-` labels of the two (anatomical direction of travel on the phantom's RAS grid: +j runs posterior to anterior). */
  labels: { same: string; reversed: string };
}

/**
 * Two short EPI acquisitions of a phantom's head with opposite phase-encode directions, distorted
 * by the same B0 field through the shared acquisition model (the phantom's own simulation with the
 * direction flipped): the head at its reference position, no task, no spikes or dropouts, the run's
 * sequence, noise and field. Each image has its own random streams, derived from the run's seed
 * (`childSeed(seed, 'phase-encode-pair', direction)`), so the same spec gives the same bytes and
 * the run's own streams are untouched.
 * @param input - the run's spec (anything left out takes its default)
 * @param volumes - volumes per image. __Default value:__ {@link PHASE_ENCODE_PAIR_VOLUMES}
 * @returns the pair and their BIDS direction labels
 * @throws BoldsweepError INVALID_ARGUMENT for a bad spec
 * @example const pair = simulatePhaseEncodePair(demoPhantomSpec())
 */
export function simulatePhaseEncodePair(input: PhantomSpecInput = {}, volumes = PHASE_ENCODE_PAIR_VOLUMES): PhantomPhaseEncodePair {
  const spec = resolvePhantomSpec(input);
  const direction = spec.acquisition.phaseEncodingDirection;
  const opposite = direction === 'j' ? 'j-' : 'j';
  const one = (dir: 'j' | 'j-'): PhantomRun => simulatePhantomRun({
    ...spec,
    seed: childSeed(spec.seed, 'phase-encode-pair', dir),
    nVolumes: volumes,
    acquisition: { ...spec.acquisition, phaseEncodingDirection: dir },
    design: null,
    activation: null,
    motion: null,
    spikes: [],
    dropouts: [],
  });
  const label = (dir: 'j' | 'j-') => (dir === 'j' ? 'PA' : 'AP');
  return { same: one(direction), reversed: one(opposite), labels: { same: label(direction), reversed: label(opposite) } };
}
