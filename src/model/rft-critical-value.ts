import { fail } from '../core/fail.js';
import { expectedEulerCharacteristic, type Resels } from './rft-ec-density.js';
import { findRootBracketed } from './threshold-root.js';
import { checkOpenUnit } from './threshold-input.js';
import { checkStatisticKind, upperCriticalValue, type StatisticKind } from './threshold-statistic.js';

/** Largest threshold searched; a t field with very few dof can need thresholds in the hundreds. */
const MAX_THRESHOLD = 1e6;

/**
 * Random-field family-wise critical value: the u where the expected Euler characteristic of the
 * excursion set equals alpha, E[EC](u) = sum_d R_d rho_d(u) = alpha (Worsley KJ et al. 1996, Hum
 * Brain Mapp 4:58-73). The search starts at the uncorrected critical value (E[EC] >= R0 rho0 there
 * when the other terms are positive) and steps upward until E[EC] drops below alpha, then a
 * bracketed root finder (Brent) solves inside the last step. E[EC] falls monotonically in that
 * range for z fields (u >= sqrt 3) and for t fields with dof > 3; t fields with dof <= 3 have heavy
 * enough tails that E[EC] never falls to alpha, so they are refused.
 * @param resels - [R0, R1, R2, R3] of the search region (see reselCounts)
 * @param alpha - family-wise error rate in (0, 1)
 * @param stat - field kind
 * @returns the critical value u and E[EC] at u
 * @throws BoldsweepError INVALID_ARGUMENT for alpha outside (0, 1), resels not finite or negative
 *   R1..R3, t dof <= 3, or no solution below 1e6
 * @example rftCriticalValue([0, 0, 0, 1000], 0.05, { kind: 'z' }).threshold // 4.64345
 */
export function rftCriticalValue(resels: Resels, alpha: number, stat: StatisticKind): { threshold: number; expectedEc: number } {
  checkOpenUnit('alpha', alpha);
  checkStatisticKind(stat);
  if (resels.length !== 4 || resels.some((r) => !Number.isFinite(r)) || resels.slice(1).some((r) => r < 0)) {
    fail('INVALID_ARGUMENT', `resels must be four finite numbers with R1..R3 >= 0, got [${resels.join(', ')}]`);
  }
  if (stat.kind === 't' && stat.dof <= 3) fail('INVALID_ARGUMENT', `random-field thresholds for t maps need dof > 3 (E[EC] does not fall to alpha for heavier tails), got ${stat.dof}`);
  const f = (u: number): number => expectedEulerCharacteristic(u, resels, stat) - alpha;
  const single = upperCriticalValue(alpha, stat);
  let lo = Math.max(single, Math.sqrt(3));
  if (f(lo) <= 0) {
    // Small search region: E[EC] is already below alpha at lo. Solve between the single-voxel
    // critical value and lo when the sign changes there; otherwise the single-voxel value stands.
    const u = lo > single && f(single) > 0 ? findRootBracketed(f, single, lo, 1e-10) : single;
    return { threshold: u, expectedEc: expectedEulerCharacteristic(u, resels, stat) };
  }
  let step = 0.25, hi = lo + step;
  while (f(hi) > 0) {
    lo = hi;
    step *= 2;
    hi = lo + step;
    if (hi > MAX_THRESHOLD) fail('INVALID_ARGUMENT', `no random-field threshold below ${MAX_THRESHOLD} for alpha ${alpha} and resels [${resels.join(', ')}]`);
  }
  const threshold = findRootBracketed(f, lo, hi, 1e-10);
  return { threshold, expectedEc: expectedEulerCharacteristic(threshold, resels, stat) };
}
