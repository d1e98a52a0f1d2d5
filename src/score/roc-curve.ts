import { fail } from '../core/fail.js';

/** A receiver operating characteristic: detection rates as the threshold falls. */
export interface RocCurve {
  /**
   * Thresholds, descending; point i counts a voxel as detected when its statistic >= thresholds[i].
   * The first point (+Infinity) is (0, 0) and the last (-Infinity) is (1, 1).
   */
  thresholds: Float64Array;
  /** True-positive rate (fraction of positive voxels detected) at each threshold. */
  tpr: Float64Array;
  /** False-positive rate (fraction of negative voxels detected) at each threshold. */
  fpr: Float64Array;
  /** Number of positive (truth) voxels counted. */
  positives: number;
  /** Number of negative voxels counted. */
  negatives: number;
}

/**
 * Voxelwise ROC curve of a statistic map against a truth mask. With no `thresholds` every distinct
 * statistic value is a threshold, so the curve is exact and its trapezoid area equals the
 * Mann-Whitney U / (n1 n2) with ties counted one half (Hanley JA & McNeil BJ 1982, Radiology
 * 143:29-36). NaN statistics count as never detected (-Infinity).
 * @param statistic - per-voxel statistic (larger = more evidence of activation)
 * @param truth - per-voxel truth, nonzero = positive
 * @param within - optional region (e.g. brain mask); voxels outside are ignored
 * @param thresholds - omitted: every distinct value; a number n: n thresholds evenly spaced from the
 *   largest to the smallest finite statistic; an array: those thresholds
 * @returns the curve
 * @throws BoldsweepError INVALID_ARGUMENT on length mismatch, no positives or no negatives, or bad thresholds
 * @example const roc = rocCurve(zMap.data, truth.mask, brainMask)
 */
export function rocCurve(statistic: ArrayLike<number>, truth: ArrayLike<number>, within?: ArrayLike<number>, thresholds?: number | ArrayLike<number>): RocCurve {
  const n = statistic.length;
  if (truth.length !== n || (within && within.length !== n)) fail('INVALID_ARGUMENT', `statistic, truth and region must have the same length, got ${n}, ${truth.length}${within ? `, ${within.length}` : ''}`);
  let np = 0, nn = 0;
  for (let v = 0; v < n; v++) if (!within || within[v]) { if (truth[v]) np++; else nn++; }
  if (np === 0 || nn === 0) fail('INVALID_ARGUMENT', `an ROC curve needs positive and negative voxels, got ${np} positive and ${nn} negative`);
  const pos = new Float64Array(np), neg = new Float64Array(nn);
  for (let v = 0, ip = 0, ineg = 0; v < n; v++) {
    if (within && !within[v]) continue;
    const s = Number.isNaN(statistic[v]) ? -Infinity : statistic[v];
    if (truth[v]) pos[ip++] = s; else neg[ineg++] = s;
  }
  // descending order; counting "how many >= t" is then a scan or a binary search
  pos.sort().reverse();
  neg.sort().reverse();
  const ths: number[] = [Infinity];
  if (thresholds === undefined) {
    let i = 0, j = 0;
    while (i < np || j < nn) {
      const t = Math.max(i < np ? pos[i] : -Infinity, j < nn ? neg[j] : -Infinity);
      if (t === -Infinity) break;
      ths.push(t);
      while (i < np && pos[i] === t) i++;
      while (j < nn && neg[j] === t) j++;
    }
  } else if (typeof thresholds === 'number') {
    if (!Number.isInteger(thresholds) || thresholds < 2) fail('INVALID_ARGUMENT', `number of ROC thresholds must be an integer >= 2, got ${thresholds}`);
    let hi = -Infinity, lo = Infinity;
    for (const a of [pos, neg]) for (const s of a) if (Number.isFinite(s)) { if (s > hi) hi = s; if (s < lo) lo = s; }
    if (hi >= lo) for (let k = 0; k < thresholds; k++) ths.push(hi - ((hi - lo) * k) / (thresholds - 1));
  } else {
    const given = Array.from(thresholds);
    if (given.some((t) => Number.isNaN(t))) fail('INVALID_ARGUMENT', 'ROC thresholds must not be NaN');
    ths.push(...given.filter((t) => t !== Infinity && t !== -Infinity).sort((a, b) => b - a));
  }
  ths.push(-Infinity);
  const m = ths.length;
  const out: RocCurve = { thresholds: Float64Array.from(ths), tpr: new Float64Array(m), fpr: new Float64Array(m), positives: np, negatives: nn };
  for (let k = 0; k < m; k++) {
    out.tpr[k] = countAtLeast(pos, ths[k]) / np;
    out.fpr[k] = countAtLeast(neg, ths[k]) / nn;
  }
  return out;
}

/** Number of entries >= t in a descending array (binary search). -Infinity counts everything. */
function countAtLeast(desc: Float64Array, t: number): number {
  if (t === -Infinity) return desc.length;
  let lo = 0, hi = desc.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (desc[mid] >= t) lo = mid + 1; else hi = mid;
  }
  return lo;
}
