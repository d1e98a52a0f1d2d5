import { fail } from '../core/fail.js';

/**
 * Null expectation of DVARS^2 for a run without artefacts (Afyouni S & Nichols TE 2018 NeuroImage
 * 172:291-312): E[DVARS^2] = (1/I) sum_i 2 sigma_i^2 (1 - rho_i), the mean over the I mask voxels of
 * the variance of a difference of two neighbouring time points of a stationary series with
 * variance sigma_i^2 and lag-1 autocorrelation rho_i.
 * @param sd - per-voxel temporal SD (sigma_i)
 * @param lag1 - per-voxel lag-1 autocorrelation (rho_i)
 * @param mask - optional: only voxels with mask[i] != 0 (and finite values) count
 * @returns E[DVARS^2] in squared signal units
 * @throws BoldsweepError INVALID_ARGUMENT for mismatched lengths; CONSTANT_DATA when no voxel varies
 * @example dvarsNullExpectation([10, 20], [0.5, 0.8]) // 130
 */
export function dvarsNullExpectation(sd: ArrayLike<number>, lag1: ArrayLike<number>, mask?: ArrayLike<number>): number {
  if (sd.length !== lag1.length) fail('INVALID_ARGUMENT', `sd and lag1 lengths differ (${sd.length} vs ${lag1.length})`);
  const acc = new Float64Array(2);
  sumNullTerms(sd, lag1, mask, acc);
  const sum = acc[0], count = acc[1];
  if (count === 0 || !(sum > 0)) fail('CONSTANT_DATA', 'no voxel in the mask varies over time, so DVARS has no null expectation');
  return sum / count;
}

/** acc = [sum of 2 sd^2 (1 - lag1), count] over the finite voxels in the mask (a small function V8 optimises once). */
function sumNullTerms(sd: ArrayLike<number>, lag1: ArrayLike<number>, mask: ArrayLike<number> | undefined, acc: Float64Array): void {
  let sum = 0, count = 0;
  for (let i = 0; i < sd.length; i++) {
    if (mask && !mask[i]) continue;
    const s = sd[i], r = lag1[i];
    if (!Number.isFinite(s) || !Number.isFinite(r)) continue;
    sum += 2 * s * s * (1 - r);
    count++;
  }
  acc[0] = sum; acc[1] = count;
}

/**
 * Standardised DVARS: DVARS_t / sqrt(E[DVARS^2]) (Afyouni & Nichols 2018's relative DVARS), about
 * 1 for volumes without artefacts whatever the run's noise level.
 * @param dvars - DVARS per volume (signal units; NaN allowed)
 * @param nullExpectation - E[DVARS^2] from {@link dvarsNullExpectation}
 * @returns standardised DVARS per volume (dimensionless)
 * @example standardisedDvars([NaN, 17.1], 130)[1] // 1.49977
 */
export function standardisedDvars(dvars: ArrayLike<number>, nullExpectation: number): Float64Array {
  if (!(nullExpectation > 0)) fail('INVALID_ARGUMENT', `nullExpectation must be > 0, got ${nullExpectation}`);
  const s = Math.sqrt(nullExpectation);
  const out = new Float64Array(dvars.length);
  for (let t = 0; t < dvars.length; t++) out[t] = dvars[t] / s;
  return out;
}
