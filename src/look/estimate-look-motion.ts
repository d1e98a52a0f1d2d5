import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { makeVolume, voxelsPerVolume, type Volume } from '../core/volume.js';
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
 * @param fromVolume - first volume estimated (the look's dropped volumes, brighter than the rest, would
 *   pass for motion under a least-squares cost); earlier ones take its pose. __Default value:__ 0
 * @returns the motion table and its method in words
 * @throws BoldsweepError from the registration (REGISTRATION_NOT_CONVERGED naming the volume, ...)
 * @example const { table, method } = await estimateLookMotion(run.volume, look.mask.mask)
 */
export async function estimateLookMotion(run: Volume, mask: Uint8Array, fromVolume = 0): Promise<{ table: MotionRow[]; method: string }> {
  const nt = run.dims[3];
  const from = Math.max(0, Math.min(fromVolume, nt - 2));
  const n = voxelsPerVolume(run);
  const kept = from === 0 ? run : makeVolume({ dims: [run.dims[0], run.dims[1], run.dims[2], nt - from], spacingMm: [...run.spacingMm], trSec: run.trSec, affine: run.affine, data: run.data.subarray(from * n) });
  const m = await estimateRunMotion(kept, { reference: 'middle', model: 'rigid', cost: 'least-squares', levels: [...LOOK_MOTION_LEVELS], mask, workers: 2 });
  const table = Array.from({ length: nt }, (_, t) => {
    const r = m.rows[Math.max(0, t - from)];
    return { volume: t, shiftXMm: r.shiftXMm, shiftYMm: r.shiftYMm, shiftZMm: r.shiftZMm, rotXDeg: r.rotXDeg, rotYDeg: r.rotYDeg, rotZDeg: r.rotZDeg };
  });
  const reference = from + (m.referenceIndex ?? Math.floor((nt - from) / 2));
  return { table, method: `estimated by the look as a quick screen: rigid, least squares, every volume${from ? ` from volume ${from} on (the dropped ones take its pose)` : ''} to the middle volume (${reference}), coarse levels ${LOOK_MOTION_LEVELS.join(' and ')} only, weighted by the brain mask` };
}
