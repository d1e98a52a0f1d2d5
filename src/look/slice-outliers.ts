import { fail } from '../core/fail.js';
import { detrendSeries, orthonormalDrift } from './orthonormal-drift.js';
import { robustZ } from './robust-z.js';

/** One slice of one volume flagged by {@link sliceOutliers}. */
export interface SliceOutlier {
  slice: number;
  volume: number;
  /** Robust z of the slice mean against the same slice in other volumes. */
  z: number;
  /** The slice's mean in this volume and its typical (drift-fitted) value, signal units. */
  value: number;
  typical: number;
  /** 'dark' (a dropout) or 'bright'. */
  direction: 'dark' | 'bright';
}

/** Result of {@link sliceOutliers}. */
export interface SliceOutliers {
  /** Robust z at [slice * nt + volume]; NaN where not assessed. */
  z: Float64Array;
  flagged: SliceOutlier[];
  /** Volumes where at least half the assessed slices were flagged: a whole-volume event, left to the volume measures. */
  wholeVolumeEvents: number[];
  cutoffZ: number;
}

/**
 * Slice-wise dropouts (and bright slices): each slice's mean over time is detrended (polynomial of
 * `detrendOrder`) and robust-z-scored against that slice's own median and 1.4826 x MAD, so a slice is
 * compared only with itself in other volumes. |z| > cutoffZ flags it. When half or more of the
 * assessed slices flag in the same volume the event is not slice-specific; those flags are
 * removed and the volume is listed in `wholeVolumeEvents`.
 * @param sliceMean - [slice * nt + volume] means (NaN rows are skipped), from maskSeries
 * @param nz - slices
 * @param nt - volumes
 * @param options - firstVolume (default 0), cutoffZ (default 5), detrendOrder (default 2)
 * @returns per-slice z and the flagged slices
 * @throws BoldsweepError TOO_FEW_VOLUMES when fewer than 5 volumes remain
 * @example sliceOutliers(series.sliceMean, 36, 200, { firstVolume: 3 }).flagged
 */
export function sliceOutliers(sliceMean: ArrayLike<number>, nz: number, nt: number, options: { firstVolume?: number; cutoffZ?: number; detrendOrder?: number } = {}): SliceOutliers {
  if (sliceMean.length !== nz * nt) fail('INVALID_ARGUMENT', `sliceMean length ${sliceMean.length} is not ${nz} x ${nt}`);
  const first = options.firstVolume ?? 0;
  const cutoffZ = options.cutoffZ ?? 5;
  const T = nt - first;
  if (T < 5) fail('TOO_FEW_VOLUMES', `slice outliers need at least 5 volumes after the first ${first} dropped, the run has ${nt}`);
  const basis = orthonormalDrift(T, Math.min(options.detrendOrder ?? 2, T - 2));
  const z = new Float64Array(nz * nt).fill(NaN);
  const candidates: SliceOutlier[] = [];
  const assessed: number[] = [];
  const series = new Float64Array(T);
  for (let s = 0; s < nz; s++) {
    let ok = true;
    for (let t = 0; t < T; t++) { series[t] = sliceMean[s * nt + first + t]; if (!Number.isFinite(series[t])) ok = false; }
    if (!ok) continue;
    assessed.push(s);
    const resid = detrendSeries(series, basis);
    const rz = robustZ(resid).z;
    for (let t = 0; t < T; t++) {
      z[s * nt + first + t] = rz[t];
      if (Math.abs(rz[t]) > cutoffZ) {
        const value = series[t];
        candidates.push({ slice: s, volume: first + t, z: rz[t], value, typical: value - resid[t], direction: rz[t] < 0 ? 'dark' : 'bright' });
      }
    }
  }
  const perVolume = new Map<number, number>();
  for (const c of candidates) perVolume.set(c.volume, (perVolume.get(c.volume) ?? 0) + 1);
  const wholeVolumeEvents = [...perVolume].filter(([, k]) => assessed.length > 1 && k >= assessed.length / 2).map(([t]) => t).sort((a, b) => a - b);
  const flagged = candidates.filter((c) => !wholeVolumeEvents.includes(c.volume));
  return { z, flagged, wholeVolumeEvents, cutoffZ };
}
