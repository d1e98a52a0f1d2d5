import { volumeLike, voxelsPerVolume, type Volume } from '../core/volume.js';
import { designPseudoInverse } from './design-matrix.js';
import type { DesignMatrix } from './design-matrix.js';
import { checkRunAndDesign, fitInput, fittedVoxels, gridOf, residualsArray, type GlmFit, type GlmOptions } from './glm-fit.js';
import { sweepVoxels, transposeToTimeMajor } from './glm-kernel.js';

/**
 * Ordinary least squares GLM for every voxel at once. One pseudo-inverse (X'X)^-1 X' (from an SVD of
 * the design) serves all voxels; each voxel's series is read straight from the Float32 run, two
 * neighbouring voxels at a time, with Float64 accumulators, so memory stays one copy of the run plus
 * p x voxels betas (see glm-kernel.ts for the loop layout).
 *
 * Residual sum of squares: computed from the residuals themselves in a second pass over the voxel
 * pair, not as y'y - beta'X'y. The shortcut subtracts two numbers of the size of sum y^2; with an
 * fMRI baseline ~100 times the noise they agree in their first ~4 digits, and a near-perfect fit can
 * even give a negative RSS. The second pass costs about as much as the first, but the pair's cache
 * lines are still warm.
 * @param run - the run (not modified)
 * @param design - design with one row per volume
 * @param options - mask, keepResiduals
 * @returns the fit: betas, sigma2 = RSS / (nt - p), dof = nt - p, temporal means, (X'X)^-1
 * @throws BoldsweepError NOT_4D, INVALID_ARGUMENT, TOO_FEW_VOLUMES, GRID_MISMATCH, RANK_DEFICIENT
 * @example const fit = fitGlm(run.volume, design, { mask: brainMask })
 */
export function fitGlm(run: Volume, design: DesignMatrix, options: GlmOptions = {}): GlmFit {
  const dof = checkRunAndDesign(run, design, 0);
  const { nt, p, x } = design;
  const { pinv, xtxInv } = designPseudoInverse(design);
  const idx = fittedVoxels(run, options.mask);
  const n = idx.length;
  const nvox = voxelsPerVolume(run);
  const proj = transposeToTimeMajor(pinv, p, nt); // t-major, see glm-kernel.ts
  const betas = new Float64Array(p * n);
  const rss = new Float64Array(n);
  const mean = new Float64Array(n);
  const residuals = residualsArray(options, nvox, nt, idx);
  const input = fitInput(run, options, idx);
  sweepVoxels({ data: input.data, nvox: input.stride, nt, p, idx: input.at, x, proj, group: null, rhoOfGroup: null, betas, rss, mean, lag1: null, residuals });
  const sigma2 = new Float64Array(n);
  for (let i = 0; i < n; i++) sigma2[i] = rss[i] / dof;
  return {
    method: 'ols',
    design,
    grid: gridOf(run),
    voxels: idx,
    betas,
    sigma2,
    dof,
    meanSignal: mean,
    covUnscaled: xtxInv,
    group: null,
    rho: null,
    residuals: residuals && !options.packed ? volumeLike(run, nt, residuals) : null,
    ...(options.packed ? { packedResiduals: residuals } : {}),
  };
}
