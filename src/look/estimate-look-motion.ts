import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import type { Volume } from '../core/volume.js';
import { estimateRunMotion } from '../register/estimate-run-motion.js';

/** Multi-resolution levels of the look's motion estimate: coarse only, a screen (a sweep's estimate adds level 1). */
export const LOOK_MOTION_LEVELS = [4, 2] as const;

/**
 * A quick estimate of a run's head motion for the look: rigid (6 parameters), least squares, every
 * volume to the middle one, at the coarse levels {@link LOOK_MOTION_LEVELS} only (every 4th, then every
 * 2nd voxel along each axis, smoothed to 4 and 2 voxels), weighted by the look's brain mask. Enough to
 * find the volumes that moved by more than a few tenths of a mm; the full-resolution level a sweep's
 * estimate adds refines the values, not which volumes moved. The look itself never runs it unasked
 * (it would add a registration of every volume to a read of the run).
 * @param run - the run
 * @param mask - the look's brain mask (registration weights)
 * @returns the motion table and its method in words
 * @throws BoldsweepError from the registration (REGISTRATION_NOT_CONVERGED naming the volume, ...)
 * @example const { table, method } = await estimateLookMotion(run.volume, look.mask.mask)
 */
export async function estimateLookMotion(run: Volume, mask: Uint8Array): Promise<{ table: MotionRow[]; method: string }> {
  const m = await estimateRunMotion(run, { reference: 'middle', model: 'rigid', cost: 'least-squares', levels: [...LOOK_MOTION_LEVELS], mask, workers: 2 });
  const table = m.rows.map((r, t) => ({ volume: t, shiftXMm: r.shiftXMm, shiftYMm: r.shiftYMm, shiftZMm: r.shiftZMm, rotXDeg: r.rotXDeg, rotYDeg: r.rotYDeg, rotZDeg: r.rotZDeg }));
  return { table, method: `estimated by the look as a quick screen: rigid, least squares, every volume to the middle volume (${m.referenceIndex}), coarse levels ${LOOK_MOTION_LEVELS.join(' and ')} only, weighted by the brain mask` };
}
