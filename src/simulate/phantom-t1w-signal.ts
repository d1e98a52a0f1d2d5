import { fail } from '../core/fail.js';
import type { PhantomSpec, PhantomStructuralSequence } from './phantom-spec.js';
import { spoiledGreSignal } from './spoiled-gre-signal.js';
import { PHANTOM_TISSUES, type PhantomTissue } from './tissue-properties.js';

/**
 * Steady-state signal of each pure tissue in a T1-weighted spoiled gradient echo, from the
 * phantom's tissue model (proton density x the spoiled-GRE steady state of Ernst & Anderson 1966),
 * scaled so that pure white matter gives `whiteMatterSignal`.
 * @param tissues - the phantom's tissue properties
 * @param sequence - TR, TE, flip angle of the structural sequence
 * @param whiteMatterSignal - value of pure white matter
 * @returns signal per tissue
 * @throws BoldsweepError INVALID_ARGUMENT when white matter gives no signal
 * @example phantomT1wSignal(spec.tissues, { trSec: 0.02, teSec: 0.004, flipAngleDeg: 25 }, 1000)['grey-matter'] // about 780
 */
export function phantomT1wSignal(tissues: PhantomSpec['tissues'], sequence: PhantomStructuralSequence, whiteMatterSignal: number): Record<PhantomTissue, number> {
  const raw = (t: PhantomTissue) => tissues[t].protonDensity * spoiledGreSignal(tissues[t].t1Sec, tissues[t].t2StarSec, sequence).steadySignal;
  const wm = raw('white-matter');
  if (!(wm > 0)) fail('INVALID_ARGUMENT', 'the structural contrast needs white matter with a positive proton density');
  return Object.fromEntries(PHANTOM_TISSUES.map((t) => [t, (whiteMatterSignal * raw(t)) / wm])) as Record<PhantomTissue, number>;
}
