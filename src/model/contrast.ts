import { fail } from '../core/fail.js';
import { makeVolume, type Volume } from '../core/volume.js';
import type { GlmFit } from './glm-fit.js';
import { tToZ } from './t-to-z.js';
import { upperTailP } from './threshold-statistic.js';

/** A contrast: one weight per design column, or weights by column name (others 0). */
export type Contrast = ArrayLike<number> | Readonly<Record<string, number>>;

/** The maps of one t contrast, each a 3D volume on the run's grid. */
export interface ContrastMaps {
  /** Name given, or the contrast written out (e.g. "a - b"). */
  name: string;
  /** Weights, one per design column. */
  weights: Float64Array;
  /** Degrees of freedom of the t map. */
  dof: number;
  /** c'beta (units of the data per unit regressor). */
  effect: Volume;
  /** Variance of c'beta: sigma2 c'(X'X)^-1 c. */
  effectVariance: Volume;
  /** t = c'beta / sqrt(variance). */
  t: Volume;
  /** One-sided upper-tail p of t (P(T >= t)). */
  p: Volume;
  /** z with the same upper-tail p (signed). */
  z: Volume;
  /** Effect in percent signal change, see {@link contrastMaps}. */
  percentSignalChange: Volume;
  /** One byte per voxel: 1 where the GLM was fitted. */
  mask: Uint8Array;
}

/**
 * Contrast weights as an array of length p.
 * @param fit - the fit (its design gives the column names)
 * @param contrast - weights as an array (length p) or by column name
 * @returns weights
 * @throws BoldsweepError CONTRAST_LENGTH (array of the wrong length), INVALID_ARGUMENT (unknown
 *   column name, non-finite or all-zero weights)
 * @example contrastWeights(fit, { faces: 1, houses: -1 })
 */
export function contrastWeights(fit: Pick<GlmFit, 'design'>, contrast: Contrast): Float64Array {
  const { columns, p } = fit.design;
  let w: Float64Array;
  if (isArrayLike(contrast)) {
    if (contrast.length !== p) fail('CONTRAST_LENGTH', `the contrast has ${contrast.length} weights but the design has ${p} columns (${columns.join(', ')})`);
    w = Float64Array.from(contrast);
  } else {
    w = new Float64Array(p);
    for (const [name, weight] of Object.entries(contrast)) {
      const j = columns.indexOf(name);
      if (j < 0) fail('INVALID_ARGUMENT', `contrast names column '${name}', which the design does not have; columns: ${columns.join(', ')}`);
      w[j] = weight;
    }
  }
  if (w.some((v) => !Number.isFinite(v))) fail('INVALID_ARGUMENT', 'contrast weights must be finite numbers');
  if (w.every((v) => v === 0)) fail('INVALID_ARGUMENT', 'contrast weights are all zero');
  return w;
}

/**
 * t, z, p, effect and percent-signal-change maps of a contrast c.
 *
 * - effect c'beta; its variance sigma2 c'(X'X)^-1 c (with the voxel's AR(1) bin covariance for an
 *   AR(1) fit); t their ratio with the fit's dof; p = P(T >= t) one-sided; z = the normal value with
 *   the same p, computed through the smaller tail so it stays accurate to |z| ~ 37 ({@link tToZ}).
 * - percent signal change (our definition): 100 * sum_j c_j beta_j h_j / m, where h_j is the peak
 *   height of column j (the largest |value| it takes over the run) and m the voxel's temporal mean.
 *   For a condition column this is the peak modelled response as a percentage of the mean signal.
 * - voxels not fitted get 0 in every map and p = 1; fitted voxels whose variance is 0 (noise-free
 *   or constant data) keep their effect but get t = z = 0 and p = 1, so maps stay finite; percent
 *   signal change is 0 where the mean is not positive. Maps are Float32.
 * @param fit - a GLM fit (OLS or AR(1))
 * @param contrast - weights (array of length p, or by column name)
 * @param options - name for the contrast
 * @returns the maps
 * @throws BoldsweepError CONTRAST_LENGTH, INVALID_ARGUMENT
 * @example const maps = contrastMaps(fit, { task: 1 }); maps.z.data
 */
export function contrastMaps(fit: GlmFit, contrast: Contrast, options: { name?: string } = {}): ContrastMaps {
  const w = contrastWeights(fit, contrast);
  const { p, nt, x, columns } = fit.design;
  const n = fit.voxels.length;
  const [nx, ny, nz] = fit.grid.dims;
  const nvox = nx * ny * nz;
  const ng = fit.covUnscaled.length / (p * p);
  // c' cov_g c for each group
  const quad = new Float64Array(ng);
  for (let g = 0; g < ng; g++) {
    let acc = 0;
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) acc += w[i] * fit.covUnscaled[g * p * p + i * p + j] * w[j];
    quad[g] = acc;
  }
  const peak = new Float64Array(p);
  for (let t = 0; t < nt; t++) for (let j = 0; j < p; j++) peak[j] = Math.max(peak[j], Math.abs(x[t * p + j]));
  const effect = new Float32Array(nvox);
  const variance = new Float32Array(nvox);
  const tMap = new Float32Array(nvox);
  const pMap = new Float32Array(nvox).fill(1);
  const zMap = new Float32Array(nvox);
  const psc = new Float32Array(nvox);
  const mask = new Uint8Array(nvox);
  const stat = { kind: 't' as const, dof: fit.dof };
  for (let i = 0; i < n; i++) {
    const v = fit.voxels[i];
    mask[v] = 1;
    let e = 0;
    let scaled = 0;
    for (let j = 0; j < p; j++) {
      const b = fit.betas[j * n + i];
      e += w[j] * b;
      scaled += w[j] * b * peak[j];
    }
    const va = fit.sigma2[i] * quad[fit.group ? fit.group[i] : 0];
    effect[v] = e;
    variance[v] = va;
    const m = fit.meanSignal[i];
    psc[v] = m > 0 ? (100 * scaled) / m : 0;
    if (va > 0) {
      const t = e / Math.sqrt(va);
      tMap[v] = t;
      pMap[v] = upperTailP(t, stat);
      zMap[v] = tToZ(t, fit.dof);
    }
  }
  const vol = (data: Float32Array): Volume => makeVolume({ dims: [nx, ny, nz, 1], spacingMm: [...fit.grid.spacingMm], trSec: fit.grid.trSec, affine: new Float64Array(fit.grid.affine), data });
  return {
    name: options.name ?? describeContrast(w, columns),
    weights: w,
    dof: fit.dof,
    effect: vol(effect),
    effectVariance: vol(variance),
    t: vol(tMap),
    p: vol(pMap),
    z: vol(zMap),
    percentSignalChange: vol(psc),
    mask,
  };
}

function isArrayLike(c: Contrast): c is ArrayLike<number> {
  return ArrayBuffer.isView(c) || Array.isArray(c);
}

/** "a - b", "0.5*a + 0.5*b" */
function describeContrast(w: Float64Array, columns: readonly string[]): string {
  const terms: string[] = [];
  w.forEach((v, j) => {
    if (v === 0) return;
    const mag = Math.abs(v) === 1 ? '' : `${Math.abs(v)}*`;
    terms.push(`${v < 0 ? '-' : '+'} ${mag}${columns[j]}`);
  });
  return terms.join(' ').replace(/^\+ /, '').replace(/^- /, '-');
}
