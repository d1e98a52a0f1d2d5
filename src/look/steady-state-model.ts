import { fail } from '../core/fail.js';

/**
 * Grey-matter T1 at 3 T used when the caller gives none: 1.331 s (Wansapura JP et al. 1999 J Magn
 * Reson Imaging 9(4):531-538; value from memory, see REFERENCES.md §6). Published values span about
 * 1.3-1.8 s (Stanisz et al. 2005 give 1.82 s), so the model count is evidence, not a rule.
 */
export const GREY_MATTER_T1_SEC_3T = 1.331;

/** Inputs of the spoiled-gradient-echo approach to steady state. */
export interface SteadyStateParams {
  /** Repetition time, seconds. */
  trSec: number;
  /** Excitation flip angle, degrees. */
  flipAngleDeg: number;
  /** Longitudinal relaxation time, seconds (default {@link GREY_MATTER_T1_SEC_3T}). */
  t1Sec?: number;
}

/**
 * Fractional excess of the signal of volume n (1-based) over the steady state for an ideally spoiled
 * gradient echo starting from full magnetisation (Ernst RR & Anderson WA 1966 Rev Sci Instrum
 * 37:93-102): with E1 = exp(-TR/T1) and q = E1 cos(alpha), M_ss = M0 (1 - E1)/(1 - q) and
 * Mz before pulse n = M_ss + (M0 - M_ss) q^(n-1), so the excess is (M0/M_ss - 1) q^(n-1).
 * @param n - volume number, 1 for the first volume
 * @param params - trSec, flipAngleDeg, t1Sec
 * @returns (S_n - S_ss) / S_ss
 * @example steadyStateExcess(1, { trSec: 2, flipAngleDeg: 77, t1Sec: 1.33 }) // 0.22153
 */
export function steadyStateExcess(n: number, params: SteadyStateParams): number {
  const { e1, q } = factors(params);
  const m0OverMss = (1 - q) / (1 - e1);
  return (m0OverMss - 1) * Math.pow(q, n - 1);
}

/**
 * Number of leading volumes whose predicted excess over steady state exceeds `relativeThreshold`
 * (the closed form above, solved for n).
 * @param params - trSec, flipAngleDeg, t1Sec
 * @param relativeThreshold - excess that counts as visible, e.g. 0.01 for 1 %
 * @returns how many initial volumes are brighter than steady state by more than the threshold
 * @example steadyStateModelCount({ trSec: 2, flipAngleDeg: 77, t1Sec: 1.33 }, 0.01) // 2
 */
export function steadyStateModelCount(params: SteadyStateParams, relativeThreshold: number): number {
  if (!(relativeThreshold > 0)) fail('INVALID_ARGUMENT', `relativeThreshold must be > 0, got ${relativeThreshold}`);
  let count = 0;
  // |q| < 1 for any T1 > 0, so the excess decays and the loop ends; the cap guards absurd inputs
  while (count < 10000 && Math.abs(steadyStateExcess(count + 1, params)) > relativeThreshold) count++;
  return count;
}

function factors(params: SteadyStateParams): { e1: number; q: number } {
  const t1 = params.t1Sec ?? GREY_MATTER_T1_SEC_3T;
  if (!(params.trSec > 0)) fail('INVALID_ARGUMENT', `trSec must be > 0, got ${params.trSec}`);
  if (!(t1 > 0)) fail('INVALID_ARGUMENT', `t1Sec must be > 0, got ${t1}`);
  if (!(params.flipAngleDeg > 0 && params.flipAngleDeg <= 180)) fail('INVALID_ARGUMENT', `flipAngleDeg must be in (0, 180], got ${params.flipAngleDeg}`);
  const e1 = Math.exp(-params.trSec / t1);
  return { e1, q: e1 * Math.cos((params.flipAngleDeg * Math.PI) / 180) };
}
