import { fail } from '../core/fail.js';
import type { PlantTruth } from '../plant/plant-activations.js';

/** Result of {@link effectBias}; all effects in percent signal change (at the time-course peak). */
export interface EffectBias {
  /** Mean estimated effect over truth voxels (%). */
  estimatedPct: number;
  /** Mean planted effect over the same voxels: amplitudePct * profile (%). */
  plantedPct: number;
  /** estimatedPct - plantedPct (%); negative = the pipeline shrinks the effect. */
  biasPct: number;
  /** estimatedPct / plantedPct (1 = unbiased). */
  ratio: number;
  /** Mean over blobs of the estimated effect at the centre voxel (%). */
  centreEstimatedPct: number;
  /** centreEstimatedPct - amplitudePct (%): shrinkage of the peak (smoothing lowers it). */
  centreBiasPct: number;
}

/**
 * Compare an estimated effect map with what was planted.
 * @param effectPct - per-voxel estimated effect in percent signal change at the regressor peak
 *   (e.g. 100 * beta * regressor peak / baseline)
 * @param truth - ground truth from plantActivations
 * @param within - optional region; truth voxels outside it are skipped
 * @returns mean estimated vs planted effect over truth voxels, and at the centres
 * @throws BoldsweepError INVALID_ARGUMENT on length mismatch or no truth voxels
 * @example effectBias(psc, truth, brainMask).biasPct
 */
export function effectBias(effectPct: ArrayLike<number>, truth: PlantTruth, within?: ArrayLike<number>): EffectBias {
  const n = truth.mask.length;
  if (effectPct.length !== n || (within && within.length !== n)) fail('INVALID_ARGUMENT', `effect map length ${effectPct.length} does not match the truth (${n} voxels)`);
  let est = 0, planted = 0, count = 0;
  for (let v = 0; v < n; v++) {
    if (!truth.mask[v] || (within && !within[v])) continue;
    est += effectPct[v];
    planted += truth.amplitudePct * truth.profile[v];
    count++;
  }
  if (count === 0) fail('INVALID_ARGUMENT', 'no truth voxels inside the region: the effect cannot be compared');
  const [nx, ny] = truth.dims;
  let centre = 0;
  for (const [i, j, k] of truth.centresVoxel) centre += effectPct[i + nx * (j + ny * k)];
  centre /= truth.centresVoxel.length;
  const estimatedPct = est / count, plantedPct = planted / count;
  return { estimatedPct, plantedPct, biasPct: estimatedPct - plantedPct, ratio: estimatedPct / plantedPct, centreEstimatedPct: centre, centreBiasPct: centre - truth.amplitudePct };
}
