import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { orthonormalDrift } from './orthonormal-drift.js';
import { voxelSums } from './voxel-sums.js';

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
 * (Legendre, made orthonormal over the volumes used), in one pass over the run.
 *
 * Why this shape: the run is stored volume after volume, but the statistics are per voxel over time.
 * The voxels are taken in blocks whose rows of all used volumes are copied, one contiguous stretch per
 * volume, into WebAssembly memory; there each pair of voxels gets two exact passes, mean and drift
 * coefficients first, then residuals (see voxel-sums-wasm.ts, mode 'exact'). That is the two-pass
 * algorithm (Chan, Golub & LeVeque 1983 Am Stat 37:242 rate it the accurate one: no cancellation of
 * sums of squares), with Float64 accumulators, yet the run is read from memory only once (the second
 * pass finds the pair's rows in cache).
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
  const p = basis.length;
  // per row: adj (1 where the row before is the previous volume: a lag-1 pair), then the drift terms
  const weights = new Float64Array(T * p);
  for (let i = 0; i < T; i++) {
    weights[i * p] = i > 0 && kept[i] === kept[i - 1] + 1 ? 1 : 0;
    for (let k = 1; k < p; k++) weights[i * p + k] = basis[k][i];
  }
  const s = voxelSums(run, { rows: kept, fitStart: 0, terms: p, weights, mode: 'exact' });
  const n = voxelsPerVolume(run);
  const mean = new Float32Array(n), sd = new Float32Array(n), tsnr = new Float32Array(n), lag1 = new Float32Array(n), maxAbs = new Float32Array(n);
  for (let v0 = 0; v0 < n; v0 += 4096) finishStats(v0, Math.min(n, v0 + 4096), T, p, s, { mean, sd, tsnr, lag1, maxAbs });
  return { mean, sd, tsnr, lag1, maxAbsResidual: maxAbs, firstVolume, keptVolumes: kept, usedVolumes: T, detrendOrder, ddof: p };
}

/** Maps of voxels v0..v1-1 from the exact sums (a small function per chunk, which V8 optimises once). */
function finishStats(v0: number, v1: number, T: number, p: number, s: Record<string, Float64Array>, out: { mean: Float32Array; sd: Float32Array; tsnr: Float32Array; lag1: Float32Array; maxAbs: Float32Array }): void {
  const { shift, S, SSu, Lu, uAbs } = s;
  const { mean, sd, tsnr, lag1, maxAbs } = out;
  for (let v = v0; v < v1; v++) {
    const mv = shift[v] + S[v] / T;
    if (!Number.isFinite(mv)) { mean[v] = sd[v] = tsnr[v] = lag1[v] = maxAbs[v] = NaN; continue; }
    // below Float32 resolution (6e-8 relative) any "variation" is rounding in the drift fit: call it 0
    const ss = SSu[v];
    const raw = Math.sqrt(ss / (T - p));
    const sdv = raw > 1e-9 * Math.abs(mv) ? raw : 0;
    mean[v] = mv;
    sd[v] = sdv;
    tsnr[v] = sdv > 0 ? mv / sdv : 0;
    lag1[v] = sdv > 0 ? Lu[v] / ss : 0;
    maxAbs[v] = uAbs[v];
  }
}
