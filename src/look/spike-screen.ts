import { voxelsPerVolume, type Volume } from '../core/volume.js';
import type { KeptVolumeStats } from './kept-volume-stats.js';
import type { RunTimeSums } from './run-time-sums.js';

/**
 * Voxels whose largest detrended residual over the kept volumes exceeds `screenZ` times their SD:
 * max_{t kept} |r_t| > screenZ * sd, with r the residuals of the drift fitted over the kept volumes
 * (the spike screen of lookAtRun; the candidates are then scored exactly by voxelSpikes).
 *
 * Without reading the run again for most voxels: the sums hold the extremes of u_t, the residuals of a
 * drift g fitted over the volumes from `fitFrom` (nearly the same fit). Since r_t = u_t - (f_t - g_t)
 * with f the kept fit, |r_t| <= max(umax, -umin) + max_t |f_t - g_t| for kept t >= fitFrom, and the
 * second term is at most sum_k |a_k - c_k| max_t |W_k(t)| (a, c the two fits' coefficients). Kept
 * volumes before fitFrom are read and scored exactly. When no volume of the fit range is censored,
 * the residual of largest size is kept, so max |r| >= max(umax, -umin) - that same gap as well. A voxel
 * whose upper bound stays at or below the cutoff cannot pass, one whose lower bound lies above it passes;
 * for the few in between (a band of width twice the gap) every kept residual is computed from the
 * data, so the result equals the exact screen. (A censored volume inside the fit range can hold a
 * voxel's extreme: then only the upper bound holds and more voxels are computed exactly.)
 * @param run - the run
 * @param sums - from runTimeSums
 * @param stats - from keptVolumeStats with the same `mask` (its fit and SD)
 * @param mask - voxels to screen (nonzero)
 * @param screenZ - cutoff in SD units
 * @returns candidate voxel indices, ascending
 * @example const candidates = screenSpikeVoxels(run, sums, stats, mask, 4.1)
 */
export function screenSpikeVoxels(run: Volume, sums: RunTimeSums, stats: KeptVolumeStats, mask: ArrayLike<number>, screenZ: number): number[] {
  const n = voxelsPerVolume(run);
  const p = sums.terms;
  const W = sums.basis;
  const kept = stats.keptVolumes;
  const early = kept.filter((t) => t < sums.fitFrom);
  const late = kept.filter((t) => t >= sums.fitFrom);
  const wMax = new Float64Array(p);
  for (const t of late) for (let k = 0; k < p; k++) wMax[k] = Math.max(wMax[k], Math.abs(W[k][t]));
  // with every fit volume kept, the largest |u| is a kept residual: a lower bound as well
  const ctx: ScreenContext = {
    data: run.data, n, p, screenZ, shift: sums.shift, g: sums.fit, f: stats.fit, sd: stats.sd, mask,
    residualMax: sums.residualMax, residualMin: sums.residualMin, W, wMax,
    early: Int32Array.from(early), haveLate: late.length > 0, fitAllKept: late.length === sums.nt - sums.fitFrom,
  };
  const found = { passed: new Int32Array(1024), exact: new Int32Array(1024), counts: new Int32Array(2) };
  // in chunks, so the loop is one small function V8 optimises once and keeps (see voxel-sums.ts)
  for (let v0 = 0; v0 < n; v0 += CHUNK) {
    if (found.passed.length - found.counts[0] < CHUNK) found.passed = grow(found.passed);
    if (found.exact.length - found.counts[1] < CHUNK) found.exact = grow(found.exact);
    screenRange(v0, Math.min(n, v0 + CHUNK), ctx, found);
  }
  const passed = Array.from(found.passed.subarray(0, found.counts[0]));
  const exact = Array.from(found.exact.subarray(0, found.counts[1]));
  const data = run.data;
  const { shift } = sums;
  const f = stats.fit;
  if (exact.length === 0) return passed;
  // exact maxima for the undecided voxels, volume by volume (memory order) over the kept volumes
  const m = exact.length;
  const idx = Int32Array.from(exact);
  const coef = new Float64Array(m * p), base = new Float64Array(m), maxAbs = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    base[i] = shift[idx[i]];
    for (let k = 0; k < p; k++) coef[i * p + k] = f[k][idx[i]];
  }
  const wt = new Float64Array(p);
  for (const t of kept) {
    for (let k = 0; k < p; k++) wt[k] = W[k][t];
    maxResidualOfVolume(data, t * n, idx, base, coef, wt, maxAbs);
  }
  for (let i = 0; i < m; i++) if (maxAbs[i] > screenZ * stats.sd[idx[i]]) passed.push(idx[i]);
  return passed.sort((a, b) => a - b);
}

const CHUNK = 4096;

/** Everything screenRange needs (one object shape for every call). */
interface ScreenContext {
  data: Float32Array; n: number; p: number; screenZ: number;
  shift: Float64Array; g: Float64Array[]; f: Float64Array[]; sd: Float32Array; mask: ArrayLike<number>;
  residualMax: Float64Array; residualMin: Float64Array; W: Float64Array[]; wMax: Float64Array;
  early: Int32Array; haveLate: boolean; fitAllKept: boolean;
}

/** Bounds for the voxels v0..v1-1: appends those that pass to `passed`, undecided ones to `exact`. */
function screenRange(v0: number, v1: number, c: ScreenContext, out: { passed: Int32Array; exact: Int32Array; counts: Int32Array }): void {
  const { data, n, p, screenZ, shift, g, f, sd, mask, residualMax, residualMin, W, wMax, early, haveLate, fitAllKept } = c;
  const { passed, exact, counts } = out;
  let np = counts[0], ne = counts[1];
  for (let v = v0; v < v1; v++) {
    if (!mask[v]) continue;
    const sdv = sd[v];
    if (!Number.isFinite(sdv)) continue;
    const cut = screenZ * sdv;
    let gap = 0, scale = Math.abs(shift[v]);
    for (let k = 0; k < p; k++) { gap += Math.abs(f[k][v] - g[k][v]) * wMax[k]; scale += Math.abs(g[k][v]) * wMax[k]; }
    // rounding allowance: the sums and fits carry relative errors of order 1e-15
    const slack = 1e-12 * scale;
    const uAbs = Math.max(residualMax[v], -residualMin[v]);
    let upper = haveLate ? uAbs + gap + slack : 0;
    // (background voxels skipped by the sums have uAbs = Infinity: no bound either way)
    let lower = haveLate && fitAllKept && uAbs < Infinity ? uAbs - gap - slack : 0;
    for (let i = 0; i < early.length; i++) {
      const t = early[i];
      let r = data[t * n + v] - shift[v];
      for (let k = 0; k < p; k++) r -= f[k][v] * W[k][t];
      const a = Math.abs(r);
      if (a > upper) upper = a;
      if (a > lower) lower = a;
    }
    if (lower > cut) passed[np++] = v;
    else if (upper > cut) exact[ne++] = v;
  }
  counts[0] = np; counts[1] = ne;
}

/** maxAbs[i] = max(maxAbs[i], |y - base[i] - coef[i] . wt|) for voxel idx[i] of the volume at `off`. */
function maxResidualOfVolume(data: Float32Array, off: number, idx: Int32Array, base: Float64Array, coef: Float64Array, wt: Float64Array, maxAbs: Float64Array): void {
  const p = wt.length;
  for (let i = 0; i < idx.length; i++) {
    let r = data[off + idx[i]] - base[i];
    for (let k = 0; k < p; k++) r -= coef[i * p + k] * wt[k];
    const a = r < 0 ? -r : r;
    if (a > maxAbs[i]) maxAbs[i] = a;
  }
}

function grow(a: Int32Array): Int32Array {
  const b = new Int32Array(2 * a.length + CHUNK);
  b.set(a);
  return b;
}
