/** The floor (nothing detected, or chance) and the ceiling (everything detected) of a detection metric. */
export interface MetricBounds {
  floor: number;
  ceiling: number;
}

/**
 * Where a detection metric bottoms out and tops out, so a choice can tell "nothing was detected" and
 * "everything was detected" from a real difference between settings. The ROC area's floor is 0.5,
 * the area of a statistic that ranks planted and other voxels at random (Hanley JA & McNeil BJ 1982,
 * Radiology 143:29-36); rates and overlaps run from 0 to 1.
 * @param metric - a scorecard column
 * @returns the bounds, or null for a metric without a natural floor and ceiling (a statistic, a count)
 * @example metricBounds('hitRate') // { floor: 0, ceiling: 1 }
 */
export function metricBounds(metric: string): MetricBounds | null {
  if (metric === 'rocAuc') return { floor: 0.5, ceiling: 1 };
  if (metric === 'hitRate' || metric === 'blobHitRate' || metric === 'dice') return { floor: 0, ceiling: 1 };
  return null;
}

/**
 * How close (as a fraction of the metric's range) a mean must come to the floor or ceiling to count
 * as at it: 2 % of the range is a hit rate under 0.02 or over 0.98, closer than a few repeats can
 * separate two settings.
 */
export const EDGE_FRACTION = 0.02;
