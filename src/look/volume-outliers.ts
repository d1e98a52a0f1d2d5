import { fail } from '../core/fail.js';
import { detrendSeries, orthonormalDrift } from './orthonormal-drift.js';
import { robustZ } from './robust-z.js';

/** One volume flagged by {@link volumeOutliers}. */
export interface VolumeOutlier {
  /** Volume index, 0-based. */
  volume: number;
  /** Robust z of DVARS (one-sided: only high values flag). */
  dvarsZ: number;
  /** Robust z of the detrended global mean (two-sided). */
  globalZ: number;
  /** Which measures passed the cutoff. */
  reasons: Array<'dvars-high' | 'global-high' | 'global-low'>;
}

/** Result of {@link volumeOutliers}. */
export interface VolumeOutliers {
  /** Robust z of DVARS per volume; NaN for volumes not assessed (before firstVolume + 1). */
  dvarsZ: Float64Array;
  /** Robust z of the global mean after removing a polynomial drift; NaN before firstVolume. */
  globalZ: Float64Array;
  flagged: VolumeOutlier[];
  cutoffZ: number;
  /** Median and robust SD of DVARS over the assessed volumes (signal units), to score other DVARS values. */
  dvarsMedian: number;
  dvarsScale: number;
}

/**
 * Volumes whose DVARS is unusually high or whose global mean departs from its drift, by robust
 * z-scores (median and 1.4826 x MAD over the assessed volumes). DVARS is one-sided (only sudden
 * change is a problem); the global mean is two-sided after a polynomial drift of `detrendOrder` is
 * removed (slow drift is not an outlier). Volumes before `firstVolume` (the non-steady start) are
 * not assessed, nor is DVARS at `firstVolume` (its difference reaches back into them).
 * @param dvars - DVARS per volume (NaN at 0)
 * @param globalMean - global mean per volume
 * @param options - firstVolume (default 0), cutoffZ (default 5), detrendOrder (default 2)
 * @returns z per volume and the flagged volumes with their reasons
 * @throws BoldsweepError TOO_FEW_VOLUMES when fewer than 5 volumes remain to assess
 * @example volumeOutliers(series.dvars, series.globalMean, { firstVolume: 3 }).flagged
 */
export function volumeOutliers(dvars: ArrayLike<number>, globalMean: ArrayLike<number>, options: { firstVolume?: number; cutoffZ?: number; detrendOrder?: number } = {}): VolumeOutliers {
  const nt = globalMean.length;
  if (dvars.length !== nt) fail('INVALID_ARGUMENT', `dvars and globalMean lengths differ (${dvars.length} vs ${nt})`);
  const first = options.firstVolume ?? 0;
  const cutoffZ = options.cutoffZ ?? 5;
  const order = options.detrendOrder ?? 2;
  if (nt - first - 1 < 5) fail('TOO_FEW_VOLUMES', `volume outliers need at least 5 volumes after the first ${first} dropped, the run has ${nt}`);
  const dvarsZ = new Float64Array(nt).fill(NaN);
  const globalZ = new Float64Array(nt).fill(NaN);
  const d = Float64Array.from({ length: nt - first - 1 }, (_, i) => dvars[first + 1 + i]);
  const dz = robustZ(d);
  dz.z.forEach((z, i) => { dvarsZ[first + 1 + i] = z; });
  const g = Float64Array.from({ length: nt - first }, (_, i) => globalMean[first + i]);
  const gOrder = Math.min(order, g.length - 2);
  const resid = detrendSeries(g, orthonormalDrift(g.length, gOrder));
  robustZ(resid).z.forEach((z, i) => { globalZ[first + i] = z; });
  const flagged: VolumeOutlier[] = [];
  for (let t = first; t < nt; t++) {
    const reasons: VolumeOutlier['reasons'] = [];
    if (dvarsZ[t] > cutoffZ) reasons.push('dvars-high');
    if (globalZ[t] > cutoffZ) reasons.push('global-high');
    if (globalZ[t] < -cutoffZ) reasons.push('global-low');
    if (reasons.length) flagged.push({ volume: t, dvarsZ: dvarsZ[t], globalZ: globalZ[t], reasons });
  }
  return { dvarsZ, globalZ, flagged, cutoffZ, dvarsMedian: dz.median, dvarsScale: dz.scale };
}
