/**
 * What every threshold rule returns: the rule's name, the cut-off on the statistic, which voxels
 * survive (in-mask voxels with statistic >= threshold; for cluster rules also in a large enough
 * cluster) and the numbers behind the cut-off.
 */
export interface ThresholdResult<D> {
  /** Rule identifier: 'uncorrected', 'bonferroni', 'fdr-bh', 'rft-fwe', 'rft-bonferroni-fwe', 'calibrated-fwe' or 'cluster-fwe'. */
  rule: string;
  /** Cut-off on the statistic (one-sided, positive tail); Infinity when no value could survive. */
  threshold: number;
  /** 1 for surviving voxels, 0 elsewhere; same length as the map. */
  survivors: Uint8Array;
  /** Rule-specific numbers (alpha, counts, resels, ...). */
  details: D;
}

/**
 * Mark in-mask voxels whose statistic is at or above a threshold.
 * @param map - statistic values
 * @param mask - nonzero = inside
 * @param threshold - cut-off (Infinity marks nothing)
 * @returns survivors (1/0) and how many there are
 * @example const { survivors, count } = survivorsAtOrAbove(z, mask, 3.1)
 */
export function survivorsAtOrAbove(map: ArrayLike<number>, mask: ArrayLike<number>, threshold: number): { survivors: Uint8Array; count: number } {
  const survivors = new Uint8Array(map.length);
  let count = 0;
  for (let i = 0; i < map.length; i++) {
    if (mask[i] && map[i] >= threshold) { survivors[i] = 1; count++; }
  }
  return { survivors, count };
}
