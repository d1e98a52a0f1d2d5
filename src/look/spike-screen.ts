import { voxelsPerVolume, type Volume } from '../core/volume.js';
import type { KeptVolumeStats } from './kept-volume-stats.js';
import type { RunTimeSums } from './run-time-sums.js';

/**
 * Voxels whose largest detrended residual over the kept volumes exceeds `screenZ` times their SD:
 * max_{t kept} |r_t| > screenZ * sd, with r the residuals of the drift fitted over the kept volumes
 * (the spike screen of lookAtRun; the candidates are then scored exactly by voxelSpikes).
 *
 * Without reading the run again for most voxels: keptVolumeStats bounds max |r| from the residual
 * extremes of the whole-run sums (a nearly identical fit) widened by the largest difference between
 * the two fits, and from the exact residuals of the kept volumes before the sums' fit start. A voxel
 * whose upper bound stays at or below the cutoff cannot pass, one whose lower bound lies above it
 * passes; for the few in between (a band twice that fit difference wide) every kept residual is
 * computed from the data, so the result equals the exact screen.
 * @param run - the run
 * @param sums - from runTimeSums
 * @param stats - from keptVolumeStats with the screened voxels as its `mask` (its fit, SD and bounds)
 * @param screenZ - cutoff in SD units
 * @returns candidate voxel indices, ascending
 * @example const candidates = screenSpikeVoxels(run, sums, stats, 4.1)
 */
export function screenSpikeVoxels(run: Volume, sums: RunTimeSums, stats: KeptVolumeStats, screenZ: number): number[] {
  const n = voxelsPerVolume(run);
  const p = sums.terms;
  const W = sums.basis;
  const { voxels, lower, upper } = stats.residualBounds;
  const found = sortBounds(voxels, lower, upper, stats.sd, screenZ);
  const passed = Array.from(found.passed);
  if (found.undecided.length === 0) return passed;
  // exact maxima for the undecided voxels, volume by volume (memory order) over the kept volumes
  const idx = found.undecided;
  const m = idx.length;
  const coef = new Float64Array(m * p), base = new Float64Array(m), maxAbs = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    base[i] = sums.shift[idx[i]];
    for (let k = 0; k < p; k++) coef[i * p + k] = stats.fit[k][idx[i]];
  }
  const wt = new Float64Array(p);
  for (const t of stats.keptVolumes) {
    for (let k = 0; k < p; k++) wt[k] = W[k][t];
    maxResidualOfVolume(run.data, t * n, idx, base, coef, wt, maxAbs);
  }
  for (let i = 0; i < m; i++) if (maxAbs[i] > screenZ * stats.sd[idx[i]]) passed.push(idx[i]);
  return passed.sort((a, b) => a - b);
}

/** Splits the bounded voxels: lower bound above the cutoff (pass), upper bound above it (undecided), else out. */
function sortBounds(voxels: Int32Array, lower: Float64Array, upper: Float64Array, sd: Float32Array, screenZ: number): { passed: Int32Array; undecided: Int32Array } {
  const passed = new Int32Array(voxels.length), undecided = new Int32Array(voxels.length);
  const counts = new Int32Array(2);
  splitByBounds(voxels, lower, upper, sd, screenZ, passed, undecided, counts);
  return { passed: passed.subarray(0, counts[0]), undecided: undecided.subarray(0, counts[1]) };
}

/** The loop of sortBounds (alone in its function, so V8 optimises it once and keeps it). */
function splitByBounds(voxels: Int32Array, lower: Float64Array, upper: Float64Array, sd: Float32Array, screenZ: number, passed: Int32Array, undecided: Int32Array, counts: Int32Array): void {
  let np = 0, nu = 0;
  for (let i = 0; i < voxels.length; i++) {
    const v = voxels[i];
    const cut = screenZ * sd[v];
    if (lower[i] > cut) passed[np++] = v;
    else if (upper[i] > cut) undecided[nu++] = v;
  }
  counts[0] = np; counts[1] = nu;
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
