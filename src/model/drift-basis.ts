import { fail } from '../core/fail.js';

/**
 * Number of discrete cosine regressors, constant included, for a high-pass cutoff:
 * K = floor(2 * nt * trSec / cutoffSec) + 1. Cosine k has period 2 nt trSec / k seconds, so the set
 * holds every cosine slower than the cutoff period (common practice, no source).
 * @param nt - number of volumes
 * @param trSec - repetition time in seconds
 * @param cutoffSec - cutoff period in seconds (Infinity: constant only)
 * @returns K, the number of columns of {@link dctBasis}
 * @example dctRegressorCount(200, 2, 128) // 7
 */
export function dctRegressorCount(nt: number, trSec: number, cutoffSec: number): number {
  if (!Number.isInteger(nt) || nt < 1) fail('INVALID_ARGUMENT', `nt must be a positive integer, got ${nt}`);
  if (!(trSec > 0) || !Number.isFinite(trSec)) fail('INVALID_ARGUMENT', `trSec must be > 0, got ${trSec}`);
  if (!(cutoffSec > 0)) fail('INVALID_ARGUMENT', `cutoffSec must be > 0 (Infinity for no high-pass), got ${cutoffSec}`);
  return Math.floor((2 * nt * trSec) / cutoffSec) + 1;
}

/**
 * Discrete cosine (DCT-II) drift regressors for high-pass filtering, orthonormal columns:
 * column 0 is the constant 1/sqrt(N); column k >= 1 is sqrt(2/N) cos(pi k (2n + 1) / (2N)),
 * n = 0..N-1 (the orthonormal DCT-II basis; equals scipy.fft.idct of unit vectors with norm 'ortho').
 * The count follows {@link dctRegressorCount}. Use as nuisance columns in a design or project them
 * out (highpass step).
 * @param nt - number of volumes N
 * @param trSec - repetition time in seconds
 * @param cutoffSec - cutoff period in seconds; slower drifts are modelled
 * @param options - includeConstant (default true): whether column 0 (the constant) is returned
 * @returns columns, each a Float64Array of length nt
 * @throws BoldsweepError INVALID_ARGUMENT when the cutoff would need as many regressors as volumes
 * @example const drift = dctBasis(200, 2, 128) // 7 columns, the first constant
 */
export function dctBasis(nt: number, trSec: number, cutoffSec: number, options: { includeConstant?: boolean } = {}): Float64Array[] {
  const k = dctRegressorCount(nt, trSec, cutoffSec);
  if (k >= nt && nt > 1) {
    fail('INVALID_ARGUMENT', `a ${cutoffSec} s cutoff needs ${k} cosine regressors for ${nt} volumes of ${trSec} s, which would remove every fluctuation; use cutoffSec > ${((2 * nt * trSec) / (nt - 1)).toFixed(2)}`);
  }
  const cols: Float64Array[] = [];
  const first = options.includeConstant === false ? 1 : 0;
  for (let j = first; j < k; j++) {
    const c = new Float64Array(nt);
    if (j === 0) c.fill(1 / Math.sqrt(nt));
    else {
      const s = Math.sqrt(2 / nt);
      for (let n = 0; n < nt; n++) c[n] = s * Math.cos((Math.PI * j * (2 * n + 1)) / (2 * nt));
    }
    cols.push(c);
  }
  return cols;
}

/**
 * Legendre polynomial drift regressors P_0..P_order evaluated on nt equally spaced points from
 * -1 to 1 (first volume -1, last +1), by the three-term recurrence
 * (k + 1) P_{k+1}(x) = (2k + 1) x P_k(x) - k P_{k-1}(x). Not normalised: P_k(1) = 1. Legendre rather
 * than raw powers because the columns are nearly orthogonal, so high orders stay well conditioned.
 * @param nt - number of volumes
 * @param order - highest polynomial order (0 = constant only)
 * @returns order + 1 columns, each a Float64Array of length nt; column 0 is all ones
 * @throws BoldsweepError INVALID_ARGUMENT when order is not an integer in 0..nt-1
 * @example const drift = polynomialBasis(200, 2) // constant, linear, quadratic
 */
export function polynomialBasis(nt: number, order: number): Float64Array[] {
  if (!Number.isInteger(nt) || nt < 1) fail('INVALID_ARGUMENT', `nt must be a positive integer, got ${nt}`);
  if (!Number.isInteger(order) || order < 0 || order >= nt) fail('INVALID_ARGUMENT', `order must be an integer from 0 to ${nt - 1} (volumes - 1), got ${order}`);
  const x = new Float64Array(nt);
  for (let n = 0; n < nt; n++) x[n] = nt === 1 ? 0 : -1 + (2 * n) / (nt - 1);
  const cols: Float64Array[] = [new Float64Array(nt).fill(1)];
  if (order >= 1) cols.push(Float64Array.from(x));
  for (let k = 1; k < order; k++) {
    const p = new Float64Array(nt);
    const a = cols[k];
    const b = cols[k - 1];
    for (let n = 0; n < nt; n++) p[n] = ((2 * k + 1) * x[n] * a[n] - k * b[n]) / (k + 1);
    cols.push(p);
  }
  return cols;
}
