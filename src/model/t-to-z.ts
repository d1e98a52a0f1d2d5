import erfcinv from '@stdlib/math-base-special-erfcinv';
import tCdf from '@stdlib/stats-base-dists-t-cdf';

/**
 * Largest |z| returned: the normal tail probability at 37.5 is ~5e-309, the smallest positive
 * double, so beyond it the t tail probability underflows and z is clipped here (stays finite so
 * threshold code never sees Infinity).
 */
export const Z_LIMIT = 37.5;

/**
 * The z value with the same tail probability as a t value: z = -Phi^-1(P(T <= -|t|)) with the sign
 * of t. Works through the smaller tail (T is symmetric), so p-values down to ~1e-300 keep their
 * relative precision and z stays accurate far into the tails, where 1 - cdf(t) would round to 0
 * (stdlib t cdf and inverse complementary error function; checked against scipy.stats in the tests).
 * @param t - t statistic
 * @param dof - degrees of freedom (> 0)
 * @returns z, clipped to +-{@link Z_LIMIT}; NaN for NaN input
 * @example tToZ(2, 10) // 1.7907... (t.sf(2,10) = 0.036694017 = norm.sf(1.7907))
 */
export function tToZ(t: number, dof: number): number {
  if (Number.isNaN(t)) return NaN;
  const tail = tCdf(-Math.abs(t), dof);
  // z = Phi^-1(1 - tail) = sqrt(2) erfcinv(2 tail): stdlib's normal quantile goes through erfinv(2p - 1),
  // which loses all precision below p ~ 1e-16, so the complementary function is used directly
  const z = tail > 0 ? Math.SQRT2 * erfcinv(2 * tail) : Z_LIMIT;
  const clipped = Math.min(z, Z_LIMIT);
  return t < 0 ? -clipped : clipped;
}
