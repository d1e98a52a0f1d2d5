import gammaPdf from '@stdlib/stats-base-dists-gamma-pdf';
import { fail } from '../core/fail.js';

/**
 * Which canonical double-gamma haemodynamic response to use.
 * - `'glover'`: Glover GH (1999) NeuroImage 9(4):416-429,
 *   h(t) = (t/d1)^a1 e^{-(t-d1)/b1} - c (t/d2)^a2 e^{-(t-d2)/b2}, d_i = a_i b_i.
 *   Its raw peak is 0.968613 at t = 5.24 s with the default parameters.
 * - `'gamma-difference'`: h(t) = Gamma_pdf(t; shape 6, scale 1 s) - (1/6) Gamma_pdf(t; shape 16, scale 1 s);
 *   raw peak 0.1754412 at 4.99851 s, integral 5/6.
 */
export type HrfShape = 'glover' | 'gamma-difference';

/**
 * Parameters of the Glover form. The defaults a1 = 6, a2 = 12, b1 = b2 = 0.9 s, c = 0.35 are quoted
 * from memory of Glover (1999); the values they produce are checked in the tests against a scipy
 * fixture and REFERENCES.md §2, not against the paper itself.
 */
export interface GloverParams {
  /** Shape of the positive lobe (dimensionless). __Default value:__ 6 */
  a1: number;
  /** Shape of the undershoot (dimensionless). __Default value:__ 12 */
  a2: number;
  /** Time scale of the positive lobe, seconds. __Default value:__ 0.9 */
  b1Sec: number;
  /** Time scale of the undershoot, seconds. __Default value:__ 0.9 */
  b2Sec: number;
  /** Undershoot weight. __Default value:__ 0.35 */
  c: number;
}

/** Default Glover (1999) parameters (from memory, see {@link GloverParams}). */
export const GLOVER_DEFAULTS: Readonly<GloverParams> = Object.freeze({ a1: 6, a2: 12, b1Sec: 0.9, b2Sec: 0.9, c: 0.35 });

/** Options shared by {@link hrfValues} and {@link hrfKernel}. */
export interface HrfOptions {
  /** __Default value:__ `'glover'` */
  shape?: HrfShape;
  /** Override some Glover parameters (ignored for `'gamma-difference'`). */
  glover?: Partial<GloverParams>;
  /**
   * Return the analytic time derivative dh/dt (per second) instead of h.
   * __Default value:__ false
   */
  derivative?: boolean;
}

/**
 * Raw (unnormalised) canonical HRF, or its analytic time derivative, at the given times. Times at
 * or before 0 give 0 (the response is causal).
 * @param timesSec - times after a neural impulse, seconds
 * @param options - shape, Glover parameters, derivative
 * @returns values, one per time
 * @example hrfValues([2, 5.24]) // Float64Array [0.112836..., 0.968613...]
 */
export function hrfValues(timesSec: ArrayLike<number>, options: HrfOptions = {}): Float64Array {
  const shape = options.shape ?? 'glover';
  const out = new Float64Array(timesSec.length);
  if (shape === 'glover') {
    const p = { ...GLOVER_DEFAULTS, ...(options.glover ?? {}) };
    for (const [k, v] of Object.entries(p)) {
      if (!Number.isFinite(v) || (k !== 'c' && !(v > 0))) fail('INVALID_ARGUMENT', `Glover HRF parameter ${k} must be a positive finite number, got ${v}`);
    }
    const d1 = p.a1 * p.b1Sec;
    const d2 = p.a2 * p.b2Sec;
    for (let i = 0; i < out.length; i++) {
      const t = timesSec[i];
      if (!(t > 0)) continue;
      const g1 = Math.pow(t / d1, p.a1) * Math.exp(-(t - d1) / p.b1Sec);
      const g2 = p.c * Math.pow(t / d2, p.a2) * Math.exp(-(t - d2) / p.b2Sec);
      // d/dt [(t/d)^a e^{-(t-d)/b}] = (t/d)^a e^{-(t-d)/b} (a/t - 1/b)
      out[i] = options.derivative ? g1 * (p.a1 / t - 1 / p.b1Sec) - g2 * (p.a2 / t - 1 / p.b2Sec) : g1 - g2;
    }
  } else if (shape === 'gamma-difference') {
    // stdlib's gamma pdf takes a rate; rate 1 per second equals scipy's scale 1 s
    for (let i = 0; i < out.length; i++) {
      const t = timesSec[i];
      if (!(t > 0)) continue;
      const g1 = gammaPdf(t, 6, 1);
      const g2 = gammaPdf(t, 16, 1) / 6;
      // d/dt Gamma_pdf(t; k, 1) = Gamma_pdf(t; k, 1) ((k-1)/t - 1)
      out[i] = options.derivative ? g1 * (5 / t - 1) - g2 * (15 / t - 1) : g1 - g2;
    }
  } else {
    fail('INVALID_ARGUMENT', `HRF shape must be 'glover' or 'gamma-difference', got '${String(shape)}'`);
  }
  return out;
}

/** Options for {@link hrfKernel}. */
export interface HrfKernelOptions extends HrfOptions {
  /** Sample spacing, seconds. __Default value:__ 0.1 */
  dtSec?: number;
  /** Kernel length, seconds (samples at 0, dt, ... < lengthSec). __Default value:__ 32 */
  lengthSec?: number;
  /**
   * How the kernel is scaled:
   * - `'peak'`: divided by the continuous HRF peak ({@link hrfPeak}), so the largest sample is 1 when
   *   the grid hits the peak time and just below 1 otherwise;
   * - `'sum'`: the HRF samples sum to 1 (a sustained unit boxcar convolves to a plateau of 1);
   * - `'none'`: raw values.
   * The derivative (when asked) is scaled by the same factor as the HRF, i.e. it is the derivative
   * of the scaled HRF. __Default value:__ `'peak'`
   */
  normalise?: 'peak' | 'sum' | 'none';
}

/**
 * The HRF (or its derivative) sampled on a regular grid starting at t = 0, for convolution.
 * @param options - shape, sampling, scaling
 * @returns kernel samples at t = 0, dtSec, 2 dtSec, ...
 * @example const k = hrfKernel({ dtSec: 0.1, normalise: 'sum' }) // 320 samples summing to 1
 */
export function hrfKernel(options: HrfKernelOptions = {}): Float64Array {
  const dtSec = options.dtSec ?? 0.1;
  const lengthSec = options.lengthSec ?? 32;
  const normalise = options.normalise ?? 'peak';
  if (!(dtSec > 0) || !Number.isFinite(dtSec)) fail('INVALID_ARGUMENT', `dtSec must be positive, got ${dtSec}`);
  if (!(lengthSec > dtSec) || !Number.isFinite(lengthSec)) fail('INVALID_ARGUMENT', `lengthSec must exceed dtSec (${dtSec}), got ${lengthSec}`);
  if (normalise !== 'peak' && normalise !== 'sum' && normalise !== 'none') fail('INVALID_ARGUMENT', `normalise must be 'peak', 'sum' or 'none', got '${String(normalise)}'`);
  const n = Math.ceil(lengthSec / dtSec - 1e-9);
  const times = new Float64Array(n);
  for (let i = 0; i < n; i++) times[i] = i * dtSec;
  const h = hrfValues(times, { ...options, derivative: false });
  let scale = 1;
  if (normalise === 'peak') {
    // the continuous peak, so the scaling does not depend on dtSec
    scale = 1 / hrfPeak(options).value;
  } else if (normalise === 'sum') {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += h[i];
    scale = 1 / sum;
  }
  const out = options.derivative ? hrfValues(times, options) : h;
  for (let i = 0; i < n; i++) out[i] *= scale;
  return out;
}

/**
 * Time and height of the HRF's maximum: a 0.05 s scan over 0-32 s, refined by golden-section search
 * to 1e-10 s.
 * @param options - shape and Glover parameters (`derivative` is ignored)
 * @returns peak time (s) and raw peak value
 * @example hrfPeak() // { timeSec: 5.23998..., value: 0.968613... }
 */
export function hrfPeak(options: HrfOptions = {}): { timeSec: number; value: number } {
  const opts = { ...options, derivative: false };
  const f = (t: number): number => hrfValues([t], opts)[0];
  const step = 0.05;
  const times = Array.from({ length: 641 }, (_, i) => i * step);
  const coarse = hrfValues(times, opts);
  let best = 0;
  for (let i = 1; i < coarse.length; i++) if (coarse[i] > coarse[best]) best = i;
  const g = (Math.sqrt(5) - 1) / 2;
  let lo = Math.max(0, (best - 1) * step);
  let hi = (best + 1) * step;
  while (hi - lo > 1e-10) {
    const x1 = hi - g * (hi - lo);
    const x2 = lo + g * (hi - lo);
    if (f(x1) > f(x2)) hi = x2;
    else lo = x1;
  }
  const timeSec = (lo + hi) / 2;
  return { timeSec, value: f(timeSec) };
}
