import { fail } from '../core/fail.js';
import { polynomialBasis } from '../model/drift-basis.js';

/**
 * Polynomial drift terms evaluated at every volume 0..nt-1 but made orthonormal over the volumes
 * `fitFrom`..nt-1 only (modified Gram-Schmidt on the Legendre columns of {@link polynomialBasis}, inner
 * products over those volumes, updates applied to all). Column 0 is the constant 1/sqrt(nt - fitFrom),
 * so over the fit volumes every later column sums to 0. Evaluating the same polynomials at the
 * earlier volumes lets sums taken over the whole run be corrected to any subset of volumes later.
 * @param nt - volumes
 * @param order - highest polynomial order (0 = constant only)
 * @param fitFrom - first volume of the range the columns are orthonormal over
 * @returns order + 1 columns of length nt
 * @throws BoldsweepError TOO_FEW_VOLUMES when the fit range holds no more than order + 1 volumes
 * @example const w = driftBasisOver(200, 2, 10) // sum over t >= 10 of w[1][t] * w[1][t] = 1
 */
export function driftBasisOver(nt: number, order: number, fitFrom: number): Float64Array[] {
  if (!Number.isInteger(order) || order < 0) fail('INVALID_ARGUMENT', `detrendOrder must be an integer >= 0, got ${order}`);
  if (!Number.isInteger(fitFrom) || fitFrom < 0) fail('INVALID_ARGUMENT', `fitFrom must be an integer >= 0, got ${fitFrom}`);
  if (nt - fitFrom <= order + 1) fail('TOO_FEW_VOLUMES', `removing a polynomial drift of order ${order} needs more than ${order + 1} volumes, got ${Math.max(0, nt - fitFrom)}`);
  const cols = polynomialBasis(nt, order).map((c) => Float64Array.from(c));
  for (let k = 0; k < cols.length; k++) {
    const c = cols[k];
    for (let j = 0; j < k; j++) {
      const q = cols[j];
      let dot = 0;
      for (let t = fitFrom; t < nt; t++) dot += q[t] * c[t];
      for (let t = 0; t < nt; t++) c[t] -= dot * q[t];
    }
    let norm = 0;
    for (let t = fitFrom; t < nt; t++) norm += c[t] * c[t];
    norm = Math.sqrt(norm);
    for (let t = 0; t < nt; t++) c[t] /= norm;
  }
  return cols;
}
