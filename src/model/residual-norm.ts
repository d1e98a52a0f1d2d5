import { fail } from '../core/fail.js';

/**
 * Length of what is left of a time course after projecting out other regressors: sqrt(p' M p), where M is
 * the residual-forming matrix of `others` (modified Gram-Schmidt, each direction orthogonalised twice for
 * accuracy). For a time course p that the model fits with these other columns, the expected t statistic of
 * an effect of size c in noise of SD sigma is c sqrt(p' M p) / sigma (Friston KJ et al. 1995, Hum Brain
 * Mapp 2:189-210: the variance of an estimate is sigma^2 (X'X)^-1, whose diagonal term is 1 / x'Mx).
 * @param p - the time course, length nt
 * @param others - the other regressors, each length nt (drift, nuisance, intercept)
 * @returns sqrt(p' M p) in the units of p
 * @throws BoldsweepError INVALID_ARGUMENT when a column's length differs from p's
 * @example residualNorm([0, 1, 0, 1], [[1, 1, 1, 1]]) // sqrt(4 x 0.25) = 1
 */
export function residualNorm(p: ArrayLike<number>, others: ReadonlyArray<ArrayLike<number>>): number {
  const nt = p.length;
  const basis: Float64Array[] = [];
  const project = (v: Float64Array): void => {
    for (let pass = 0; pass < 2; pass++) {
      for (const q of basis) {
        let d = 0;
        for (let t = 0; t < nt; t++) d += q[t] * v[t];
        for (let t = 0; t < nt; t++) v[t] -= d * q[t];
      }
    }
  };
  for (const col of others) {
    if (col.length !== nt) fail('INVALID_ARGUMENT', `a regressor has ${col.length} values, the time course ${nt}`);
    const v = Float64Array.from(col);
    let before = 0;
    for (let t = 0; t < nt; t++) before += v[t] * v[t];
    project(v);
    let ss = 0;
    for (let t = 0; t < nt; t++) ss += v[t] * v[t];
    // a column (nearly) in the span of earlier ones adds no direction
    if (!(ss > 1e-20 * before) || ss === 0) continue;
    const norm = Math.sqrt(ss);
    for (let t = 0; t < nt; t++) v[t] /= norm;
    basis.push(v);
  }
  const r = Float64Array.from(p);
  project(r);
  let ss = 0;
  for (let t = 0; t < nt; t++) ss += r[t] * r[t];
  return Math.sqrt(ss);
}
