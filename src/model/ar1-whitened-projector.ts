import { designPseudoInverse } from './design-matrix.js';

/**
 * The least-squares projector of a design whitened for AR(1) noise with coefficient `rho`, with the
 * whitening of the data folded in, so that beta = proj' y on the unwhitened series y. Whitening (the
 * Prais-Winsten transform): row 0 scaled by sqrt(1 - rho^2), row t minus rho times row t-1. With P the
 * pseudo-inverse of the whitened design, beta_j = sum_s P[j,s] (W y)_s, so the coefficient of y_t is
 * P[j,t] c_t - rho P[j,t+1] (c_0 = sqrt(1 - rho^2), else 1).
 * @param x - the design, row-major nt x p
 * @param columns - the design's column names (for designPseudoInverse's messages)
 * @param nt - rows (volumes)
 * @param p - columns
 * @param rho - the AR(1) coefficient
 * @param xw - scratch of nt * p values (overwritten)
 * @param proj - receives the projector, time-major (proj[offset + t * p + j])
 * @param offset - where this projector starts in `proj`
 * @returns (X_w' X_w)^-1 of the whitened design, p x p (designPseudoInverse's array)
 * @example const xtxInv = ar1WhitenedProjector(d.x, d.columns, nt, p, 0.2, xw, proj, g * nt * p)
 */
export function ar1WhitenedProjector(x: Float64Array, columns: readonly string[], nt: number, p: number, rho: number, xw: Float64Array, proj: Float64Array, offset: number): Float64Array {
  const c0 = Math.sqrt(1 - rho * rho);
  for (let j = 0; j < p; j++) {
    xw[j] = c0 * x[j];
    for (let t = 1; t < nt; t++) xw[t * p + j] = x[t * p + j] - rho * x[(t - 1) * p + j];
  }
  const solved = designPseudoInverse({ columns, x: xw, nt, p });
  const pw = solved.pinv;
  for (let t = 0; t < nt; t++) {
    const ct = t === 0 ? c0 : 1;
    for (let j = 0; j < p; j++) proj[offset + t * p + j] = pw[j * nt + t] * ct - (t + 1 < nt ? rho * pw[j * nt + t + 1] : 0);
  }
  return solved.xtxInv;
}
