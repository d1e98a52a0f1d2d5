import { thresholdBonferroni } from '../model/threshold-bonferroni.js';
import { thresholdCalibrated } from '../model/threshold-calibrated.js';
import { fail } from '../core/fail.js';
import { thresholdClusterExtent } from '../model/threshold-cluster.js';
import { thresholdFdr } from '../model/threshold-fdr.js';
import type { StatMap } from '../model/threshold-input.js';
import { thresholdRftBonferroni } from '../model/threshold-rft-bonferroni.js';
import type { StatisticKind } from '../model/threshold-statistic.js';
import { thresholdUncorrected } from '../model/threshold-uncorrected.js';
import type { ThresholdRule } from './spec.js';

/**
 * Apply a sweep's threshold rule to a statistic map with the model module's threshold functions.
 * @param map - statistic map (t or z)
 * @param mask - search region (brain mask)
 * @param dims - [nx, ny, nz]
 * @param rule - the spec's rule
 * @param stat - null distribution of the map
 * @param fwhmMm - estimated smoothness per axis (for random-field rules)
 * @param spacingMm - voxel size
 * @param nullMaxima - for 'fwe-calibrated': the maximum statistic of each null design at this setting
 * @returns the rule name, statistic threshold and survivors
 * @example applyThresholdRule(t, brain, [64, 64, 36], { kind: 'fwe-rft', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 }, { kind: 't', dof: 190 }, [8, 8, 8], [3, 3, 3])
 */
export function applyThresholdRule(map: StatMap, mask: Uint8Array, dims: readonly number[], rule: ThresholdRule, stat: StatisticKind, fwhmMm: readonly number[], spacingMm: readonly number[], nullMaxima?: ArrayLike<number>): { rule: string; threshold: number; survivors: Uint8Array } {
  switch (rule.kind) {
    // the lesser of the random-field and Bonferroni values (Nichols & Hayasaka 2003): both hold alpha
    case 'fwe-rft': return thresholdRftBonferroni(map, mask, dims, { alpha: rule.alpha, stat, fwhmMm, spacingMm });
    case 'fwe-calibrated':
      if (!nullMaxima) fail('INVALID_ARGUMENT', 'the fwe-calibrated rule needs the null maxima of this setting');
      return thresholdCalibrated(map, mask, { alpha: rule.alpha, nullMaxima });
    case 'fdr': return thresholdFdr(map, mask, { q: rule.q, stat });
    case 'bonferroni': return thresholdBonferroni(map, mask, { alpha: rule.alpha, stat });
    case 'uncorrected': return thresholdUncorrected(map, mask, { alpha: rule.alpha, stat });
    case 'cluster': return thresholdClusterExtent(map, mask, dims, { alpha: rule.alpha, stat, fwhmMm, spacingMm, formingP: rule.clusterFormingP });
  }
}
