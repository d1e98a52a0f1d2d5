import { fail } from '../core/fail.js';
import type { BoldEvent } from '../io/run-types.js';
import { hrfValues } from '../model/hrf.js';

/**
 * The expected BOLD response to a set of events, at arbitrary times: the events' boxcar (height =
 * modulation) sampled every `dtSec`, convolved with the Glover (1999) HRF (src/model/hrf.ts) scaled
 * to unit sum (so a sustained block reaches a plateau of 1), and read at each requested time by linear interpolation.
 * @param events - onsets and durations, seconds
 * @param timesSec - times to read the response at (e.g. each slice's acquisition time), seconds
 * @param dtSec - fine time step of the convolution, seconds. __Default value:__ 0.05
 * @returns response at each time (0 at rest, 1 on a long block's plateau)
 * @example blockResponseAt(events, [0, 2, 4]) // Float64Array of 3 values
 */
export function blockResponseAt(events: readonly BoldEvent[], timesSec: ArrayLike<number>, dtSec = 0.05): Float64Array {
  if (!(dtSec > 0)) fail('INVALID_ARGUMENT', `dtSec must be positive, got ${dtSec}`);
  let tMax = 0;
  for (let i = 0; i < timesSec.length; i++) tMax = Math.max(tMax, timesSec[i]);
  const n = Math.ceil(tMax / dtSec) + 2;
  const box = new Float64Array(n);
  for (const e of events) {
    // each fine sample is the boxcar's average over [t, t + dt): exact area for any onset
    const a = e.onsetSec / dtSec;
    const b = (e.onsetSec + e.durationSec) / dtSec;
    for (let s = Math.max(0, Math.floor(a)); s < Math.min(n, Math.ceil(b)); s++) {
      box[s] += e.modulation * (Math.min(b, s + 1) - Math.max(a, s));
    }
  }
  // fine sample s holds the input over [s dt, (s+1) dt), centred at (s + 1/2) dt, so its effect u
  // steps later is h((u - 1/2) dt); the kernel spans 32 s and is scaled to unit sum
  const nKernel = Math.ceil(32 / dtSec) + 1;
  const h = hrfValues(Float64Array.from({ length: nKernel }, (_, u) => (u - 0.5) * dtSec), { shape: 'glover' });
  let hSum = 0;
  for (let u = 0; u < nKernel; u++) hSum += h[u];
  for (let u = 0; u < nKernel; u++) h[u] /= hSum;
  const resp = new Float64Array(n);
  for (let s = 0; s < n; s++) {
    if (box[s] === 0) continue;
    for (let u = 0; u < h.length && s + u < n; u++) resp[s + u] += box[s] * h[u];
  }
  const out = new Float64Array(timesSec.length);
  for (let i = 0; i < timesSec.length; i++) {
    const x = timesSec[i] / dtSec;
    const s = Math.floor(x);
    const f = x - s;
    out[i] = s < 0 ? 0 : resp[s] + f * ((resp[s + 1] ?? resp[s]) - resp[s]);
  }
  return out;
}
