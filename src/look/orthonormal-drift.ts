import { fail } from '../core/fail.js';
import { polynomialBasis } from '../model/drift-basis.js';

/**
 * Orthonormal polynomial drift basis: the Legendre columns of {@link polynomialBasis} made exactly
 * orthonormal over the nt sampled points by modified Gram-Schmidt (sampled Legendre polynomials are
 * only nearly orthogonal). Column 0 is the constant 1/sqrt(nt), so every later column sums to 0 and
 * projecting a series on them needs no centring first.
 * With `keep`, the polynomials are evaluated over all nt time points but only the kept ones are
 * returned (and made orthonormal over them), so censored volumes leave gaps without bending the fit.
 * @param nt - number of time points
 * @param order - highest polynomial order (0 = constant only)
 * @param keep - optional sorted indices (0..nt-1) of the time points to keep
 * @returns order + 1 orthonormal columns of length nt (or keep.length)
 * @throws BoldsweepError TOO_FEW_VOLUMES when the kept points are <= order + 1 (no residual degrees of freedom)
 * @example const q = orthonormalDrift(200, 2) // constant, linear, quadratic; q[k]·q[k] = 1
 */
export function orthonormalDrift(nt: number, order: number, keep?: ArrayLike<number>): Float64Array[] {
  if (!Number.isInteger(order) || order < 0) fail('INVALID_ARGUMENT', `detrendOrder must be an integer >= 0, got ${order}`);
  const m = keep ? keep.length : nt;
  if (m <= order + 1) fail('TOO_FEW_VOLUMES', `removing a polynomial drift of order ${order} needs more than ${order + 1} volumes, got ${m}`);
  const full = polynomialBasis(nt, order);
  const cols = full.map((c) => (keep ? Float64Array.from({ length: m }, (_, i) => c[keep[i]]) : Float64Array.from(c)));
  nt = m;
  for (let k = 0; k < cols.length; k++) {
    const c = cols[k];
    for (let j = 0; j < k; j++) {
      const q = cols[j];
      let dot = 0;
      for (let t = 0; t < nt; t++) dot += q[t] * c[t];
      for (let t = 0; t < nt; t++) c[t] -= dot * q[t];
    }
    let norm = 0;
    for (let t = 0; t < nt; t++) norm += c[t] * c[t];
    norm = Math.sqrt(norm);
    for (let t = 0; t < nt; t++) c[t] /= norm;
  }
  return cols;
}

/**
 * Residuals of a series after removing its least-squares fit on an orthonormal basis.
 * @param values - the series (length nt, all finite)
 * @param basis - orthonormal columns of length nt, e.g. from {@link orthonormalDrift}
 * @param out - optional output
 * @returns residuals (values - fit)
 * @example const r = detrendSeries(globalMean, orthonormalDrift(globalMean.length, 2))
 */
export function detrendSeries(values: ArrayLike<number>, basis: readonly Float64Array[], out?: Float64Array): Float64Array {
  const nt = values.length;
  const r = out ?? new Float64Array(nt);
  for (let t = 0; t < nt; t++) r[t] = values[t];
  for (const q of basis) {
    let c = 0;
    for (let t = 0; t < nt; t++) c += q[t] * values[t];
    for (let t = 0; t < nt; t++) r[t] -= c * q[t];
  }
  return r;
}
