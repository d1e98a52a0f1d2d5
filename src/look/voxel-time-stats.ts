import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { orthonormalDrift } from './orthonormal-drift.js';

/** Per-voxel temporal statistics from {@link voxelTimeStats}; maps are Float32, NIfTI order. */
export interface VoxelTimeStats {
  /** Mean over the volumes used (signal units). */
  mean: Float32Array;
  /** Standard deviation of the detrended residuals, ddof = detrendOrder + 1 (signal units). */
  sd: Float32Array;
  /** mean / sd; 0 where sd is 0 (a constant voxel: tSNR undefined, kept finite for display). */
  tsnr: Float32Array;
  /** Lag-1 autocorrelation of the detrended residuals (sum r_t r_{t-1} / sum r_t^2); 0 where sd is 0. */
  lag1: Float32Array;
  /** Largest |residual| over time (signal units), for screening spike candidates. */
  maxAbsResidual: Float32Array;
  /** First volume used, the volumes used (after censoring) and how many. */
  firstVolume: number;
  keptVolumes: number[];
  usedVolumes: number;
  /** Polynomial order removed before the SD (0 = the mean only). */
  detrendOrder: number;
  /** Degrees of freedom subtracted in the SD denominator: the number of fitted drift terms. */
  ddof: number;
}

/**
 * Temporal mean, SD, tSNR and lag-1 autocorrelation of every voxel after removing a polynomial drift
 * (Legendre, made orthonormal), in one pass over the run.
 *
 * Why this shape: the run is stored volume after volume, but the statistics are per voxel over time.
 * The voxels are taken in blocks whose rows over all kept volumes fit a 1 MiB cache; each block gets
 * two exact passes, mean and drift coefficients first, then residuals. That is the two-pass
 * algorithm (Chan, Golub & LeVeque 1983 Am Stat 37:242 rate it the accurate one: no cancellation of
 * sums of squares), with Float64 accumulators, yet the run is read from memory only once (the second
 * pass finds the block in cache). All inner loops run along contiguous rows of one volume.
 *
 * tSNR = mean / SD with SD = sqrt(sum r^2 / (T - p)), r the residuals after fitting p = order + 1 drift
 * terms to T volumes (ddof = p; with order 0 this is the usual sample SD, ddof 1).
 * Censored volumes are left out of every sum; the drift is fitted over the kept volumes' times and
 * the lag-1 sum only pairs volumes that are neighbours in the run.
 * @param run - the run (not modified)
 * @param options - firstVolume (default 0), detrendOrder (default 2), censorVolumes (default none)
 * @returns maps and bookkeeping; voxels with any non-finite value get NaN in every map
 * @throws BoldsweepError NOT_4D for a single volume; TOO_FEW_VOLUMES when T <= p
 * @example const s = voxelTimeStats(run.volume, { firstVolume: 3, detrendOrder: 2 }); s.tsnr
 */
export function voxelTimeStats(run: Volume, options: { firstVolume?: number; detrendOrder?: number; censorVolumes?: readonly number[] } = {}): VoxelTimeStats {
  const firstVolume = options.firstVolume ?? 0;
  const detrendOrder = options.detrendOrder ?? 2;
  const nt = run.dims[3];
  if (nt < 2) fail('NOT_4D', `temporal statistics need a 4D run, got ${nt} volume`);
  if (!Number.isInteger(firstVolume) || firstVolume < 0 || firstVolume >= nt) fail('INVALID_ARGUMENT', `firstVolume must be in 0..${nt - 1}, got ${firstVolume}`);
  const censored = new Set(options.censorVolumes ?? []);
  const kept: number[] = [];
  for (let t = firstVolume; t < nt; t++) if (!censored.has(t)) kept.push(t);
  const T = kept.length;
  const basis = orthonormalDrift(nt - firstVolume, detrendOrder, kept.map((t) => t - firstVolume));
  // pairs (t-1, t) for the lag-1 sum: only where both volumes are kept and adjacent in the run
  const adjacent = new Uint8Array(T);
  for (let i = 1; i < T; i++) adjacent[i] = kept[i] === kept[i - 1] + 1 ? 1 : 0;
  const p = basis.length;
  const n = voxelsPerVolume(run);
  const mean = new Float32Array(n), sd = new Float32Array(n), tsnr = new Float32Array(n), lag1 = new Float32Array(n), maxAbs = new Float32Array(n);
  // blocks of voxels small enough that the block's rows of all kept volumes (Float32) stay in a
  // 1 MiB cache: pass 1 streams them from memory, pass 2 finds them in cache
  const block = Math.max(64, Math.min(n, Math.floor(262144 / T)));
  const sum = new Float64Array(block), ss = new Float64Array(block), lag = new Float64Array(block);
  const prev = new Float64Array(block), r = new Float64Array(block), mx = new Float64Array(block), m = new Float64Array(block);
  const coef = Array.from({ length: p }, () => new Float64Array(block));
  const zeros = new Float64Array(block);
  const data = run.data;
  for (let v0 = 0; v0 < n; v0 += block) {
    const len = Math.min(block, n - v0);
    sum.fill(0); ss.fill(0); lag.fill(0); mx.fill(0);
    for (let k = 1; k < p; k++) coef[k].fill(0);
    // pass 1: sums and drift projections (the drift columns sum to 0, so no centring is needed)
    for (let t = 0; t < T; t++) {
      const base = kept[t] * n + v0;
      for (let j = 0; j < len; j++) sum[j] += data[base + j];
      for (let k = 1; k < p; k++) {
        const q = basis[k][t], c = coef[k];
        for (let j = 0; j < len; j++) c[j] += q * data[base + j];
      }
    }
    for (let j = 0; j < len; j++) m[j] = sum[j] / T;
    // pass 2: exact residuals r = y - mean - sum_k c_k q_k(t) (two-pass: no cancellation); one fused
    // loop for drift orders up to 2 (V8 pays for every extra sweep over the per-voxel arrays)
    const c1 = p > 1 ? coef[1] : zeros, c2 = p > 2 ? coef[2] : zeros;
    for (let t = 0; t < T; t++) {
      const base = kept[t] * n + v0;
      const adj = adjacent[t];
      if (p <= 3) {
        const q1 = p > 1 ? basis[1][t] : 0, q2 = p > 2 ? basis[2][t] : 0;
        for (let j = 0; j < len; j++) {
          const x = data[base + j] - m[j] - c1[j] * q1 - c2[j] * q2;
          ss[j] += x * x;
          if (adj) lag[j] += x * prev[j];
          prev[j] = x;
          const a = x < 0 ? -x : x;
          if (a > mx[j]) mx[j] = a;
        }
        continue;
      }
      for (let j = 0; j < len; j++) r[j] = data[base + j] - m[j];
      for (let k = 1; k < p; k++) {
        const q = basis[k][t], c = coef[k];
        for (let j = 0; j < len; j++) r[j] -= c[j] * q;
      }
      for (let j = 0; j < len; j++) {
        const x = r[j];
        ss[j] += x * x;
        if (adj) lag[j] += x * prev[j];
        prev[j] = x;
        const a = x < 0 ? -x : x;
        if (a > mx[j]) mx[j] = a;
      }
    }
    for (let j = 0; j < len; j++) {
      const v = v0 + j, mv = m[j];
      if (!Number.isFinite(mv)) { mean[v] = sd[v] = tsnr[v] = lag1[v] = maxAbs[v] = NaN; continue; }
      // below Float32 resolution (6e-8 relative) any "variation" is rounding in the drift fit: call it 0
      const raw = Math.sqrt(ss[j] / (T - p));
      const sdv = raw > 1e-9 * Math.abs(mv) ? raw : 0;
      mean[v] = mv;
      sd[v] = sdv;
      tsnr[v] = sdv > 0 ? mv / sdv : 0;
      lag1[v] = sdv > 0 ? lag[j] / ss[j] : 0;
      maxAbs[v] = mx[j];
    }
  }
  return { mean, sd, tsnr, lag1, maxAbsResidual: maxAbs, firstVolume, keptVolumes: kept, usedVolumes: T, detrendOrder, ddof: p };
}
