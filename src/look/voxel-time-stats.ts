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
 * Blocks of voxels are copied into a small time-major buffer (about 256 KiB, cache resident), and each
 * voxel's series is then processed in the cache in two exact passes: mean and drift coefficients,
 * then residuals. That is the two-pass algorithm (Chan, Golub & LeVeque 1983 Am Stat 37:242 rate it
 * the accurate one: no cancellation of sum-of-squares), with Float64 accumulators, yet it reads the
 * run from memory only once.
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
  const block = Math.max(16, Math.min(4096, Math.floor(32768 / T)));
  const buf = new Float64Array(block * T);
  const coef = new Float64Array(p);
  const data = run.data;
  for (let v0 = 0; v0 < n; v0 += block) {
    const len = Math.min(block, n - v0);
    // 1. copy the block into voxel-major order (series j at buf[j*T .. j*T + T))
    for (let t = 0; t < T; t++) {
      const base = kept[t] * n + v0;
      for (let j = 0, o = t; j < len; j++, o += T) buf[o] = data[base + j];
    }
    // 2. per voxel, in cache: mean + drift coefficients, then residual sums
    for (let j = 0; j < len; j++) {
      const o = j * T;
      let s = 0;
      for (let t = 0; t < T; t++) s += buf[o + t];
      const m = s / T;
      const v = v0 + j;
      if (!Number.isFinite(m)) { mean[v] = sd[v] = tsnr[v] = lag1[v] = maxAbs[v] = NaN; continue; }
      for (let k = 1; k < p; k++) {
        const q = basis[k];
        let c = 0;
        for (let t = 0; t < T; t++) c += q[t] * buf[o + t];
        coef[k] = c;
      }
      let ss = 0, lag = 0, prev = 0, mx = 0;
      for (let t = 0; t < T; t++) {
        let r = buf[o + t] - m;
        for (let k = 1; k < p; k++) r -= coef[k] * basis[k][t];
        ss += r * r;
        if (adjacent[t]) lag += r * prev;
        prev = r;
        const a = r < 0 ? -r : r;
        if (a > mx) mx = a;
      }
      // below Float32 resolution (6e-8 relative) any "variation" is rounding in the drift fit: call it 0
      const raw = Math.sqrt(ss / (T - p));
      const sdv = raw > 1e-9 * Math.abs(m) ? raw : 0;
      mean[v] = m;
      sd[v] = sdv;
      tsnr[v] = sdv > 0 ? m / sdv : 0;
      lag1[v] = sdv > 0 ? lag / ss : 0;
      maxAbs[v] = mx;
    }
  }
  return { mean, sd, tsnr, lag1, maxAbsResidual: maxAbs, firstVolume, keptVolumes: kept, usedVolumes: T, detrendOrder, ddof: p };
}
