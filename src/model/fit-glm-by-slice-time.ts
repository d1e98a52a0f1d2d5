import { fail } from '../core/fail.js';
import { volumeLike, voxelsPerVolume, type Volume } from '../core/volume.js';
import { ar1BiasTraces, correctAr1 } from './ar1.js';
import { ar1WhitenedProjector } from './ar1-whitened-projector.js';
import { designPseudoInverse, type DesignMatrix } from './design-matrix.js';
import { DEFAULT_AR1_SMOOTH_FWHM_MM, type GlmAr1Options } from './glm-ar1.js';
import { checkRunAndDesign, fittedVoxels, gridOf, residualsArray, type GlmFit } from './glm-fit.js';
import { sweepVoxels, transposeToTimeMajor } from './glm-kernel.js';
import { smoothWithinMask } from './smooth-within-mask.js';

/** Options of {@link fitGlmBySliceTime}: the GLM options, and whether to prewhiten with AR(1). */
export interface GlmBySliceTimeOptions extends GlmAr1Options {
  /** AR(1) prewhitening as in fitGlmAr1 (else OLS as in fitGlm). __Default value:__ false */
  ar1?: boolean;
}

/** Voxels of one design class: their indices in the volume and their positions in the compact arrays. */
interface ClassVoxels { idx: Int32Array; pos: Int32Array }

/**
 * A GLM whose design depends on the slice (the model-based alternative to slice-timing correction:
 * each slice's regressors sampled at that slice's acquisition time). Slices are grouped by design
 * (`designOfSlice`: slices read at the same time, as in a multiband acquisition, share one), the
 * voxels of each group are fitted with their design by the same kernel as fitGlm / fitGlmAr1, and
 * the results are merged into one GlmFit: betas, variances and means per voxel, one unscaled
 * covariance per group (per design for OLS; per design and autocorrelation bin for AR(1)), so
 * contrastMaps works unchanged. With AR(1) the autocorrelation map is corrected with each voxel's
 * own design (Worsley et al. 2002, NeuroImage 15:1-15) and smoothed over all fitted voxels at once,
 * as fitGlmAr1 does. Every design must have the same columns (only the sampling times differ), so
 * the degrees of freedom are the same everywhere. The merged fit's `design` is the first one: its
 * column names hold for all, and contrastMaps takes the peak heights for percent signal change from
 * it (differences between slices' sampling of one regressor are a few percent at most for event
 * designs and vanish for blocks).
 * @param run - the run (not modified); slices along the third axis
 * @param designs - one design per group, each with one row per volume and the same columns
 * @param designOfSlice - for each slice along the third axis, the index of its design
 * @param options - mask, keepResiduals, residualsOut, ar1 and the AR(1) options of fitGlmAr1
 * @returns the merged fit
 * @throws BoldsweepError INVALID_ARGUMENT for designs with other columns or a slice without a
 *   design; and whatever fitGlm / fitGlmAr1 throw
 * @example const fit = fitGlmBySliceTime(run, [designAt0, designAt1], Int32Array.of(0, 1, 0, 1), { mask })
 */
export function fitGlmBySliceTime(run: Volume, designs: readonly DesignMatrix[], designOfSlice: ArrayLike<number>, options: GlmBySliceTimeOptions = {}): GlmFit {
  if (designs.length === 0) fail('INVALID_ARGUMENT', 'fitGlmBySliceTime needs at least one design');
  const [nx, ny, nz, nt] = run.dims;
  const nxy = nx * ny;
  if (designOfSlice.length !== nz) fail('INVALID_ARGUMENT', `designOfSlice has ${designOfSlice.length} entries for ${nz} slices`);
  const d0 = designs[0];
  for (const d of designs) {
    if (d.p !== d0.p || d.columns.some((c, j) => c !== d0.columns[j])) fail('INVALID_ARGUMENT', `every slice's design must have the same columns (${d0.columns.join(', ')}), got (${d.columns.join(', ')})`);
  }
  for (let k = 0; k < nz; k++) if (!(Number.isInteger(designOfSlice[k]) && designOfSlice[k] >= 0 && designOfSlice[k] < designs.length)) fail('INVALID_ARGUMENT', `slice ${k} names design ${designOfSlice[k]}; there are ${designs.length}`);
  if (options.packed) fail('INVALID_ARGUMENT', 'fitGlmBySliceTime reads the run on its grid: a packed run is not accepted');
  const ar1 = options.ar1 ?? false;
  let dof = 0;
  for (const d of designs) dof = checkRunAndDesign(run, d, ar1 ? 1 : 0);
  const { p } = d0;
  const idx = fittedVoxels(run, options.mask);
  const n = idx.length;
  const nvox = voxelsPerVolume(run);
  // voxels of each design, ascending within each
  const counts = new Int32Array(designs.length);
  for (let i = 0; i < n; i++) counts[designOfSlice[Math.floor(idx[i] / nxy)]]++;
  const classes: ClassVoxels[] = designs.map((_, c) => ({ idx: new Int32Array(counts[c]), pos: new Int32Array(counts[c]) }));
  const fill = new Int32Array(designs.length);
  for (let i = 0; i < n; i++) {
    const c = designOfSlice[Math.floor(idx[i] / nxy)];
    classes[c].idx[fill[c]] = idx[i];
    classes[c].pos[fill[c]++] = i;
  }
  const betas = new Float64Array(p * n);
  const rss = new Float64Array(n);
  const mean = new Float64Array(n);
  const residuals = residualsArray(options, nvox, nt, idx);
  const scatter = (cv: ClassVoxels, b: Float64Array, r: Float64Array, m: Float64Array | null): void => {
    const nc = cv.idx.length;
    for (let i = 0; i < nc; i++) {
      const at = cv.pos[i];
      for (let j = 0; j < p; j++) betas[j * n + at] = b[j * nc + i];
      rss[at] = r[i];
      if (m) mean[at] = m[i];
    }
  };
  const active = designs.map((_, c) => c).filter((c) => classes[c].idx.length > 0);

  if (!ar1) {
    const cov = new Float64Array(designs.length * p * p);
    for (const c of active) {
      const d = designs[c];
      const cv = classes[c];
      const nc = cv.idx.length;
      const { pinv, xtxInv } = designPseudoInverse(d);
      cov.set(xtxInv, c * p * p);
      const b = new Float64Array(p * nc), r = new Float64Array(nc), m = new Float64Array(nc);
      sweepVoxels({ data: run.data, nvox, nt, p, idx: cv.idx, x: d.x, proj: transposeToTimeMajor(pinv, p, nt), group: null, rhoOfGroup: null, betas: b, rss: r, mean: m, lag1: null, residuals });
      scatter(cv, b, r, m);
    }
    // designs no voxel uses keep their covariance too, so group numbers are design numbers
    for (let c = 0; c < designs.length; c++) if (classes[c].idx.length === 0) cov.set(designPseudoInverse(designs[c]).xtxInv, c * p * p);
    const group = new Uint16Array(n);
    for (const c of active) for (const at of classes[c].pos) group[at] = c;
    const sigma2 = new Float64Array(n);
    for (let i = 0; i < n; i++) sigma2[i] = rss[i] / dof;
    return { method: 'ols', design: d0, grid: gridOf(run), voxels: idx, betas, sigma2, dof, meanSignal: mean, covUnscaled: cov, group, rho: null, residuals: residuals ? volumeLike(run, nt, residuals) : null };
  }

  // AR(1), as fitGlmAr1 but with each voxel's own design
  const binWidth = options.binWidth ?? 0.01;
  const maxAbsRho = options.maxAbsRho ?? 0.99;
  if (!(binWidth > 0 && binWidth <= 0.5)) fail('INVALID_ARGUMENT', `binWidth must be in (0, 0.5], got ${binWidth}`);
  if (!(maxAbsRho >= 0 && maxAbsRho < 1)) fail('INVALID_ARGUMENT', `maxAbsRho must be in [0, 1), got ${maxAbsRho}`);
  const smoothFwhmMm = options.ar1SmoothFwhmMm ?? DEFAULT_AR1_SMOOTH_FWHM_MM;
  if (!(smoothFwhmMm >= 0) || !Number.isFinite(smoothFwhmMm)) fail('INVALID_ARGUMENT', `ar1SmoothFwhmMm must be finite and >= 0 mm, got ${smoothFwhmMm}`);
  // 1. OLS pass per design: residual lag-0 and lag-1 sums, means; corrected rho per voxel
  const est = new Float64Array(n);
  for (const c of active) {
    const d = designs[c];
    const cv = classes[c];
    const nc = cv.idx.length;
    const b = new Float64Array(p * nc), a0 = new Float64Array(nc), a1 = new Float64Array(nc), m = new Float64Array(nc);
    sweepVoxels({ data: run.data, nvox, nt, p, idx: cv.idx, x: d.x, proj: transposeToTimeMajor(designPseudoInverse(d).pinv, p, nt), group: null, rhoOfGroup: null, betas: b, rss: a0, mean: m, lag1: a1, residuals: null });
    const traces = ar1BiasTraces(d);
    for (let i = 0; i < nc; i++) {
      const r = correctAr1(a0[i], a1[i], traces);
      est[cv.pos[i]] = Number.isFinite(r) ? Math.max(-maxAbsRho, Math.min(maxAbsRho, r)) : 0;
      mean[cv.pos[i]] = m[i];
    }
  }
  // 2. smoothed over every fitted voxel, then binned
  const rho = smoothFwhmMm > 0 ? smoothWithinMask(est, idx, [nx, ny, nz], run.spacingMm, smoothFwhmMm) : Float32Array.from(est);
  const used: ArrayLike<number> = smoothFwhmMm > 0 ? rho : est;
  // 3. groups: (design, bin) pairs in design then bin order
  const binOf = new Int32Array(n);
  for (let i = 0; i < n; i++) binOf[i] = Math.round(used[i] / binWidth);
  const group = new Uint16Array(n);
  const covParts: Float64Array[] = [];
  const size = nt * p;
  for (const c of active) {
    const d = designs[c];
    const cv = classes[c];
    const nc = cv.idx.length;
    const keys = [...new Set(Array.from(cv.pos, (at) => binOf[at]))].sort((u, v) => u - v);
    if (covParts.length + keys.length > 65535) fail('INVALID_ARGUMENT', `binWidth ${binWidth} gives too many autocorrelation bins; use a wider bin`);
    const local = new Map<number, number>();
    keys.forEach((b, g) => local.set(b, g));
    const proj = new Float64Array(keys.length * size);
    const rhoOfGroup = new Float64Array(keys.length);
    const xw = new Float64Array(size);
    const base = covParts.length;
    keys.forEach((b, g) => {
      const r = Math.max(-maxAbsRho, Math.min(maxAbsRho, b * binWidth));
      rhoOfGroup[g] = r;
      covParts.push(Float64Array.from(ar1WhitenedProjector(d.x, d.columns, nt, p, r, xw, proj, g * size)));
    });
    const g = new Uint16Array(nc);
    for (let i = 0; i < nc; i++) {
      g[i] = local.get(binOf[cv.pos[i]]) as number;
      group[cv.pos[i]] = base + g[i];
    }
    const b = new Float64Array(p * nc), r = new Float64Array(nc);
    // 4. each voxel refitted with its design's whitened projector for its bin
    sweepVoxels({ data: run.data, nvox, nt, p, idx: cv.idx, x: d.x, proj, group: g, rhoOfGroup, betas: b, rss: r, mean: null, lag1: null, residuals });
    scatter(cv, b, r, null);
  }
  const cov = new Float64Array(covParts.length * p * p);
  covParts.forEach((c, g) => cov.set(c, g * p * p));
  const sigma2 = new Float64Array(n);
  for (let i = 0; i < n; i++) sigma2[i] = rss[i] / dof;
  return { method: 'ar1', design: d0, grid: gridOf(run), voxels: idx, betas, sigma2, dof, meanSignal: mean, covUnscaled: cov, group, rho, residuals: residuals ? volumeLike(run, nt, residuals) : null };
}
