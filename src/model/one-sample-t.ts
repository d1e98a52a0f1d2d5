import { fail } from '../core/fail.js';

/** Result of {@link oneSampleT}: the second-level maps of a one-sample t-test across subjects. */
export interface OneSampleT {
  /** t = mean / (SD / sqrt(S)) per voxel; 0 outside the mask and where every subject has the same value. */
  t: Float32Array;
  /** Mean of the subjects' effect estimates per voxel (0 outside the mask). */
  mean: Float32Array;
  /** Sample standard deviation (divisor S - 1) per voxel (0 outside the mask). */
  sd: Float32Array;
  /** Degrees of freedom, S - 1. */
  dof: number;
  /**
   * Second-level residuals, subject s's deviation from the mean, NIfTI order with subjects as the
   * fourth axis (length n x S; 0 outside the mask): what the random-field rules estimate smoothness from.
   */
  residuals: Float32Array;
}

/**
 * The second level of the summary-statistics approach (Holmes AP & Friston KJ 1998, NeuroImage
 * 7:S754; REFERENCES.md §18): each subject's effect estimate per voxel from its own first-level fit,
 * then a one-sample t-test across subjects at every voxel, t = mean / (SD / sqrt(S)) with S - 1
 * degrees of freedom. Sums are in Float64 and the variance takes two passes (mean first), so a large
 * common offset does not cancel the spread.
 * @param effects - one effect map per subject (length n each, same grid)
 * @param mask - nonzero = tested, length n
 * @returns t, mean, SD, dof and the residuals (deviations from the mean)
 * @throws BoldsweepError TOO_FEW_SUBJECTS for fewer than 3 subjects (2 leave one degree of freedom and
 *   no smoothness estimate), GRID_MISMATCH for maps of another length, NON_FINITE_VOXELS for NaN/Inf in the mask
 * @example const { t, dof } = oneSampleT([betaSub1, betaSub2, betaSub3], brainMask) // dof 2
 */
export function oneSampleT(effects: readonly ArrayLike<number>[], mask: ArrayLike<number>): OneSampleT {
  const s = effects.length;
  if (s < 3) fail('TOO_FEW_SUBJECTS', `a group-level test needs at least 3 subjects' effect maps, got ${s}`);
  const n = mask.length;
  effects.forEach((e, i) => { if (e.length !== n) fail('GRID_MISMATCH', `subject ${i + 1}'s effect map has ${e.length} voxels, the mask ${n}`); });
  const t = new Float32Array(n), mean = new Float32Array(n), sd = new Float32Array(n), residuals = new Float32Array(n * s);
  const rootS = Math.sqrt(s);
  for (let v = 0; v < n; v++) {
    if (!mask[v]) continue;
    let sum = 0;
    for (let i = 0; i < s; i++) {
      const x = effects[i][v];
      if (!Number.isFinite(x)) fail('NON_FINITE_VOXELS', `subject ${i + 1}'s effect map is not finite at voxel ${v} inside the mask`);
      sum += x;
    }
    const m = sum / s;
    let ss = 0;
    for (let i = 0; i < s; i++) {
      const d = effects[i][v] - m;
      ss += d * d;
      residuals[v + n * i] = d;
    }
    const sdv = Math.sqrt(ss / (s - 1));
    mean[v] = m;
    sd[v] = sdv;
    // identical values in every subject: no evidence either way (a test of no spread is undefined)
    t[v] = sdv > 0 ? m / (sdv / rootS) : 0;
  }
  return { t, mean, sd, dof: s - 1, residuals };
}
