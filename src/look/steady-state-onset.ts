import { fail } from '../core/fail.js';
import { MAD_TO_SD } from './robust-z.js';
import { medianOf } from './median-of.js';

/** Result of {@link steadyStateOnset}. */
export interface SteadyStateOnset {
  /** Number of leading volumes brighter than the steady state by more than `cutoffZ` robust SDs. */
  count: number;
  /** Per volume: (global mean - extrapolated steady level) / robust SD (dimensionless). */
  z: Float64Array;
  /** Steady level per volume: the robust (Theil-Sen) line fitted to the reference window (signal units). */
  level: Float64Array;
  /** Robust SD of the global mean about that trend in the reference window (signal units). */
  scale: number;
  /** Reference window [from, to) of volumes. */
  reference: [number, number];
  /** The cutoff used. */
  cutoffZ: number;
  /** True when the count reached the start of the reference window (the window may not be steady). */
  reachedReference: boolean;
}

/**
 * Steady-state onset from the global signal: fit a robust straight line (drift) to a reference window of
 * later volumes, take the robust SD (1.4826 x MAD) of the global mean about it, extrapolate the line
 * back to the start, and count the leading volumes that lie more than `cutoffZ` robust SDs ABOVE it
 * (one-sided: before steady state the longitudinal magnetisation is larger, so early volumes are
 * brighter). Counting stops at the first volume within the band.
 * @param globalMean - mean signal in the brain per volume
 * @param options - cutoffZ (default 5); referenceFrom: first volume of the window (default
 *   clamp(ceil(nt/10), 5, 30)); referenceLength (default max(20, ceil(nt/3)), clipped to the run)
 * @returns the count and its evidence
 * @throws BoldsweepError TOO_FEW_VOLUMES when the window would hold fewer than 5 volumes
 * @example steadyStateOnset(series.globalMean).count // e.g. 3
 */
export function steadyStateOnset(globalMean: ArrayLike<number>, options: { cutoffZ?: number; referenceFrom?: number; referenceLength?: number } = {}): SteadyStateOnset {
  const nt = globalMean.length;
  const cutoffZ = options.cutoffZ ?? 5;
  const from = options.referenceFrom ?? Math.min(30, Math.max(5, Math.ceil(nt / 10)));
  const to = Math.min(nt, from + (options.referenceLength ?? Math.max(20, Math.ceil(nt / 3))));
  if (to - from < 5) fail('TOO_FEW_VOLUMES', `steady-state detection needs a reference window of at least 5 volumes after volume ${from}, the run has ${nt} volumes`);
  // robust line over the window (Theil H 1950 Proc K Ned Akad Wet 53; Sen PK 1968 J Am Stat Assoc
  // 63:1379): slope = median of pairwise slopes, intercept = median of y - slope t. A least-squares
  // line would be pulled by an outlier volume inside the window and inflate the scale below.
  const w = to - from;
  const slopes = new Float64Array((w * (w - 1)) / 2);
  for (let i = from, k = 0; i < to; i++) for (let j = i + 1; j < to; j++) slopes[k++] = (globalMean[j] - globalMean[i]) / (j - i);
  const slope = medianOf(slopes);
  const offsets = new Float64Array(w);
  for (let t = from; t < to; t++) offsets[t - from] = globalMean[t] - slope * t;
  const intercept = medianOf(offsets);
  const level = new Float64Array(nt);
  for (let t = 0; t < nt; t++) level[t] = intercept + slope * t;
  const resid = new Float64Array(to - from);
  for (let t = from; t < to; t++) resid[t - from] = Math.abs(globalMean[t] - level[t]);
  let scale = MAD_TO_SD * medianOf(resid);
  if (!(scale > 0)) {
    // more than half the window sits exactly on the line (e.g. synthetic, noiseless data): fall back
    // to a tiny relative scale so only real departures count, and never divide by zero
    scale = Math.max(1e-12, 1e-9 * Math.abs(intercept));
  }
  const z = new Float64Array(nt);
  for (let t = 0; t < nt; t++) z[t] = (globalMean[t] - level[t]) / scale;
  let count = 0;
  while (count < from && z[count] > cutoffZ) count++;
  return { count, z, level, scale, reference: [from, to], cutoffZ, reachedReference: count === from };
}
