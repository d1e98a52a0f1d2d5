import gammaln from '@stdlib/math-base-special-gammaln';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import tCdf from '@stdlib/stats-base-dists-t-cdf';
import tQuantile from '@stdlib/stats-base-dists-t-quantile';
import { fail } from '../core/fail.js';

/**
 * Which null distribution a statistic map has: standard normal (`z`) or Student t with `dof`
 * degrees of freedom (`t`). Every threshold rule takes one, so a t map is never read as a z map.
 */
export type StatisticKind = { kind: 'z' } | { kind: 't'; dof: number };

/**
 * Check a {@link StatisticKind} and return it.
 * @param stat - the statistic kind
 * @returns the same object
 * @throws BoldsweepError INVALID_ARGUMENT for an unknown kind or dof not finite and > 0
 * @example checkStatisticKind({ kind: 't', dof: 20 })
 */
export function checkStatisticKind(stat: StatisticKind): StatisticKind {
  if (stat === null || typeof stat !== 'object' || (stat.kind !== 'z' && stat.kind !== 't')) {
    fail('INVALID_ARGUMENT', `stat must be { kind: 'z' } or { kind: 't', dof }, got ${JSON.stringify(stat)}`);
  }
  if (stat.kind === 't' && !(stat.dof > 0 && Number.isFinite(stat.dof))) fail('INVALID_ARGUMENT', `t statistic dof must be finite and > 0, got ${stat.dof}`);
  return stat;
}

/**
 * Upper-tail probability P(S >= value) under the null. Computed as cdf(-value) (both distributions
 * are symmetric) so tiny p-values keep their relative precision instead of rounding 1 - cdf to 0.
 * @param value - statistic value
 * @param stat - null distribution
 * @returns one-sided p-value in [0, 1]
 * @example upperTailP(1.6448536, { kind: 'z' }) // 0.05
 */
export function upperTailP(value: number, stat: StatisticKind): number {
  return stat.kind === 'z' ? normalCdf(-value, 0, 1) : tCdf(-value, stat.dof);
}

/**
 * Upper-tail critical value: the c with P(S >= c) = p, as -quantile(p) for precision at small p.
 * @param p - upper-tail probability in (0, 1)
 * @param stat - null distribution
 * @returns the critical value
 * @example upperCriticalValue(0.05, { kind: 'z' }) // 1.6448536 (scipy norm.isf(.05))
 */
export function upperCriticalValue(p: number, stat: StatisticKind): number {
  let u = stat.kind === 'z' ? -normalQuantile(p, 0, 1) : -tQuantile(p, stat.dof);
  // stdlib's quantiles lose digits far in the tail (the normal one goes through erfinv(2p - 1): 4e-7
  // relative at p = 1e-12; the t one 2e-9 at p = 1e-6). Two Newton steps on P(S >= u) = p, whose tail
  // upperTailP computes to full precision, restore them; Newton converges quadratically from that close.
  for (let i = 0; i < 2 && Number.isFinite(u) && p > 0 && p < 1; i++) {
    const density = nullDensity(u, stat);
    if (density > 0) u += (upperTailP(u, stat) - p) / density;
  }
  return u;
}

/** Null probability density at u (standard normal, or Student t with stat.dof). */
function nullDensity(u: number, stat: StatisticKind): number {
  if (stat.kind === 'z') return Math.exp(-0.5 * u * u) / Math.sqrt(2 * Math.PI);
  const nu = stat.dof;
  return Math.exp(gammaln((nu + 1) / 2) - gammaln(nu / 2) - 0.5 * Math.log(nu * Math.PI) - ((nu + 1) / 2) * Math.log1p((u * u) / nu));
}
