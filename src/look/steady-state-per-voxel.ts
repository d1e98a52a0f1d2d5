import { fail } from '../core/fail.js';
import { selectKth } from './median-of.js';

/** Result of {@link steadyStateFromFirstVolume}. */
export interface PerVoxelSteadyState {
  /** Volumes to drop so that `coverage` of the mask voxels are within `tolerance` of steady state. */
  count: number;
  /** Fraction of voxels needing 0, 1, 2, ... volumes dropped (index = count). */
  fractionNeeding: number[];
  /** Median T1 implied by the first volume's excess, seconds (NaN when no voxel had an excess). */
  medianT1Sec: number;
  tolerance: number;
  coverage: number;
}

/**
 * Steady-state count from the spoiled-gradient-echo approach (Ernst & Anderson 1966), fitted per
 * voxel to the first volume: the first volume's excess over the voxel's steady mean is
 * e1 = M0/M_ss - 1 = E1 (1 - cos a) / (1 - E1), which gives E1 = e1 / (e1 + 1 - cos a), so each voxel's
 * own T1 (grey matter, white matter, CSF or a mixture) follows from the data; volume n then exceeds
 * steady state by e1 q^(n-1) with q = E1 cos a. The count is the number of leading volumes above
 * `tolerance` at the `coverage` quantile of the mask voxels, so slow-relaxing tissue such as CSF
 * counts even where the global mean (dominated by grey and white matter) no longer shows it.
 * @param firstVolume - values of volume 0, NIfTI order
 * @param steadyMean - per-voxel mean over the steady volumes
 * @param mask - voxels to use (nonzero)
 * @param params - trSec, flipAngleDeg; tolerance (default 0.01, the 1 % rule: common practice, no
 *   source); coverage (default 0.99)
 * @returns the count and the implied T1
 * @throws BoldsweepError INVALID_ARGUMENT for a flip angle of 0 or lengths that differ
 * @example steadyStateFromFirstVolume(volumeAt(run, 0), look.maps.mean.data, look.mask.mask, { trSec: 2, flipAngleDeg: 77 }).count
 */
export function steadyStateFromFirstVolume(firstVolume: ArrayLike<number>, steadyMean: ArrayLike<number>, mask: ArrayLike<number>, params: { trSec: number; flipAngleDeg: number; tolerance?: number; coverage?: number }): PerVoxelSteadyState {
  if (firstVolume.length !== steadyMean.length || mask.length !== steadyMean.length) fail('INVALID_ARGUMENT', 'first volume, steady mean and mask must have the same length');
  const cosA = Math.cos((params.flipAngleDeg * Math.PI) / 180);
  if (!(params.flipAngleDeg > 0) || cosA >= 1) fail('INVALID_ARGUMENT', `flipAngleDeg must be > 0, got ${params.flipAngleDeg}`);
  if (!(params.trSec > 0)) fail('INVALID_ARGUMENT', `trSec must be > 0, got ${params.trSec}`);
  const tolerance = params.tolerance ?? 0.01;
  const coverage = params.coverage ?? 0.99;
  // per-voxel counts are small integers: tally them instead of sorting; T1s into a typed array
  const tally: number[] = [0];
  const t1s = new Float64Array(mask.length);
  const got = tallyCounts(firstVolume, steadyMean, mask, params.trSec, cosA, tolerance, tally, t1s);
  const voxels = got[0], nT1 = got[1], maxCount = got[2];
  if (voxels === 0) return { count: 0, fractionNeeding: [1], medianT1Sec: NaN, tolerance, coverage };
  // the count at the coverage quantile: rank round(coverage (N - 1)) of the sorted counts
  const rank = Math.min(voxels - 1, Math.floor(coverage * (voxels - 1) + 0.5));
  let count = 0;
  for (let seen = 0; count <= maxCount; count++) { seen += tally[count]; if (seen > rank) break; }
  const fractionNeeding = tally.slice(0, maxCount + 1).map((k) => k / voxels);
  const medianT1Sec = nT1 ? selectKth(t1s, nT1, nT1 >> 1) : NaN;
  return { count, fractionNeeding, medianT1Sec, tolerance, coverage };
}

/**
 * The per-voxel loop of steadyStateFromFirstVolume: tally[c] += 1 for each usable voxel needing c
 * volumes (the tally grows as needed), the implied T1 of each voxel with an excess into t1s.
 * @returns [voxels, T1 values, largest count]
 */
function tallyCounts(firstVolume: ArrayLike<number>, steadyMean: ArrayLike<number>, mask: ArrayLike<number>, trSec: number, cosA: number, tolerance: number, tally: number[], t1s: Float64Array): [number, number, number] {
  let voxels = 0, nT1 = 0, maxCount = 0;
  for (let v = 0; v < mask.length; v++) {
    if (!mask[v]) continue;
    const m = steadyMean[v], y = firstVolume[v];
    if (!(m > 0) || !Number.isFinite(y)) continue;
    voxels++;
    const e1 = y / m - 1;
    let c = 0;
    if (e1 > tolerance) {
      const E1 = Math.min(0.999999, e1 / (e1 + 1 - cosA));
      t1s[nT1++] = -trSec / Math.log(E1);
      const q = Math.abs(E1 * cosA);
      // leading volumes n = 1, 2, ... with e1 q^(n-1) > tolerance
      c = Math.max(1, q > 0 ? 1 + Math.floor(Math.log(tolerance / e1) / Math.log(q) - 1e-12) : 1);
    }
    while (tally.length <= c) tally.push(0);
    tally[c]++;
    if (c > maxCount) maxCount = c;
  }
  return [voxels, nT1, maxCount];
}
