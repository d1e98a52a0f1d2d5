import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import type { Volume } from '../core/volume.js';
import type { LookResult } from './look-at-run.js';
import { lookMotionWithSignature } from './look-motion-with-signature.js';
import { rankFindings } from './rank-findings.js';

/**
 * A look with a motion table added after the fact (say one the look's caller estimated from the run
 * once the look had made its brain mask): framewise displacement, the head-motion finding ranked among
 * the others, the verdicts. The rest of the look is unchanged.
 * @param look - the look (not modified)
 * @param run - the run it was made from
 * @param table - one row per volume (shifts mm, rotations degrees)
 * @param source - 'given' or 'estimated'
 * @param method - how the table was obtained, in words (it appears in the finding and on the page)
 * @returns a new look
 * @throws BoldsweepError MOTION_TABLE_LENGTH, MOTION_TABLE_INVALID
 * @example const moved = withLookMotion(look, run.volume, table, 'estimated', 'rigid, least squares')
 */
export function withLookMotion(look: LookResult, run: Volume, table: readonly MotionRow[], source: 'given' | 'estimated', method: string): LookResult {
  // the edge signature does not depend on the table: keep the one the look computed
  const { motion, finding } = lookMotionWithSignature(look.motion.edgeSignature, run.dims[3], { table, source, method, fdThresholdMm: look.settings.fdThresholdMm, firstVolume: look.recommendation.dropInitialVolumes });
  const findings = rankFindings([...look.findings.filter((f) => f.kind !== 'head-motion'), ...(finding ? [finding] : [])]);
  return { ...look, motion, findings, verdicts: findings.map((f) => f.verdict) };
}
