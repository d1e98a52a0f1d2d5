import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { fail } from '../core/fail.js';
import { fdCensorVolumes } from '../model/fd-censor-volumes.js';
import { FD_CENSOR_THRESHOLD_MM, FD_SPHERE_RADIUS_MM, framewiseDisplacement } from '../model/framewise-displacement.js';
import type { Finding } from './finding-types.js';
import { FINDING_ADVICE, describeVolumes } from './finding-text.js';
import type { MotionEdgeSignature } from './motion-edge-signature.js';
import type { LookMotion } from './look-motion.js';

/**
 * lookMotion with the motion edge signature already known (the look computes it in its mask-series
 * pass; a look given a motion table later keeps its own).
 * @param edgeSignature - the signature, or null when the mask has no usable edge
 * @param nt - volumes of the run
 * @param options - as lookMotion's
 * @returns the motion summary and its finding
 * @throws BoldsweepError MOTION_TABLE_LENGTH for a table of another length; MOTION_TABLE_INVALID for NaN
 * @example const { motion } = lookMotionWithSignature(null, 200, { table: null, source: null, method: 'none' })
 */
export function lookMotionWithSignature(edgeSignature: MotionEdgeSignature | null, nt: number, options: { table: readonly MotionRow[] | null; source: 'given' | 'estimated' | null; method: string; fdThresholdMm?: number; firstVolume?: number }): { motion: LookMotion; finding: Finding | null } {
  const threshold = options.fdThresholdMm ?? FD_CENSOR_THRESHOLD_MM;
  if (!(threshold > 0)) fail('INVALID_ARGUMENT', `the framewise-displacement threshold must be a positive number of mm, got ${threshold}`);
  const table = options.table ? options.table.map((r, t) => ({ ...r, volume: t })) : null;
  if (table && table.length !== nt) fail('MOTION_TABLE_LENGTH', `the motion table has ${table.length} rows, the run has ${nt} volumes`, { details: { rows: table.length, volumes: nt } });
  const fdMm = table ? framewiseDisplacement(table) : null;
  const first = options.firstVolume ?? 0;
  // the first kept volume's FD is the move from a dropped volume: not part of the kept run
  const aboveThreshold = fdMm ? fdCensorVolumes(fdMm, threshold).filter((t) => t > first) : [];
  const motion: LookMotion = { table, source: table ? options.source : null, method: table ? options.method : 'none', fdMm, fdThresholdMm: threshold, aboveThreshold, edgeSignature };
  return { motion, finding: fdMm && aboveThreshold.length ? motionFinding(motion, fdMm, first) : null };
}

function motionFinding(motion: LookMotion, fdMm: Float64Array, first: number): Finding {
  const volumes = motion.aboveThreshold;
  const n = volumes.length;
  let max = 0, sum = 0;
  for (let t = first + 1; t < fdMm.length; t++) { max = Math.max(max, fdMm[t]); sum += fdMm[t]; }
  const mean = sum / Math.max(1, fdMm.length - first - 1);
  const kept = fdMm.length - first;
  const thr = motion.fdThresholdMm;
  const r = (x: number) => Math.round(x * 1000) / 1000;
  const evidence: Finding['evidence'] = {
    fdMm: volumes.map((t) => r(fdMm[t])), thresholdMm: thr, maxFdMm: r(max), meanFdMm: r(mean), sphereRadiusMm: FD_SPHERE_RADIUS_MM,
    fractionOfKeptVolumes: r(n / kept), motionTable: motion.method,
  };
  const sig = motion.edgeSignature;
  if (sig) evidence.edgeSignaturePct = volumes.map((t) => r(Math.max(Math.abs(sig.axes[0][t]), Math.abs(sig.axes[1][t]), Math.abs(sig.axes[2][t]))));
  return {
    kind: 'head-motion', volumes, slices: [], voxels: [], evidence,
    reason: `framewise displacement (Power et al. 2012: shifts plus rotations as arc length on a ${FD_SPHERE_RADIUS_MM} mm sphere) is above ${thr} mm at ${describeVolumes(volumes)} (up to ${max.toFixed(2)} mm; mean over the kept volumes ${mean.toFixed(3)} mm), from the ${motion.source === 'estimated' ? 'estimated ' : ''}motion table (${motion.method})`,
    advice: FINDING_ADVICE['head-motion'],
    verdict: `${n} volume${n === 1 ? '' : 's'} above ${thr} mm FD (max ${max.toFixed(2)} mm): censor by FD or model the motion`,
    consequence: `${n} of ${kept} kept volumes censored when the model censors above ${thr} mm FD`,
  };
}
