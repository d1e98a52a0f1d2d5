import { fail } from '../core/fail.js';
import type { Rng } from '../core/random.js';

/** Rates of the simulated cardiac and respiratory cycles. */
export interface PhysioRates {
  /** Mean heart rate, Hz. __Default value:__ 1.1 */
  cardiacHz: number;
  /** Mean breathing rate, Hz. __Default value:__ 0.3 */
  respirationHz: number;
  /**
   * Standard deviation of the slow wander of each rate, as a fraction of the mean rate (a rate that
   * never varies would alias to one pure frequency). __Default value:__ 0.05
   */
  rateWanderFraction: number;
}

/** Cardiac and respiratory traces read at the requested times, each with zero mean and unit amplitude scale. */
export interface PhysioTraces {
  cardiac: Float64Array;
  respiration: Float64Array;
}

/**
 * Quasi-periodic cardiac and respiratory fluctuations at arbitrary times (e.g. every slice's
 * acquisition time, so sampling at the TR aliases them as in a real run: 1.1 Hz at TR 2 s appears
 * at 0.1 Hz, 0.3 Hz at 0.2 Hz). Each rate wanders slowly (a smoothed random walk drawn from `rng`);
 * the cardiac waveform has a second harmonic, the respiratory one is sinusoidal with a slowly
 * varying depth. Values lie roughly in [-1, 1].
 * @param timesSec - times to read at, seconds, all >= 0
 * @param rates - mean rates and their wander
 * @param rng - seeded random stream (consumed)
 * @returns one cardiac and one respiratory value per time
 * @example physioTraces(sliceTimes, { cardiacHz: 1.1, respirationHz: 0.3, rateWanderFraction: 0.05 }, createRng(1))
 */
export function physioTraces(timesSec: ArrayLike<number>, rates: PhysioRates, rng: Rng): PhysioTraces {
  if (!(rates.cardiacHz > 0) || !(rates.respirationHz > 0) || !(rates.rateWanderFraction >= 0)) {
    fail('INVALID_ARGUMENT', `physio rates must be positive (got cardiacHz ${rates.cardiacHz}, respirationHz ${rates.respirationHz}) and rateWanderFraction >= 0 (got ${rates.rateWanderFraction})`);
  }
  const dt = 0.02;
  let tMax = 0;
  for (let i = 0; i < timesSec.length; i++) tMax = Math.max(tMax, timesSec[i]);
  const n = Math.ceil(tMax / dt) + 2;
  const wander = (hz: number) => slowNoise(n, dt, 10, rng).map((v) => hz * (1 + rates.rateWanderFraction * v));
  const cardiacRate = wander(rates.cardiacHz);
  const respRate = wander(rates.respirationHz);
  const depth = slowNoise(n, dt, 20, rng).map((v) => 1 + 0.2 * v);
  const c0 = 2 * Math.PI * rng.uniform();
  const r0 = 2 * Math.PI * rng.uniform();
  const cardiacFine = new Float64Array(n);
  const respFine = new Float64Array(n);
  let pc = c0, pr = r0;
  for (let s = 0; s < n; s++) {
    // a heartbeat is not a sinusoid: the second harmonic sharpens the systolic peak
    cardiacFine[s] = (Math.sin(pc) + 0.4 * Math.sin(2 * pc + 0.5)) / 1.4;
    respFine[s] = depth[s] * Math.sin(pr);
    pc += 2 * Math.PI * cardiacRate[s] * dt;
    pr += 2 * Math.PI * respRate[s] * dt;
  }
  const at = (fine: Float64Array) => {
    const out = new Float64Array(timesSec.length);
    for (let i = 0; i < timesSec.length; i++) {
      const x = timesSec[i] / dt;
      const s = Math.min(Math.floor(x), n - 2);
      out[i] = fine[s] + (x - s) * (fine[s + 1] - fine[s]);
    }
    return out;
  };
  return { cardiac: at(cardiacFine), respiration: at(respFine) };
}

/** Unit-variance noise varying on a time scale of about `scaleSec` (white noise, moving-average smoothed twice). */
function slowNoise(n: number, dt: number, scaleSec: number, rng: Rng): Float64Array {
  const w = Math.max(1, Math.round(scaleSec / dt));
  const pad = 2 * w;
  let x = new Float64Array(n + 2 * pad);
  for (let i = 0; i < x.length; i++) x[i] = rng.normal();
  for (let pass = 0; pass < 2; pass++) {
    const y = new Float64Array(x.length);
    let sum = 0;
    for (let i = 0; i < x.length; i++) {
      sum += x[i];
      if (i >= w) sum -= x[i - w];
      y[i] = sum / w;
    }
    x = y;
  }
  const out = x.subarray(pad, pad + n);
  let m = 0, v = 0;
  for (let i = 0; i < n; i++) m += out[i];
  m /= n;
  for (let i = 0; i < n; i++) v += (out[i] - m) ** 2;
  const sd = Math.sqrt(v / n) || 1;
  return Float64Array.from(out, (u) => (u - m) / sd);
}
