import { fail } from '../core/fail.js';
import { oneSampleT } from '../model/one-sample-t.js';
import { estimateSmoothness } from '../model/smoothness.js';
import { tToZ } from '../model/t-to-z.js';
import type { ThresholdRule } from './spec.js';
import { applyThresholdRule } from './threshold-rule.js';

/** What {@link groupLevelTest} returns: the group map, its threshold and the smoothness behind it. */
export interface GroupLevelResult {
  /** One-sample t per voxel (S - 1 degrees of freedom). */
  t: Float32Array;
  /** z with the same upper tail as t (tToZ). */
  z: Float32Array;
  /** Mean effect across subjects (the subjects' unit, e.g. percent signal change). */
  meanEffect: Float32Array;
  dof: number;
  /** Name of the threshold rule that made the survivors. */
  rule: string;
  /** t threshold. */
  threshold: number;
  /** 1 where t >= threshold inside the mask. */
  survivors: Uint8Array;
  /** Smoothness of the second-level residuals, FWHM mm per axis (NaN per axis when the rule needs none and S < 4). */
  fwhmMm: [number, number, number];
}

/** Rules that read the smoothness of the map (random-field theory). */
const USES_SMOOTHNESS = new Set<ThresholdRule['kind']>(['fwe-rft', 'cluster']);

/**
 * The group level of a study: the one-sample t-test of the subjects' effect estimates at every voxel
 * (Holmes & Friston 1998, NeuroImage 7:S754), t converted to z, and the threshold rule of the first
 * level applied to the t map with S - 1 degrees of freedom. For random-field rules the smoothness is
 * estimated from the second-level residuals (each subject's deviation from the group mean; Kiebel et al.
 * 1999 with nu = S - 1), the smoothness of the group map's own noise.
 * @param effects - one effect map per subject, same grid
 * @param mask - search region (the group's brain mask)
 * @param dims - [nx, ny, nz]
 * @param spacingMm - voxel size
 * @param rule - the sweep's threshold rule (not fwe-calibrated: no null designs exist for a group map)
 * @returns t, z, mean effect, survivors, threshold and residual smoothness
 * @throws BoldsweepError TOO_FEW_SUBJECTS (fewer than 3; fewer than 5 for a random-field rule, whose
 *   t-field theory needs nu > 3), STUDY_RULE_UNSUPPORTED for fwe-calibrated
 * @example const g = groupLevelTest(effects, brain, [64, 64, 36], [3.5, 3.5, 3.5], spec.threshold)
 */
export function groupLevelTest(effects: readonly ArrayLike<number>[], mask: Uint8Array, dims: readonly number[], spacingMm: readonly number[], rule: ThresholdRule): GroupLevelResult {
  if (rule.kind === 'fwe-calibrated') fail('STUDY_RULE_UNSUPPORTED', 'threshold.kind fwe-calibrated cannot threshold a group map');
  const s = effects.length;
  if (USES_SMOOTHNESS.has(rule.kind) && s < 5) fail('TOO_FEW_SUBJECTS', `the ${rule.kind} rule needs at least 5 subjects: random-field thresholds for t maps need more than 3 degrees of freedom; got ${s}`);
  const g = oneSampleT(effects, mask);
  const n = mask.length;
  const z = new Float32Array(n);
  for (let v = 0; v < n; v++) if (mask[v]) z[v] = tToZ(g.t[v], g.dof);
  let fwhmMm: [number, number, number] = [NaN, NaN, NaN];
  if (s >= 4) fwhmMm = estimateSmoothness(g.residuals, [dims[0], dims[1], dims[2], s], mask, spacingMm, { dof: g.dof }).fwhmMm;
  const thr = applyThresholdRule(g.t, mask, dims, rule, { kind: 't', dof: g.dof }, fwhmMm, spacingMm);
  return { t: g.t, z, meanEffect: g.mean, dof: g.dof, rule: thr.rule, threshold: thr.threshold, survivors: thr.survivors, fwhmMm };
}
