import { fail } from '../core/fail.js';
import type { DesignMatrix } from './design-matrix.js';
import { svdJacobi } from './svd-jacobi.js';

/**
 * Raw lag-1 autocorrelation of residuals, rho = sum_t r_t r_{t-1} / sum_t r_t^2 (Bullmore E et al.
 * 1996, Magn Reson Med 35:261-277). Biased towards negative values for OLS residuals; see
 * {@link correctAr1}.
 * @param r - residual series
 * @returns the estimate (0 for an all-zero series)
 * @example lag1Autocorrelation([1, -0.5, 0.25, 0.75, -1, -0.5]) // -0.22
 */
export function lag1Autocorrelation(r: ArrayLike<number>): number {
  let a0 = 0;
  let a1 = 0;
  for (let t = 0; t < r.length; t++) {
    a0 += r[t] * r[t];
    if (t > 0) a1 += r[t] * r[t - 1];
  }
  return a0 > 0 ? a1 / a0 : 0;
}

/**
 * Traces of the Worsley et al. (2002, NeuroImage 15:1-15) bias correction for a design: with
 * R = I - X X+ the residual-forming matrix, D the lag-1 shift ((D r)_t = r_{t-1}) and S = D + D',
 * m00 = tr R, m01 = tr(R S), m10 = tr(R D), m11 = tr(R D R S). Computed from an orthonormal basis U
 * of the design's column space (R = I - U U'), so only nt x p arrays are formed:
 * m10 = -tr A, m01 = -2 tr A, m11 = (nt - 1) - sum_j u_j'DSu_j - sum_j u_j'SDu_j + tr(A (A + A')),
 * with A = U'DU.
 * @param design - the design (x row-major nt x p)
 * @returns m00, m01, m10, m11
 * @example const m = ar1BiasTraces(design); const rho = correctAr1(a0, a1, m)
 */
export function ar1BiasTraces(design: Pick<DesignMatrix, 'x' | 'nt' | 'p'>): { m00: number; m01: number; m10: number; m11: number } {
  const { x, nt, p } = design;
  const norms = new Float64Array(p);
  for (let t = 0; t < nt; t++) for (let j = 0; j < p; j++) norms[j] += x[t * p + j] ** 2;
  const xs = new Float64Array(nt * p);
  for (let t = 0; t < nt; t++) for (let j = 0; j < p; j++) xs[t * p + j] = norms[j] > 0 ? x[t * p + j] / Math.sqrt(norms[j]) : 0;
  const { s, u } = svdJacobi(xs, nt, p);
  const tol = s[0] * Math.max(nt, p) * 2.220446049250313e-16;
  let rank = 0;
  while (rank < p && s[rank] > tol) rank++;
  const col = (k: number): Float64Array => {
    const c = new Float64Array(nt);
    for (let t = 0; t < nt; t++) c[t] = u[t * p + k];
    return c;
  };
  const cols = Array.from({ length: rank }, (_, k) => col(k));
  // A[i][j] = u_i' D u_j = sum_{t>=1} u_i[t] u_j[t-1]
  const a = new Float64Array(rank * rank);
  for (let i = 0; i < rank; i++) for (let j = 0; j < rank; j++) {
    let acc = 0;
    for (let t = 1; t < nt; t++) acc += cols[i][t] * cols[j][t - 1];
    a[i * rank + j] = acc;
  }
  let trA = 0;
  for (let i = 0; i < rank; i++) trA += a[i * rank + i];
  let trHDS = 0;
  let trDHS = 0;
  for (const c of cols) {
    // u'DSu: (S u)_t = u_{t-1} + u_{t+1}; (D w)_t = w_{t-1}
    const su = new Float64Array(nt);
    for (let t = 0; t < nt; t++) su[t] = (t > 0 ? c[t - 1] : 0) + (t < nt - 1 ? c[t + 1] : 0);
    for (let t = 1; t < nt; t++) trHDS += c[t] * su[t - 1];
    // u'SDu: z = D u, (S z)_t = z_{t-1} + z_{t+1}
    for (let t = 0; t < nt; t++) {
      const zPrev = t >= 2 ? c[t - 2] : 0;
      const zNext = t + 1 < nt ? c[t] : 0; // z_{t+1} = u_t
      trDHS += c[t] * (zPrev + zNext);
    }
  }
  let trAB = 0;
  for (let i = 0; i < rank; i++) for (let j = 0; j < rank; j++) trAB += a[i * rank + j] * (a[j * rank + i] + a[i * rank + j]);
  return { m00: nt - rank, m01: -2 * trA, m10: -trA, m11: nt - 1 - trHDS - trDHS + trAB };
}

/**
 * Bias-corrected lag-1 autocorrelation (Worsley KJ et al. 2002, NeuroImage 15:1-15; formula as
 * re-derived; REFERENCES.md §13): with a0 = r'r and a1 = sum r_t r_{t-1} of the OLS
 * residuals, rho~ = (m00 a1 - m10 a0) / (m11 a0 - m01 a1). First-order in rho, so a small bias
 * remains at large rho.
 * @param a0 - sum of squared residuals
 * @param a1 - sum of lag-1 residual products
 * @param m - traces from {@link ar1BiasTraces}
 * @returns the corrected estimate (0 when undefined, e.g. all-zero residuals)
 * @example correctAr1(a0, a1, ar1BiasTraces(design))
 */
export function correctAr1(a0: number, a1: number, m: { m00: number; m01: number; m10: number; m11: number }): number {
  const den = m.m11 * a0 - m.m01 * a1;
  if (!(Math.abs(den) > 0)) return 0;
  return (m.m00 * a1 - m.m10 * a0) / den;
}

/**
 * Prais-Winsten AR(1) prewhitening: out_0 = sqrt(1 - rho^2) y_0, out_t = y_t - rho y_{t-1}
 * (Prais SJ & Winsten CB 1954, Cowles Commission Discussion Paper 383 [from memory]). Keeping the
 * first row (rather than dropping it, Cochrane-Orcutt) keeps nt rows.
 * @param y - series (not modified)
 * @param rho - AR(1) coefficient, |rho| < 1
 * @param out - optional output (may not alias y)
 * @returns the whitened series
 * @throws BoldsweepError INVALID_ARGUMENT for |rho| >= 1
 * @example prewhitenAr1([1, 2, 3], 0.5) // [0.8660254, 1.5, 2]
 */
export function prewhitenAr1(y: ArrayLike<number>, rho: number, out: Float64Array = new Float64Array(y.length)): Float64Array {
  if (!(Math.abs(rho) < 1)) fail('INVALID_ARGUMENT', `rho must lie strictly between -1 and 1, got ${rho}`);
  if (y.length === 0) return out;
  out[0] = Math.sqrt(1 - rho * rho) * y[0];
  for (let t = 1; t < y.length; t++) out[t] = y[t] - rho * y[t - 1];
  return out;
}
