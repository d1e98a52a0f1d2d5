import { fail } from '../core/fail.js';

/** How far censoring reaches around a volume flagged by framewise displacement. */
export interface FdCensorReach {
  /** Volumes before each flagged one also censored. __Default value:__ 0 */
  before?: number;
  /** Volumes after each flagged one also censored. __Default value:__ 0 */
  after?: number;
}

/**
 * Volumes to censor by framewise displacement: those whose FD is above `thresholdMm` (strictly), i.e.
 * the volume acquired after a movement larger than the threshold, and optionally `before` volumes
 * before and `after` volumes after each of them (a movement's spin-history and interpolation effects
 * outlast the volume it happened in; Power et al. 2014, NeuroImage 84:320-341, censored one volume
 * before and two after [memory]). Neighbours outside the run are left out.
 * @param fdMm - framewise displacement per volume, mm (framewiseDisplacement)
 * @param thresholdMm - e.g. 0.5 (FD_CENSOR_THRESHOLD_MM)
 * @param reach - neighbours censored with each flagged volume (default none)
 * @returns 0-based volume indices, ascending, each once
 * @throws BoldsweepError INVALID_ARGUMENT for a threshold that is not a positive number, or a reach that is not a whole number 0-10
 * @example fdCensorVolumes(framewiseDisplacement(table), 0.5) // [41, 97]
 * @example fdCensorVolumes(framewiseDisplacement(table), 0.5, { before: 1, after: 2 }) // [40, 41, 42, 43, 96, 97, 98, 99]
 */
export function fdCensorVolumes(fdMm: ArrayLike<number>, thresholdMm: number, reach: FdCensorReach = {}): number[] {
  if (!(thresholdMm > 0) || !Number.isFinite(thresholdMm)) fail('INVALID_ARGUMENT', `the FD censoring threshold must be a positive number of mm, got ${thresholdMm}`);
  const before = reach.before ?? 0;
  const after = reach.after ?? 0;
  for (const [name, v] of [['before', before], ['after', after]] as const) {
    if (!Number.isInteger(v) || v < 0 || v > 10) fail('INVALID_ARGUMENT', `volumes censored ${name} a flagged one must be a whole number from 0 to 10, got ${v}`);
  }
  const censored = new Uint8Array(fdMm.length);
  for (let t = 0; t < fdMm.length; t++) {
    if (!(fdMm[t] > thresholdMm)) continue;
    const last = Math.min(fdMm.length - 1, t + after);
    for (let u = Math.max(0, t - before); u <= last; u++) censored[u] = 1;
  }
  const out: number[] = [];
  for (let t = 0; t < censored.length; t++) if (censored[t]) out.push(t);
  return out;
}
