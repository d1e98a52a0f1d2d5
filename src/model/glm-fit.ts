import { fail } from '../core/fail.js';
import { sameGrid, voxelsPerVolume, type Dims4, type Volume } from '../core/volume.js';
import type { Affine } from '../core/affine.js';
import type { DesignMatrix } from './design-matrix.js';

/**
 * The result of a voxelwise GLM fit ({@link fitGlm} or `fitGlmAr1`). Only the fitted voxels are
 * stored ("compact" arrays, position i is voxel `voxels[i]` of a volume); contrasts turn them back
 * into full 3D maps.
 */
export interface GlmFit {
  /** 'ols' or 'ar1' (prewhitened). */
  method: 'ols' | 'ar1';
  /** The design as given (not whitened). */
  design: DesignMatrix;
  /** The voxel grid of one volume: dims (nt = 1), spacing, affine, TR of the run. */
  grid: { dims: Dims4; spacingMm: [number, number, number]; affine: Affine; trSec: number };
  /** Indices of the fitted voxels within one volume (NIfTI order), ascending. */
  voxels: Int32Array;
  /** Betas, p rows of voxels.length: beta of column j at fitted voxel i is `betas[j * voxels.length + i]`. */
  betas: Float64Array;
  /** Residual variance estimate RSS / dof per fitted voxel (of the whitened residuals for AR(1)). */
  sigma2: Float64Array;
  /** Residual degrees of freedom. */
  dof: number;
  /** Temporal mean of each fitted voxel's data (the baseline for percent signal change). */
  meanSignal: Float64Array;
  /**
   * Unscaled covariance (X'X)^-1 of each voxel group, p x p row-major per group; the variance of
   * c'beta at voxel i is sigma2[i] * c' cov_g c with g = group ? group[i] : 0. OLS has one group;
   * AR(1) has one per autocorrelation bin.
   */
  covUnscaled: Float64Array;
  /** Group of each fitted voxel, or null when every voxel uses group 0. */
  group: Uint16Array | null;
  /**
   * AR(1) only: the bias-corrected lag-1 autocorrelation per fitted voxel as used for whitening:
   * after the spatial smoothing of `fitGlmAr1` (unless its ar1SmoothFwhmMm is 0), before binning.
   */
  rho: Float32Array | null;
  /** Residuals as a run (zero outside the fitted voxels), when asked for; whitened for AR(1). */
  residuals: Volume | null;
  /**
   * With `GlmOptions.packed`: the kept residuals in the same packed layout (fitted voxel i of volume t
   * at t * voxels.length + i), and `residuals` is null. Absent otherwise.
   */
  packedResiduals?: Float32Array | null;
}

/** Options shared by the GLM fits. */
export interface GlmOptions {
  /**
   * Voxels to fit: a 3D volume on the run's grid or one byte per voxel; nonzero = fit.
   * __Default value:__ every voxel
   */
  mask?: Volume | Uint8Array;
  /** Keep the residuals as a run (one more run-sized Float32 array). __Default value:__ false */
  keepResiduals?: boolean;
  /**
   * Write the kept residuals into this array (nx*ny*nz*nt values) instead of a new one; implies
   * `keepResiduals`. It may be the fitted run's own data, which the fit then overwrites: each voxel's
   * series is read in full before its residuals are written. Voxels outside the fit are set to 0.
   * __Default value:__ none (a new array when `keepResiduals`)
   */
  residualsOut?: Float32Array;
  /**
   * The run's values at the fitted voxels only, volume by volume (fitted voxel i of volume t at
   * t * count + i, the fitted voxels in storage order): read instead of `run.data`, which is then not
   * read at all (the run gives the grid, the TR and the number of volumes). A sweep worker keeps a
   * preprocessed run so, at the brain mask's size instead of the grid's. Residuals are then kept in the
   * same layout (`residualsOut`, if given, has count * nt values and may be this array itself) and
   * returned as `packedResiduals`. __Default value:__ none (read `run.data`)
   */
  packed?: Float32Array;
}

/**
 * Where a fit reads the voxels' series: `run.data` with the fitted voxels' own indices, or the packed
 * array of `options.packed` (checked) with indices 0..count-1.
 * @param run - the run
 * @param options - the fit's options
 * @param idx - fitted voxels, ascending
 * @returns data, voxels per volume in data, and the index of each fitted voxel within a volume of data
 * @throws BoldsweepError INVALID_ARGUMENT when the packed array has the wrong length
 * @example const { data, stride, at } = fitInput(run, options, idx)
 */
export function fitInput(run: Volume, options: GlmOptions, idx: Int32Array): { data: Float32Array; stride: number; at: Int32Array } {
  const packed = options.packed;
  if (!packed) return { data: run.data, stride: voxelsPerVolume(run), at: idx };
  const n = idx.length;
  const nt = run.dims[3];
  if (packed.length !== n * nt) fail('INVALID_ARGUMENT', `the packed run has ${packed.length} values; ${n} fitted voxels x ${nt} volumes need ${n * nt}`);
  const at = new Int32Array(n);
  for (let i = 0; i < n; i++) at[i] = i;
  return { data: packed, stride: n, at };
}

/**
 * The array the residuals of a fit go into: `options.residualsOut` (checked, with the voxels outside
 * the fit set to 0, as in a new array), a new array when `options.keepResiduals`, else null.
 * @param options - the fit's options
 * @param nvox - voxels per volume
 * @param nt - volumes
 * @param idx - fitted voxels, ascending
 * @returns the array, or null when residuals are not kept
 * @throws BoldsweepError INVALID_ARGUMENT when residualsOut has the wrong length
 * @example const residuals = residualsArray({ keepResiduals: true }, nvox, nt, idx)
 */
export function residualsArray(options: GlmOptions, nvox: number, nt: number, idx: Int32Array): Float32Array | null {
  const out = options.residualsOut;
  if (options.packed) {
    // every value of a packed array belongs to a fitted voxel: nothing to clear
    if (!out) return options.keepResiduals ? new Float32Array(idx.length * nt) : null;
    if (out.length !== idx.length * nt) fail('INVALID_ARGUMENT', `residualsOut has ${out.length} values; ${idx.length} packed voxels x ${nt} volumes need ${idx.length * nt}`);
    return out;
  }
  if (!out) return options.keepResiduals ? new Float32Array(nvox * nt) : null;
  if (out.length !== nvox * nt) fail('INVALID_ARGUMENT', `residualsOut has ${out.length} values; the run needs ${nvox} x ${nt} = ${nvox * nt}`);
  if (idx.length < nvox) {
    const fitted = new Uint8Array(nvox);
    for (let i = 0; i < idx.length; i++) fitted[idx[i]] = 1;
    for (let t = 0, o = 0; t < nt; t++, o += nvox) for (let v = 0; v < nvox; v++) if (!fitted[v]) out[o + v] = 0;
  }
  return out;
}

/**
 * Indices of the voxels to fit, checking the mask against the run.
 * @param run - the run
 * @param mask - optional mask (3D volume on the run's grid, or one byte per voxel)
 * @returns ascending voxel indices within one volume
 * @throws BoldsweepError GRID_MISMATCH, INVALID_ARGUMENT (empty mask)
 * @example const idx = fittedVoxels(run.volume, brainMask)
 */
export function fittedVoxels(run: Volume, mask?: Volume | Uint8Array): Int32Array {
  const n = voxelsPerVolume(run);
  if (mask === undefined) {
    const all = new Int32Array(n);
    for (let i = 0; i < n; i++) all[i] = i;
    return all;
  }
  let m: ArrayLike<number>;
  if (mask instanceof Uint8Array) {
    if (mask.length !== n) fail('GRID_MISMATCH', `mask has ${mask.length} voxels but one volume of the run has ${n}`);
    m = mask;
  } else {
    if (!sameGrid(mask, run)) fail('GRID_MISMATCH', `mask grid [${mask.dims.slice(0, 3).join('x')}] differs from run grid [${run.dims.slice(0, 3).join('x')}] (or their voxel-to-world mappings differ)`);
    m = mask.data.subarray(0, n);
  }
  let count = 0;
  for (let i = 0; i < n; i++) if (m[i] !== 0) count++;
  if (count === 0) fail('INVALID_ARGUMENT', 'the mask is empty, so there is no voxel to fit');
  const idx = new Int32Array(count);
  for (let i = 0, k = 0; i < n; i++) if (m[i] !== 0) idx[k++] = i;
  return idx;
}

/**
 * Check a run and design agree before fitting.
 * @param run - the run
 * @param design - the design
 * @param extraDof - degrees of freedom used besides the design columns (1 for AR(1))
 * @returns residual degrees of freedom
 * @throws BoldsweepError NOT_4D, INVALID_ARGUMENT, TOO_FEW_VOLUMES
 * @example const dof = checkRunAndDesign(run.volume, design, 0)
 */
export function checkRunAndDesign(run: Volume, design: DesignMatrix, extraDof: number): number {
  const nt = run.dims[3];
  if (nt < 2) fail('NOT_4D', `the run has ${nt} volume`);
  if (design.nt !== nt) fail('INVALID_ARGUMENT', `the design has ${design.nt} rows but the run has ${nt} volumes`);
  const dof = nt - design.p - extraDof;
  if (dof < 1) fail('TOO_FEW_VOLUMES', `${nt} volumes leave ${dof} residual degrees of freedom for ${design.p} design columns`);
  return dof;
}

/**
 * The grid part of a run, for building maps later without holding on to the run's data.
 * @param run - the run
 * @returns dims with nt = 1, spacing, affine copy, TR
 * @example const grid = gridOf(run.volume)
 */
export function gridOf(run: Volume): GlmFit['grid'] {
  return { dims: [run.dims[0], run.dims[1], run.dims[2], 1], spacingMm: [...run.spacingMm], affine: new Float64Array(run.affine), trSec: run.trSec };
}
