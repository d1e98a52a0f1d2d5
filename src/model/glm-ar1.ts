import { fail } from '../core/fail.js';
import { volumeLike, voxelsPerVolume, type Volume } from '../core/volume.js';
import { ar1BiasTraces, correctAr1 } from './ar1.js';
import { ar1WhitenedProjector } from './ar1-whitened-projector.js';
import { designPseudoInverse, type DesignMatrix } from './design-matrix.js';
import { checkRunAndDesign, fitInput, fittedVoxels, gridOf, residualsArray, type GlmFit, type GlmOptions } from './glm-fit.js';
import { sweepVoxels, transposeToTimeMajor } from './glm-kernel.js';
import { smoothWithinMask } from './smooth-within-mask.js';

/**
 * Default FWHM (mm) of the Gaussian kernel applied to the autocorrelation map before whitening.
 * Worsley et al. (2002, NeuroImage 15:1-15) smooth the bias-corrected autocorrelation spatially and
 * use about 15 mm (value from memory), trading a little spatial bias in rho for much less
 * estimation noise, which otherwise inflates the t statistics' tails.
 */
export const DEFAULT_AR1_SMOOTH_FWHM_MM = 15;

/** Options for {@link fitGlmAr1}. */
export interface GlmAr1Options extends GlmOptions {
  /**
   * Width of the autocorrelation bins: voxels whose corrected rho rounds to the same multiple share
   * one whitened design (common practice, no source). __Default value:__ 0.01
   */
  binWidth?: number;
  /** Estimates are clipped to [-maxAbsRho, maxAbsRho] so whitening stays defined. __Default value:__ 0.99 */
  maxAbsRho?: number;
  /**
   * FWHM in mm of the Gaussian kernel that smooths the bias-corrected autocorrelation map within
   * the fitted voxels ({@link smoothWithinMask}) before binning; 0 uses each voxel's own estimate.
   * __Default value:__ 15 ({@link DEFAULT_AR1_SMOOTH_FWHM_MM})
   */
  ar1SmoothFwhmMm?: number;
}

/**
 * GLM with AR(1) noise, by prewhitening:
 * 1. OLS fit of every voxel; lag-1 autocorrelation of its residuals, bias-corrected with the
 *    Worsley et al. (2002, NeuroImage 15:1-15) traces of the design ({@link correctAr1}), clipped;
 * 2. the rho map is smoothed with a Gaussian kernel (15 mm FWHM by default) within the fitted
 *    voxels, as Worsley et al. (2002) do: a single voxel's estimate has a standard error of about
 *    1/sqrt(nt) (0.07-0.1 for 100-200 volumes; Bartlett's approximation, from memory), and
 *    whitening with that noise inflates the tails of t;
 * 3. voxels are grouped into bins of rho (width 0.01 by default, common practice, no source) and each
 *    bin gets its own Prais-Winsten whitened design W X (rho = the bin centre);
 * 4. each voxel is refitted with its bin's design (the whitening of y is folded into the bin's
 *    projector, so the run is read in place, never copied whitened); residual
 *    variance comes from the whitened residuals.
 * Degrees of freedom: nt - p - 1, counting the estimated autocorrelation as one fitted parameter
 * (a conservative convention, common practice, no source).
 * @param run - the run (not modified)
 * @param design - design with one row per volume (unwhitened)
 * @param options - mask, keepResiduals (whitened residuals), binWidth, maxAbsRho, ar1SmoothFwhmMm
 * @returns the fit; `rho` holds the corrected (and, unless ar1SmoothFwhmMm is 0, smoothed)
 *   estimates used for whitening, `group` each voxel's bin, `covUnscaled` one (X'W'WX)^-1 per bin
 * @throws BoldsweepError NOT_4D, INVALID_ARGUMENT, TOO_FEW_VOLUMES, GRID_MISMATCH, RANK_DEFICIENT
 * @example const fit = fitGlmAr1(run.volume, design, { mask: brainMask })
 */
export function fitGlmAr1(run: Volume, design: DesignMatrix, options: GlmAr1Options = {}): GlmFit {
  const binWidth = options.binWidth ?? 0.01;
  const maxAbsRho = options.maxAbsRho ?? 0.99;
  if (!(binWidth > 0 && binWidth <= 0.5)) fail('INVALID_ARGUMENT', `binWidth must be in (0, 0.5], got ${binWidth}`);
  if (!(maxAbsRho >= 0 && maxAbsRho < 1)) fail('INVALID_ARGUMENT', `maxAbsRho must be in [0, 1), got ${maxAbsRho}`);
  const smoothFwhmMm = options.ar1SmoothFwhmMm ?? DEFAULT_AR1_SMOOTH_FWHM_MM;
  if (!(smoothFwhmMm >= 0) || !Number.isFinite(smoothFwhmMm)) fail('INVALID_ARGUMENT', `ar1SmoothFwhmMm must be finite and >= 0 mm, got ${smoothFwhmMm}`);
  const dof = checkRunAndDesign(run, design, 1);
  const { nt, p, x } = design;
  const idx = fittedVoxels(run, options.mask);
  const n = idx.length;
  const nvox = voxelsPerVolume(run);

  // 1. OLS pass: residual lag-0 and lag-1 sums, temporal means
  const ols = designPseudoInverse(design);
  const proj0 = transposeToTimeMajor(ols.pinv, p, nt);
  const betas = new Float64Array(p * n);
  const a0 = new Float64Array(n);
  const a1 = new Float64Array(n);
  const mean = new Float64Array(n);
  const input = fitInput(run, options, idx);
  sweepVoxels({ data: input.data, nvox: input.stride, nt, p, idx: input.at, x, proj: proj0, group: null, rhoOfGroup: null, betas, rss: a0, mean, lag1: a1, residuals: null });

  // 2. corrected rho, clipped, smoothed within the fitted voxels (a weighted mean of clipped
  // values stays within the clip), then binned
  const traces = ar1BiasTraces(design);
  const est = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const r = correctAr1(a0[i], a1[i], traces);
    est[i] = Number.isFinite(r) ? Math.max(-maxAbsRho, Math.min(maxAbsRho, r)) : 0;
  }
  const rho = smoothFwhmMm > 0 ? smoothWithinMask(est, idx, [run.dims[0], run.dims[1], run.dims[2]], run.spacingMm, smoothFwhmMm) : Float32Array.from(est);
  // unsmoothed, bins come from the Float64 estimates (as before this option existed)
  const used: ArrayLike<number> = smoothFwhmMm > 0 ? rho : est;
  // 3. bins
  const binOf = new Int32Array(n);
  const bins = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const b = Math.round(used[i] / binWidth);
    binOf[i] = b;
    if (!bins.has(b)) bins.set(b, 0);
  }
  const keys = [...bins.keys()].sort((u, v) => u - v);
  if (keys.length > 65535) fail('INVALID_ARGUMENT', `binWidth ${binWidth} gives ${keys.length} autocorrelation bins; use a wider bin`);
  keys.forEach((b, g) => bins.set(b, g));
  const group = new Uint16Array(n);
  for (let i = 0; i < n; i++) group[i] = bins.get(binOf[i]) as number;

  // 4. one whitened design per bin; whitening of y folded into the projector
  const ng = keys.length;
  const size = nt * p;
  const proj = new Float64Array(ng * size);
  const cov = new Float64Array(ng * p * p);
  const rhoOfGroup = new Float64Array(ng);
  const xw = new Float64Array(size);
  keys.forEach((b, g) => {
    const r = Math.max(-maxAbsRho, Math.min(maxAbsRho, b * binWidth));
    rhoOfGroup[g] = r;
    cov.set(ar1WhitenedProjector(x, design.columns, nt, p, r, xw, proj, g * size), g * p * p);
  });
  const rss = new Float64Array(n);
  const residuals = residualsArray(options, nvox, nt, idx);
  sweepVoxels({ data: input.data, nvox: input.stride, nt, p, idx: input.at, x, proj, group, rhoOfGroup, betas, rss, mean: null, lag1: null, residuals });
  const sigma2 = new Float64Array(n);
  for (let i = 0; i < n; i++) sigma2[i] = rss[i] / dof;
  return {
    method: 'ar1',
    design,
    grid: gridOf(run),
    voxels: idx,
    betas,
    sigma2,
    dof,
    meanSignal: mean,
    covUnscaled: cov,
    group,
    rho,
    residuals: residuals && !options.packed ? volumeLike(run, nt, residuals) : null,
    ...(options.packed ? { packedResiduals: residuals } : {}),
  };
}
