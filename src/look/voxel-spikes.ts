import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { detrendSeries, orthonormalDrift } from './orthonormal-drift.js';
import { robustZ } from './robust-z.js';

/** A single-voxel spike found by {@link voxelSpikes}. */
export interface VoxelSpike {
  /** Voxel index in NIfTI order and its (i, j, k). */
  voxel: number;
  ijk: [number, number, number];
  volume: number;
  /** Robust z of the voxel's detrended value at this volume against its own series. */
  z: number;
  /** Departure from the voxel's drift-fitted median, signal units, and as % of the voxel mean. */
  size: number;
  sizePercent: number;
  /** The voxel's mean over the kept volumes, signal units. */
  meanSignal: number;
  /**
   * 'own' when z is against the voxel's own spread; 'absolute' when the voxel's mean lies below the
   * low-baseline level (edges, vessels, outside the brain): z is then against the larger of its own
   * spread and the floor, and sizePercent is in % of the reference (brain) mean, not of its own.
   */
  scale: 'own' | 'absolute';
}

/** Judging low-baseline voxels on an absolute scale (see {@link VoxelSpike.scale}). */
export interface AbsoluteScale {
  /** Voxels whose mean is below this (signal units) are judged on the absolute scale. */
  belowMean: number;
  /** Smallest spread (robust SD, signal units) such a voxel is judged against: the typical brain voxel's. */
  floorScale: number;
  /** Mean the size is expressed against for such voxels (signal units): the typical brain voxel's. */
  referenceMean: number;
}

/**
 * Single-voxel spikes: for each candidate voxel, remove a polynomial drift from its time series
 * (volumes from `firstVolume`) and robust-z-score the residuals against their own median and
 * 1.4826 x MAD; |z| > cutoffZ is a spike. Only the listed candidates are read (the caller screens
 * all voxels cheaply first, see lookAtRun), so this costs little even on large runs.
 * @param run - the run (not modified)
 * @param candidates - voxel indices to examine
 * @param options - firstVolume (default 0), detrendOrder (default 2), cutoffZ (default 6), censorVolumes
 *   (volumes already flagged as a whole: left out, as in voxelTimeStats), absolute (judge voxels of
 *   near-zero baseline against the brain's noise and signal instead of their own; a percent of a
 *   near-zero mean means nothing, and a spread of a few quantisation steps makes any change a spike)
 * @returns spikes, strongest first
 * @throws BoldsweepError TOO_FEW_VOLUMES when fewer than 5 volumes remain
 * @example voxelSpikes(run.volume, [1234, 5678], { firstVolume: 3 })
 */
export function voxelSpikes(run: Volume, candidates: ArrayLike<number>, options: { firstVolume?: number; detrendOrder?: number; cutoffZ?: number; censorVolumes?: readonly number[]; absolute?: AbsoluteScale } = {}): VoxelSpike[] {
  const [nx, ny, , nt] = run.dims;
  const n = voxelsPerVolume(run);
  const first = options.firstVolume ?? 0;
  const cutoffZ = options.cutoffZ ?? 6;
  const censored = new Set(options.censorVolumes ?? []);
  const kept: number[] = [];
  for (let t = first; t < nt; t++) if (!censored.has(t)) kept.push(t);
  const T = kept.length;
  if (T < 5) fail('TOO_FEW_VOLUMES', `spike detection needs at least 5 kept volumes, the run has ${T} after dropping ${first} and censoring ${censored.size}`);
  const basis = orthonormalDrift(nt - first, Math.min(options.detrendOrder ?? 2, T - 2), kept.map((t) => t - first));
  // every candidate's series, gathered volume by volume (memory order) into one candidate-major block
  const m = candidates.length;
  const cand = Int32Array.from(candidates);
  const block = new Float64Array(m * T);
  for (let t = 0; t < T; t++) gatherVolume(run.data, kept[t] * n, cand, block, t, T);
  const resid = new Float64Array(T);
  const zs = new Float64Array(T);
  const spikes: VoxelSpike[] = [];
  for (let c = 0; c < m; c++) {
    const v = cand[c];
    const series = block.subarray(c * T, (c + 1) * T);
    let sum = 0;
    for (let t = 0; t < T; t++) sum += series[t];
    if (!Number.isFinite(sum)) continue;
    detrendSeries(series, basis, resid);
    const { z, median, scale } = robustZ(resid, zs);
    const mean = sum / T;
    const abs = options.absolute !== undefined && mean < options.absolute.belowMean;
    // on the absolute scale z shrinks by own spread / max(own spread, floor)
    const shrink = abs && scale < options.absolute!.floorScale ? scale / options.absolute!.floorScale : 1;
    for (let t = 0; t < T; t++) {
      const zt = z[t] * shrink;
      if (!(Math.abs(zt) > cutoffZ)) continue;
      const k = Math.floor(v / (nx * ny)), j = Math.floor((v - k * nx * ny) / nx), i = v - k * nx * ny - j * nx;
      const size = resid[t] - median;
      const ref = abs ? options.absolute!.referenceMean : Math.abs(mean);
      spikes.push({ voxel: v, ijk: [i, j, k], volume: kept[t], z: zt, size, sizePercent: ref !== 0 ? (100 * size) / ref : NaN, meanSignal: mean, scale: abs ? 'absolute' : 'own' });
    }
  }
  return spikes.sort((a, b) => Math.abs(b.z) - Math.abs(a.z));
}

/** block[c * T + t] = data[off + voxels[c]] for every candidate c (one volume). */
function gatherVolume(data: Float32Array, off: number, voxels: Int32Array, block: Float64Array, t: number, T: number): void {
  for (let c = 0, o = t; c < voxels.length; c++, o += T) block[o] = data[off + voxels[c]];
}
