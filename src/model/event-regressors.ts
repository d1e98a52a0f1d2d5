import { fail } from '../core/fail.js';
import type { BoldEvent } from '../io/run-types.js';
import { hrfKernel, type HrfOptions } from './hrf.js';

/** Options for {@link eventRegressors} (and the event part of `buildDesign`). */
export interface EventRegressorOptions {
  /** HRF shape and parameters. __Default value:__ Glover (1999) */
  hrf?: Omit<HrfOptions, 'derivative'>;
  /** Fine-grid steps per TR for building and convolving the boxcars. __Default value:__ 16 */
  oversampling?: number;
  /**
   * Time within each TR at which a volume is taken to be sampled, seconds: trSec/2 (mid-volume) by
   * default; pass `SliceTiming[k]` to model slice k of data that were not slice-time corrected, or
   * the reference slice's time after correction. __Default value:__ trSec / 2
   */
  sampleTimeSec?: number;
  /** Also add each condition's HRF time-derivative regressor (not orthogonalised). __Default value:__ false */
  derivative?: boolean;
  /**
   * Which trial types to model, in column order. Events of unlisted types are left out of the model
   * (they become part of the baseline). __Default value:__ every trial type, sorted by code unit
   */
  conditions?: readonly string[];
  /** HRF kernel length, seconds; the Glover HRF is below 1e-5 of its peak after 32 s. __Default value:__ 32 */
  hrfLengthSec?: number;
}

/** Convolved regressors, one (or two, with derivatives) per condition. */
export interface EventRegressors {
  /** Column names: the trial type, and `<trial type>_derivative` for derivative columns. */
  names: string[];
  /** 'condition' or 'derivative' per column. */
  kinds: Array<'condition' | 'derivative'>;
  /** Column values, each of length nt. */
  columns: Float64Array[];
}

/**
 * Convolve each trial type's events with the HRF and sample the result at every volume.
 *
 * Definition (seconds throughout): the stimulus of a condition is the sum over its events of a
 * boxcar of height `modulation` from onset to onset + duration; its regressor is
 * r(t) = integral s(u) h(t - u) du with h the HRF scaled to peak 1 ({@link hrfKernel} 'peak'). An
 * event of duration 0 is a unit impulse (area 1 s), so a single such event gives r(t) = h(t - onset)
 * exactly, peaking at 1; an event of duration d << 5 s gives about d * h(t - onset - d/2).
 * The integral is a sum on a grid of step dt = trSec / oversampling (each boxcar is integrated
 * exactly over every grid cell, impulses are split linearly between the two nearest grid points);
 * the value at volume t's sample time t*trSec + sampleTimeSec is interpolated linearly between grid
 * points. Events before time 0 (e.g. before dropped volumes) are allowed and their tails modelled.
 * @param events - rows of the events table (not modified)
 * @param nt - number of volumes
 * @param trSec - repetition time, seconds
 * @param options - HRF, oversampling, sample time, derivatives, conditions
 * @returns names, kinds and columns
 * @throws BoldsweepError EVENTS_BEYOND_RUN when an event starts at or after nt*trSec;
 *   EVENTS_INVALID for non-finite onsets, negative durations or non-finite modulation;
 *   INVALID_ARGUMENT for bad options or a listed condition with no events
 * @example const { names, columns } = eventRegressors(run.events, 200, 2)
 */
export function eventRegressors(events: readonly BoldEvent[], nt: number, trSec: number, options: EventRegressorOptions = {}): EventRegressors {
  if (!Number.isInteger(nt) || nt < 1) fail('INVALID_ARGUMENT', `nt must be a positive integer, got ${nt}`);
  if (!(trSec > 0) || !Number.isFinite(trSec)) fail('INVALID_ARGUMENT', `trSec must be > 0, got ${trSec}`);
  const oversampling = options.oversampling ?? 16;
  if (!Number.isInteger(oversampling) || oversampling < 1 || oversampling > 1000) fail('INVALID_ARGUMENT', `oversampling must be an integer from 1 to 1000, got ${oversampling}`);
  const sampleTimeSec = options.sampleTimeSec ?? trSec / 2;
  if (!(sampleTimeSec >= 0 && sampleTimeSec <= trSec)) fail('INVALID_ARGUMENT', `sampleTimeSec must lie in 0..trSec (${trSec}), got ${sampleTimeSec}`);
  const runSec = nt * trSec;
  const bad = events.map((e, i) => ({ e, i })).filter(({ e }) => !Number.isFinite(e.onsetSec) || !(e.durationSec >= 0) || !Number.isFinite(e.durationSec) || !Number.isFinite(e.modulation));
  if (bad.length > 0) fail('EVENTS_INVALID', `event rows ${bad.slice(0, 5).map(({ i }) => i).join(', ')}${bad.length > 5 ? ', ...' : ''} have a non-finite onset, a negative or non-finite duration or a non-finite modulation`);
  const late = events.map((e, i) => ({ e, i })).filter(({ e }) => e.onsetSec >= runSec);
  if (late.length > 0) {
    fail('EVENTS_BEYOND_RUN', `${late.length} event(s) start at or after the end of the run (${nt} volumes x ${trSec} s = ${runSec} s), first: row ${late[0].i}, onset ${late[0].e.onsetSec} s`, { details: { rows: late.map(({ i }) => i) } });
  }
  const types = [...new Set(events.map((e) => e.trialType))].sort();
  const conditions = options.conditions ? [...options.conditions] : types;
  for (const c of conditions) if (!types.includes(c)) fail('INVALID_ARGUMENT', `condition '${c}' has no events; trial types present: ${types.join(', ') || '(none)'}`);

  const dt = trSec / oversampling;
  const lengthSec = options.hrfLengthSec ?? 32;
  const kernel = hrfKernel({ ...options.hrf, dtSec: dt, lengthSec, normalise: 'peak' });
  const dkernel = options.derivative ? hrfKernel({ ...options.hrf, dtSec: dt, lengthSec, normalise: 'peak', derivative: true }) : null;
  // grid point n is time t0 + n dt; start early enough for events before the run, but no earlier
  // than one kernel length before time 0 (earlier stimulation cannot reach any volume)
  const minOnset = Math.max(-lengthSec, events.reduce((m, e) => Math.min(m, e.onsetSec), 0));
  const n0 = Math.floor(minOnset / dt) - 1;
  const t0 = n0 * dt;
  const ngrid = Math.ceil((runSec - t0) / dt) + 2;

  const names: string[] = [];
  const kinds: Array<'condition' | 'derivative'> = [];
  const columns: Float64Array[] = [];
  for (const cond of conditions) {
    const s = new Float64Array(ngrid);
    for (const e of events) if (e.trialType === cond) addStimulus(s, e, t0, dt);
    columns.push(sampleConvolution(s, kernel, dt, t0, nt, trSec, sampleTimeSec));
    names.push(cond);
    kinds.push('condition');
    if (dkernel) {
      columns.push(sampleConvolution(s, dkernel, dt, t0, nt, trSec, sampleTimeSec));
      names.push(`${cond}_derivative`);
      kinds.push('derivative');
    }
  }
  return { names, kinds, columns };
}

/** Add one event's stimulus (per-second density on the grid) into s. */
function addStimulus(s: Float64Array, e: BoldEvent, t0: number, dt: number): void {
  const u = (e.onsetSec - t0) / dt;
  if (e.durationSec === 0) {
    // unit-area impulse, split between neighbouring grid points so sub-grid onsets shift the response
    const i = Math.floor(u);
    const f = u - i;
    if (i >= 0 && i < s.length) s[i] += (e.modulation * (1 - f)) / dt;
    if (i + 1 >= 0 && i + 1 < s.length) s[i + 1] += (e.modulation * f) / dt;
    return;
  }
  const a = u;
  const b = (e.onsetSec + e.durationSec - t0) / dt;
  // grid point n stands for the cell [n - 1/2, n + 1/2) (in grid units); add the covered fraction
  const first = Math.max(0, Math.floor(a + 0.5));
  const last = Math.min(s.length - 1, Math.ceil(b + 0.5) - 1);
  for (let n = first; n <= last; n++) {
    const cover = Math.min(b, n + 0.5) - Math.max(a, n - 0.5);
    if (cover > 0) s[n] += e.modulation * cover;
  }
}

/** r = (s * k) dt sampled at t*trSec + sampleTimeSec, linear between grid points. */
function sampleConvolution(s: Float64Array, k: Float64Array, dt: number, t0: number, nt: number, trSec: number, sampleTimeSec: number): Float64Array {
  const out = new Float64Array(nt);
  const at = (n: number): number => {
    let acc = 0;
    const lo = Math.max(0, n - k.length + 1);
    for (let m = lo; m <= n && m < s.length; m++) acc += s[m] * k[n - m];
    return acc * dt;
  };
  for (let t = 0; t < nt; t++) {
    const u = (t * trSec + sampleTimeSec - t0) / dt;
    const n = Math.floor(u + 1e-9);
    const f = u - n;
    // grid points land on sample times exactly for the default mid-TR and even oversampling
    out[t] = f > 1e-9 ? (1 - f) * at(n) + f * at(n + 1) : at(n);
  }
  return out;
}
