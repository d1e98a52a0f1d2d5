import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { driftBasisOver } from './drift-basis-over.js';
import { voxelSums } from './voxel-sums.js';
import { MAX_CUMULATIVE_TERMS } from './voxel-sums-wasm.js';

/** Per-voxel sums over a whole run from {@link runTimeSums}; every array has nx*ny*nz values. */
export interface RunTimeSums {
  /** Volumes in the run. */
  nt: number;
  /** Drift terms p = detrendOrder + 1. */
  terms: number;
  detrendOrder: number;
  /** First volume of the drift fit g (the fit volumes are fitFrom..nt-1). */
  fitFrom: number;
  /** Drift terms at every volume: column 0 is the constant 1, columns k >= 1 are orthonormal over the fit volumes and sum to 0 there. */
  basis: Float64Array[];
  /** Per voxel: shift = value at volume fitFrom; the sums below are of z_t = y_t - shift. */
  shift: Float64Array;
  /** sum_t z_t and sum_t z_t^2 over all volumes. */
  sum: Float64Array;
  sumSquares: Float64Array;
  /** moments[k][v] = sum_t z_t basis[k][t] over all volumes (moments[0] is `sum`). */
  moments: Float64Array[];
  /** Drift fit over the fit volumes: g_t = shift + sum_k fit[k] basis[k][t] (fit[0] is the mean of z there). */
  fit: Float64Array[];
  /** With u_t = z_t - (g_t - shift), the residual of that fit: largest |u| over the fit volumes (it
   *  screens spike candidates) and sum u_t u_{t-1} over pairs of fit volumes (lag-1); +inf and 0
   *  ("not computed") for voxels whose mean there is below `residualsAbove`. */
  residualAbsMax: Float64Array;
  residualLag: Float64Array;
  /** Mean over all volumes (NaN for a voxel with any non-finite value): the image a brain mask is made from. */
  meanAll: Float64Array;
}

/**
 * Everything the look needs from the voxels' time series, in one streamed read of the run: per-voxel
 * sums of z, z^2 and the drift projections over all volumes, plus a polynomial drift fit over the
 * volumes from `fitFrom` with the largest size and the lag-1 products of its residuals. Nothing here
 * depends on which volumes are later dropped or censored: {@link keptVolumeStats} subtracts those
 * volumes' terms afterwards, so the run need not be read again once they are known.
 *
 * Why a shift: sums of squares of raw values lose digits when the mean is large against the SD
 * (sum y^2 - (sum y)^2 / T cancels). Each voxel's values are taken relative to one of its own values
 * (volume fitFrom), which lies within a few SDs of its mean for any ordinary voxel; with Float64
 * accumulators the relative error of the residual sum of squares is then about
 * T * 1e-16 * (1 + (offset / SD)^2), far below the Float32 resolution (6e-8) of the maps, even for
 * an offset of a hundred SDs.
 * @param run - the run (not modified)
 * @param options - detrendOrder (default 2); fitFrom: first volume of the drift fit (default
 *   min(5, floor(nt / 10)): past a typical non-steady start, and the steady reference of the per-voxel
 *   steady-state check, whose mean shift + fit[0] then is); residualsAbove: skip the residual extremes
 *   of voxels whose mean is below this (background; default -Infinity: none skipped); reuse: sums of an
 *   earlier call whose arrays may be overwritten (same grid and order), to spare fresh memory
 * @returns the sums
 * @throws BoldsweepError NOT_4D for a single volume; TOO_FEW_VOLUMES when the fit volumes are too few for the order
 * @example const sums = runTimeSums(run.volume); const mean = sums.meanAll
 */
export function runTimeSums(run: Volume, options: { detrendOrder?: number; fitFrom?: number; residualsAbove?: number; reuse?: RunTimeSums } = {}): RunTimeSums {
  const nt = run.dims[3];
  if (nt < 2) fail('NOT_4D', `temporal sums need a 4D run, got ${nt} volume`);
  const detrendOrder = options.detrendOrder ?? 2;
  const p = detrendOrder + 1;
  const fitFrom = options.fitFrom ?? Math.max(0, Math.min(5, Math.floor(nt / 10), nt - p - 1));
  if (!Number.isInteger(fitFrom) || fitFrom < 0 || fitFrom >= nt) fail('INVALID_ARGUMENT', `fitFrom must be in 0..${nt - 1}, got ${fitFrom}`);
  const basis = driftBasisOver(nt, detrendOrder, fitFrom);
  basis[0].fill(1);
  const weights = new Float64Array(nt * p);
  for (let t = 0; t < nt; t++) {
    weights[t * p] = t > 0 ? 1 : 0;
    for (let k = 1; k < p; k++) weights[t * p + k] = basis[k][t];
  }
  const rows = Array.from({ length: nt }, (_, t) => t);
  const matrices = new Float64Array(4 * p * p);
  if (p <= MAX_CUMULATIVE_TERMS) matrices.set(runningSumMaps(basis, fitFrom));
  matrices.set(forwardDifferenceMap(basis, fitFrom), 3 * p * p);
  const old = options.reuse && options.reuse.terms === p ? options.reuse : null;
  const reuse = old ? [old.shift, old.sum, old.sumSquares, ...old.moments.slice(1), ...old.fit, old.residualAbsMax, old.residualLag] : undefined;
  const s = voxelSums(run, { rows, fitStart: fitFrom, terms: p, weights, mode: 'look', residualsAbove: options.residualsAbove, matrices }, reuse);
  const n = voxelsPerVolume(run);
  const meanAll = meanFromSums(s.shift, s.S, nt, old && old.meanAll.length === n ? old.meanAll : new Float64Array(n));
  const moments = [s.S];
  for (let k = 1; k < p; k++) moments.push(s[`M${k}`]);
  const fit: Float64Array[] = [];
  for (let k = 0; k < p; k++) fit.push(s[`c${k}`]);
  return {
    nt, terms: p, detrendOrder, fitFrom, basis,
    shift: s.shift, sum: s.S, sumSquares: s.SS, moments, fit,
    residualAbsMax: s.uAbs, residualLag: s.Lu, meanAll,
  };
}

/** out[v] = shift[v] + sum[v] / count, NaN where that is not finite. */
function meanFromSums(shift: Float64Array, sum: Float64Array, count: number, out: Float64Array): Float64Array {
  for (let v = 0; v < out.length; v++) {
    const m = shift[v] + sum[v] / count;
    out[v] = Number.isFinite(m) ? m : NaN;
  }
  return out;
}

/**
 * The three matrices that turn the look kernel's repeated running sums into moments (see
 * voxel-sums-wasm.ts): after rows a..b-1, level m (1-based) holds sum_t z_t phi_m(t) with
 * phi_m(t) = C(b - t + m - 2, m - 1), a polynomial of degree m - 1 in t. A_F gives the fit over the fit
 * volumes (row 0: the mean, rows k: projections on basis k), B_F and A_h the whole-run moments (row 0:
 * the sum, rows k: projections) from the fit volumes' and the earlier volumes' running sums; each by
 * least squares over its volumes, which is exact because the targets are polynomials of degree < p
 * (over fewer than p earlier volumes any values are matched).
 * @param basis - drift terms over all volumes (column 0 ones, columns k orthonormal over the fit volumes)
 * @param fitFrom - first fit volume
 * @returns [A_F, B_F, A_h] row-major, p x p each
 */
export function runningSumMaps(basis: Float64Array[], fitFrom: number): Float64Array {
  const p = basis.length;
  const nt = basis[0].length;
  const F = nt - fitFrom;
  const out = new Float64Array(3 * p * p);
  const fitTimes = Array.from({ length: F }, (_, i) => fitFrom + i);
  const earlyTimes = Array.from({ length: fitFrom }, (_, i) => i);
  const target = (k: number, t: number, meanRow: boolean): number => (k === 0 ? (meanRow ? 1 / F : 1) : basis[k][t]);
  solveRunningSumMap(fitTimes, nt, p, (k, t) => target(k, t, true), out, 0);
  solveRunningSumMap(fitTimes, nt, p, (k, t) => target(k, t, false), out, p * p);
  if (fitFrom > 0) solveRunningSumMap(earlyTimes, fitFrom, p, (k, t) => target(k, t, false), out, 2 * p * p);
  return out;
}

/**
 * X (p x p, row-major into out at `at`) with sum_m X[k][m] phi_m(t) = target(k, t) for t in `times`,
 * phi_m(t) = C(end - t + m - 2, m - 1); least squares on columns scaled to unit size (the running
 * sums grow like end^(m-1), which would otherwise leave the normal equations badly scaled).
 */
function solveRunningSumMap(times: number[], end: number, p: number, target: (k: number, t: number) => number, out: Float64Array, at: number): void {
  const q = Math.min(p, times.length); // over fewer than p volumes, q levels already match any values
  const scale = Float64Array.from({ length: q }, (_, m) => binomial(end + m - 1, m) || 1);
  const phi = (m: number, t: number): number => binomial(end - t + m - 1, m) / scale[m]; // level m + 1, scaled
  const G = new Float64Array(q * q), Rhs = new Float64Array(p * q);
  for (const t of times) {
    for (let i = 0; i < q; i++) {
      const pi = phi(i, t);
      for (let j = 0; j < q; j++) G[i * q + j] += pi * phi(j, t);
      for (let k = 0; k < p; k++) Rhs[k * q + i] += target(k, t) * pi;
    }
  }
  const L = choleskyFactor(G, q);
  const y = new Float64Array(q), x = new Float64Array(q);
  for (let k = 0; k < p; k++) {
    for (let i = 0; i < q; i++) { let v = Rhs[k * q + i]; for (let j = 0; j < i; j++) v -= L[i * q + j] * y[j]; y[i] = v / L[i * q + i]; }
    for (let i = q - 1; i >= 0; i--) { let v = y[i]; for (let j = i + 1; j < q; j++) v -= L[j * q + i] * x[j]; x[i] = v / L[i * q + i]; }
    for (let m = 0; m < q; m++) out[at + k * p + m] = x[m] / scale[m];
  }
}

/**
 * V[j][k] = the j-th forward difference of basis column k at volume `from` (row-major p x p; column 0,
 * the constant, is left 0): the look kernel steps the drift term of its residuals with these.
 * @param basis - drift terms over all volumes
 * @param from - first fit volume (needs from + p - 1 < nt)
 * @returns V
 */
export function forwardDifferenceMap(basis: Float64Array[], from: number): Float64Array {
  const p = basis.length;
  const V = new Float64Array(p * p);
  for (let j = 0; j < p; j++) for (let k = 1; k < p; k++) {
    // Delta^j w(t) = sum_i (-1)^(j - i) C(j, i) w(t + i)
    let d = 0;
    for (let i = 0; i <= j; i++) d += ((j - i) % 2 ? -1 : 1) * binomial(j, i) * basis[k][from + i];
    V[j * p + k] = d;
  }
  return V;
}

/** C(a, b) for integer b >= 0 (0 when a < b). */
function binomial(a: number, b: number): number {
  if (a < b) return 0;
  let r = 1;
  for (let i = 1; i <= b; i++) r = (r * (a - b + i)) / i;
  return r;
}

function choleskyFactor(A: Float64Array, q: number): Float64Array {
  const L = new Float64Array(q * q);
  for (let i = 0; i < q; i++) for (let j = 0; j <= i; j++) {
    let s = A[i * q + j];
    for (let k = 0; k < j; k++) s -= L[i * q + k] * L[j * q + k];
    if (i === j) {
      if (!(s > 0)) fail('TOO_FEW_VOLUMES', 'the drift terms are not independent over these volumes');
      L[i * q + i] = Math.sqrt(s);
    } else L[i * q + j] = s / L[j * q + j];
  }
  return L;
}
