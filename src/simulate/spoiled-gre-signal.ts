import { fail } from '../core/fail.js';

/** Sequence timing of a spoiled gradient-echo (EPI) acquisition. */
export interface GreTiming {
  /** Repetition time, seconds. */
  trSec: number;
  /** Echo time, seconds. */
  teSec: number;
  /** Excitation flip angle, degrees. */
  flipAngleDeg: number;
}

/** Closed-form spoiled gradient-echo quantities for one tissue. */
export interface SpoiledGreSignal {
  /** E1 = exp(-TR/T1). */
  e1: number;
  /** q = E1 cos(alpha): the factor by which the distance to steady state shrinks each excitation. */
  q: number;
  /** Steady-state longitudinal magnetisation before a pulse, as a fraction of M0: (1 - E1)/(1 - q). */
  mzSteadyFraction: number;
  /** Steady-state signal per unit M0 and proton density: sin(alpha) (1 - E1)/(1 - q) exp(-TE/T2*). */
  steadySignal: number;
}

/**
 * Steady state of a spoiled gradient echo (Ernst RR & Anderson WA (1966) Rev Sci Instrum 37:93-102;
 * Haacke EM et al. (1999) Magnetic Resonance Imaging: Physical Principles and Sequence Design):
 * S = PD sin(a) (1 - E1)/(1 - E1 cos a) exp(-TE/T2*), here per unit PD.
 * @param t1Sec - tissue T1, seconds
 * @param t2StarSec - tissue T2*, seconds
 * @param timing - TR, TE, flip angle
 * @returns E1, q, the steady-state Mz fraction and the steady-state signal
 * @example spoiledGreSignal(1.33, 0.05, { trSec: 2, teSec: 0.03, flipAngleDeg: 77 }).q // 0.0500050
 */
export function spoiledGreSignal(t1Sec: number, t2StarSec: number, timing: GreTiming): SpoiledGreSignal {
  if (!(t1Sec > 0) || !(t2StarSec > 0)) fail('INVALID_ARGUMENT', `T1 and T2* must be positive, got ${t1Sec} s and ${t2StarSec} s`);
  if (!(timing.trSec > 0) || !(timing.teSec >= 0)) fail('INVALID_ARGUMENT', `trSec must be > 0 and teSec >= 0, got ${timing.trSec} and ${timing.teSec}`);
  const a = (timing.flipAngleDeg * Math.PI) / 180;
  const e1 = Math.exp(-timing.trSec / t1Sec);
  const q = e1 * Math.cos(a);
  const mzSteadyFraction = (1 - e1) / (1 - q);
  return { e1, q, mzSteadyFraction, steadySignal: Math.sin(a) * mzSteadyFraction * Math.exp(-timing.teSec / t2StarSec) };
}

/**
 * Longitudinal magnetisation before excitation n (1-based), as a fraction of M0, starting fully relaxed:
 * Mz(n) = Mss + (M0 - Mss) q^(n-1) (Bloch-equation recursion for a spoiled gradient echo; Haacke 1999).
 * The signal of excitation n is proportional to it, so S(n)/S_ss = 1 + (M0/Mss - 1) q^(n-1).
 * @param n - excitation number, 1-based
 * @param g - result of {@link spoiledGreSignal}
 * @returns Mz before pulse n over M0
 * @example mzBeforePulse(1, g) // 1: the first excitation sees full magnetisation
 */
export function mzBeforePulse(n: number, g: Pick<SpoiledGreSignal, 'q' | 'mzSteadyFraction'>): number {
  return g.mzSteadyFraction + (1 - g.mzSteadyFraction) * Math.pow(g.q, n - 1);
}

/**
 * The Ernst angle, the flip angle of largest steady-state signal: cos(a_E) = exp(-TR/T1)
 * (Ernst & Anderson 1966).
 * @param trSec - repetition time, seconds
 * @param t1Sec - tissue T1, seconds
 * @returns the angle in degrees
 * @example ernstAngleDeg(2, 1.33) // 77.156
 */
export function ernstAngleDeg(trSec: number, t1Sec: number): number {
  if (!(trSec > 0) || !(t1Sec > 0)) fail('INVALID_ARGUMENT', `trSec and t1Sec must be positive, got ${trSec} and ${t1Sec}`);
  return (Math.acos(Math.exp(-trSec / t1Sec)) * 180) / Math.PI;
}
