import { fdrBhAdjust, fdrBhCutoff } from './fdr-bh.js';
import { checkMapAndMask, checkOpenUnit, type StatMap } from './threshold-input.js';
import type { ThresholdResult } from './threshold-result.js';
import { checkStatisticKind, upperTailP, type StatisticKind } from './threshold-statistic.js';

/** Options of {@link thresholdFdr}. */
export interface FdrOptions {
  /** False discovery rate in (0, 1). */
  q: number;
  /** Null distribution of the map. */
  stat: StatisticKind;
}

/** Details of an FDR threshold. */
export interface FdrDetails {
  q: number;
  /** In-mask voxels tested (m). */
  voxels: number;
  /** Number of discoveries by the step-up rule (k). */
  k: number;
  /** p_(k), or null when nothing survives. */
  pCutoff: number | null;
  /** Benjamini-Hochberg adjusted p-value per voxel (NaN outside the mask). */
  adjustedP: Float64Array;
  survivorCount: number;
}

/**
 * Benjamini-Hochberg FDR threshold over the in-mask voxels (one-sided p-values from the positive
 * tail; Genovese CR, Lazar NA & Nichols T 2002 NeuroImage 15:870-878 brought the rule to imaging).
 * The threshold is the statistic of the k-th smallest p-value, so survivors are exactly the in-mask
 * voxels at or above it; Infinity when nothing survives.
 * @param map - statistic map
 * @param mask - nonzero = search region; same length as the map
 * @param options - q and statistic kind
 * @returns rule 'fdr-bh', the statistic cut-off, survivors, k and adjusted p-values
 * @throws BoldsweepError INVALID_ARGUMENT (q outside (0, 1), bad stat, empty mask), GRID_MISMATCH, NON_FINITE_VOXELS
 * @example thresholdFdr(z, mask, { q: 0.05, stat: { kind: 'z' } }).details.k
 */
export function thresholdFdr(map: StatMap, mask: ArrayLike<number>, options: FdrOptions): ThresholdResult<FdrDetails> {
  checkOpenUnit('q', options.q);
  checkStatisticKind(options.stat);
  const m = checkMapAndMask(map, mask);
  const index = new Uint32Array(m);
  const p = new Float64Array(m);
  for (let i = 0, j = 0; i < map.length; i++) {
    if (!mask[i]) continue;
    index[j] = i;
    p[j++] = upperTailP(map[i], options.stat);
  }
  const { k, pCutoff } = fdrBhCutoff(p, options.q);
  const adjustedInMask = fdrBhAdjust(p);
  const adjustedP = new Float64Array(map.length).fill(Number.NaN);
  const survivors = new Uint8Array(map.length);
  let threshold = Number.POSITIVE_INFINITY, count = 0;
  for (let j = 0; j < m; j++) {
    adjustedP[index[j]] = adjustedInMask[j];
    if (pCutoff !== null && p[j] <= pCutoff) {
      survivors[index[j]] = 1;
      count++;
      threshold = Math.min(threshold, map[index[j]]);
    }
  }
  return { rule: 'fdr-bh', threshold, survivors, details: { q: options.q, voxels: m, k, pCutoff, adjustedP, survivorCount: count } };
}
