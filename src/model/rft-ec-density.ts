import gammaln from '@stdlib/math-base-special-gammaln';
import { upperTailP, type StatisticKind } from './threshold-statistic.js';

/** Resel counts [R0, R1, R2, R3] of a search region (see reselCounts). */
export type Resels = readonly [number, number, number, number];

/** 4 ln 2: turns FWHM units into the roughness of a Gaussian-smoothed field. */
const L = 4 * Math.LN2;

/**
 * Euler-characteristic densities rho_0..rho_3 of a unit-variance Gaussian (z) or Student t random
 * field, per resel (Worsley KJ et al. 1996, Hum Brain Mapp 4:58-73; formulas from memory, checked against the values in REFERENCES.md §8). With L = 4 ln 2:
 *
 * z:  rho0 = 1 - Phi(u);  rho1 = sqrt(L) e^{-u^2/2} / (2 pi);  rho2 = L u e^{-u^2/2} / (2 pi)^{3/2};
 *     rho3 = L^{3/2} (u^2 - 1) e^{-u^2/2} / (2 pi)^2.
 *
 * t (nu dof), with g = (1 + u^2/nu)^{-(nu-1)/2}:  rho0 = P(T >= u);  rho1 = sqrt(L) g / (2 pi);
 *     rho2 = L u g Gamma((nu+1)/2) / ((nu/2)^{1/2} Gamma(nu/2)) / (2 pi)^{3/2};
 *     rho3 = L^{3/2} ((nu-1) u^2/nu - 1) g / (2 pi)^2.
 * The t forms tend to the z forms as nu grows.
 * @param u - threshold on the statistic
 * @param stat - field kind
 * @param out - optional length-4 output
 * @returns [rho0, rho1, rho2, rho3]
 * @example ecDensities(4, { kind: 'z' }) // [3.167124e-5, 8.890107e-5, 2.362217e-4, 5.884422e-4]
 */
export function ecDensities(u: number, stat: StatisticKind, out: Float64Array = new Float64Array(4)): Float64Array {
  const rho0 = upperTailP(u, stat);
  if (stat.kind === 'z') {
    const e = Math.exp(-0.5 * u * u);
    out[0] = rho0;
    out[1] = (Math.sqrt(L) * e) / (2 * Math.PI);
    out[2] = (L * u * e) / Math.pow(2 * Math.PI, 1.5);
    out[3] = (Math.pow(L, 1.5) * (u * u - 1) * e) / (4 * Math.PI * Math.PI);
    return out;
  }
  const nu = stat.dof;
  const g = Math.exp((-(nu - 1) / 2) * Math.log1p((u * u) / nu));
  const gammaRatio = Math.exp(gammaln((nu + 1) / 2) - gammaln(nu / 2)) / Math.sqrt(nu / 2);
  out[0] = rho0;
  out[1] = (Math.sqrt(L) * g) / (2 * Math.PI);
  out[2] = (L * u * g * gammaRatio) / Math.pow(2 * Math.PI, 1.5);
  out[3] = (Math.pow(L, 1.5) * (((nu - 1) * u * u) / nu - 1) * g) / (4 * Math.PI * Math.PI);
  return out;
}

/**
 * Expected Euler characteristic of the excursion set above u: E[EC] = sum_d R_d rho_d(u). At high
 * thresholds it approximates the family-wise probability P(max > u) (Worsley et al. 1996).
 * @param u - threshold on the statistic
 * @param resels - [R0, R1, R2, R3] of the search region
 * @param stat - field kind
 * @returns E[EC]
 * @example expectedEulerCharacteristic(4.64345, [0, 0, 0, 1000], { kind: 'z' }) // 0.05
 */
export function expectedEulerCharacteristic(u: number, resels: Resels, stat: StatisticKind): number {
  const rho = ecDensities(u, stat);
  return resels[0] * rho[0] + resels[1] * rho[1] + resels[2] * rho[2] + resels[3] * rho[3];
}
