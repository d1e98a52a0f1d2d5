/**
 * FWHM of a field with Gaussian autocorrelation from the variance of its spatial derivative, for a
 * unit-variance field: FWHM = sqrt(4 ln 2 / lambda) (Kiebel SJ et al. 1999, NeuroImage 10(6):756-766).
 * Units: lambda per unit^2 gives FWHM in that unit.
 * @param lambda - variance of the derivative of the unit-variance field (> 0)
 * @returns FWHM (Infinity for lambda 0)
 * @example fwhmFromDerivativeVariance(4 * Math.LN2 / 64) // 8
 */
export function fwhmFromDerivativeVariance(lambda: number): number {
  return Math.sqrt((4 * Math.LN2) / lambda);
}

/**
 * Lag autocorrelation of a field with Gaussian autocorrelation of a given FWHM:
 * rho(dx) = exp(-2 ln 2 dx^2 / FWHM^2), the inverse of {@link fwhmFromLag1}.
 * @param fwhm - FWHM (same unit as dx)
 * @param dx - lag (voxel size)
 * @returns rho(dx)
 * @example lag1FromFwhm(8, 2) // 0.9170040 (REFERENCES.md §7)
 */
export function lag1FromFwhm(fwhm: number, dx: number): number {
  return Math.exp((-2 * Math.LN2 * dx * dx) / (fwhm * fwhm));
}

/**
 * FWHM from the lag-1 autocorrelation of a field with Gaussian autocorrelation (Forman SD et al. 1995,
 * Magn Reson Med 33(5):636-647): FWHM = dx sqrt(-2 ln 2 / ln rho(dx)), with rho(dx) = 1 - var(dr) /
 * (2 var r) from first differences dr. rho <= 0 (rougher than white noise on this lattice) gives 0;
 * rho >= 1 gives Infinity.
 * @param rho - lag-1 autocorrelation
 * @param dx - lag (voxel size), sets the unit of the result
 * @returns FWHM in the unit of dx
 * @example fwhmFromLag1(0.9170040, 2) // 8.0000
 */
export function fwhmFromLag1(rho: number, dx: number): number {
  if (rho <= 0) return 0;
  if (rho >= 1) return Number.POSITIVE_INFINITY;
  return dx * Math.sqrt((-2 * Math.LN2) / Math.log(rho));
}
