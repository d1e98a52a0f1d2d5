import { fail } from '../core/fail.js';
import type { RocCurve } from './roc-curve.js';

/**
 * Area under an ROC curve by the trapezoid rule over its points (false-positive rate on x,
 * true-positive rate on y). 1 = perfect separation, 0.5 = no better than chance.
 * @param curve - points in threshold order (as {@link rocCurve} returns them, from (0,0) to (1,1))
 * @returns the area in [0, 1]
 * @throws BoldsweepError INVALID_ARGUMENT when tpr and fpr differ in length or have fewer than 2 points
 * @example rocArea(rocCurve(z, truth.mask, brain)) // 0.93
 */
export function rocArea(curve: Pick<RocCurve, 'tpr' | 'fpr'>): number {
  const { tpr, fpr } = curve;
  if (tpr.length !== fpr.length || tpr.length < 2) fail('INVALID_ARGUMENT', `an ROC curve needs matching tpr and fpr with at least 2 points, got ${tpr.length} and ${fpr.length}`);
  let area = 0;
  for (let k = 1; k < tpr.length; k++) area += ((fpr[k] - fpr[k - 1]) * (tpr[k] + tpr[k - 1])) / 2;
  return area;
}
