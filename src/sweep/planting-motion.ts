import type { Vec3 } from '../core/affine.js';
import { makeVolume, voxelsPerVolume, type Volume } from '../core/volume.js';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { estimateRunMotion } from '../register/estimate-run-motion.js';
import { stableHash } from './stable-hash.js';
import { readCachedEstimate, writeCachedEstimate } from './stage-cache.js';

/**
 * The stated setting of the motion estimate a sweep plants with when it is given no motion table:
 * every kept volume registered rigidly (6 parameters) to the middle one (see plantingMotion) by least
 * squares (Gauss-Newton), multi-resolution levels 4, 2, 1, weighted by the sweep's brain mask. The
 * registration engine splits the volumes into chunks by its worker count and starts each volume from
 * the previous one's estimate within a chunk, so the count is fixed here: the same run gives the same
 * table (and the same cache keys and scorecard) whatever the sweep's own worker count or shard.
 */
export const PLANTING_MOTION_SETTINGS = { reference: 'middle', model: 'rigid', cost: 'least-squares', levels: [4, 2, 1], workers: 2 } as const;

/** Bump when the planting motion estimate changes for the same run (it is in the estimate's cache key). */
export const PLANTING_MOTION_VERSION = 1;

/** The motion a sweep plants with, estimated from the run. */
export interface PlantingMotion {
  /** One row per volume: the head's pose relative to the middle volume (shifts mm, rotations degrees). */
  table: MotionRow[];
  /** World point (mm) the rotations turn about (the grid's centre). */
  centreMm: Vec3;
  /** The reference volume's index. */
  referenceIndex: number;
  /** The setting in words, for the sweep's notes and the methods text. */
  method: string;
  /** Cache key of the estimate. */
  key: string;
  /** Seconds the estimate took (0 when read from the cache). */
  seconds: number;
  fromCache: boolean;
}

/** What the cache keeps of a planting motion estimate. */
interface StoredMotion {
  table: MotionRow[];
  centreMm: Vec3;
  referenceIndex: number;
}

/**
 * The run's head motion for planting, estimated once with {@link PLANTING_MOTION_SETTINGS} on the
 * unplanted run and kept in the sweep's cache (`<cache>/estimates/<key>.json`; the key holds the run's
 * hash, the brain mask's hash, the settings and {@link PLANTING_MOTION_VERSION}). The same table gives
 * planting its poses and the model its motion regressors and framewise displacement.
 * @param volume - the run (not modified)
 * @param brainMask - the sweep's brain mask (registration weights)
 * @param hashes - SHA-256 of the run and of the brain mask (what the key is made of)
 * @param cacheDir - the sweep's cache folder, or null to keep nothing
 * @param fromVolume - first volume estimated: the fewest initial volumes any setting drops. Volumes
 *   before it (not yet at steady state, brighter than the rest, which a least-squares cost would take
 *   for motion) are given the first estimated volume's pose. __Default value:__ 0
 * @returns the motion table, its rotation centre, the reference index and how it was obtained
 * @throws BoldsweepError from the registration (REGISTRATION_NOT_CONVERGED naming the volume, NON_FINITE_VOXELS, ...)
 * @example const motion = await plantingMotion(run.volume, brainMask, { runHash, maskHash }, 'out/cache')
 */
export async function plantingMotion(volume: Volume, brainMask: Uint8Array, hashes: { runHash: string; maskHash: string }, cacheDir: string | null, fromVolume = 0): Promise<PlantingMotion> {
  const s = PLANTING_MOTION_SETTINGS;
  const nt = volume.dims[3];
  const from = Math.max(0, Math.min(fromVolume, nt - 2));
  const middle = from + Math.floor((nt - from) / 2);
  const key = stableHash({ stage: 'planting-motion', version: PLANTING_MOTION_VERSION, settings: s, fromVolume: from, ...hashes });
  const method = `rigid (6 parameters), least squares, every volume${from ? ` from volume ${from} on (the earlier ones, dropped, take volume ${from}'s pose)` : ''} to the middle volume (${middle}), levels ${s.levels.join(', ')}, weighted by the brain mask`;
  const cached = cacheDir ? readCachedEstimate(cacheDir, key) : null;
  if (cached) {
    const v = cached.value as StoredMotion;
    return { table: v.table, centreMm: v.centreMm, referenceIndex: v.referenceIndex, method, key, seconds: 0, fromCache: true };
  }
  const t0 = performance.now();
  const n = voxelsPerVolume(volume);
  // the kept volumes as a view (no copy)
  const kept = from === 0 ? volume : makeVolume({ dims: [volume.dims[0], volume.dims[1], volume.dims[2], nt - from], spacingMm: [...volume.spacingMm], trSec: volume.trSec, affine: volume.affine, data: volume.data.subarray(from * n) });
  const m = await estimateRunMotion(kept, { reference: s.reference, model: s.model, cost: s.cost, levels: s.levels, mask: brainMask, workers: s.workers });
  const row = (t: number): MotionRow => {
    const r = m.rows[Math.max(0, t - from)];
    return { volume: t, shiftXMm: r.shiftXMm, shiftYMm: r.shiftYMm, shiftZMm: r.shiftZMm, rotXDeg: r.rotXDeg, rotYDeg: r.rotYDeg, rotZDeg: r.rotZDeg };
  };
  const table: MotionRow[] = Array.from({ length: nt }, (_, t) => row(t));
  const value: StoredMotion = { table, centreMm: [...m.centreMm] as Vec3, referenceIndex: from + (m.referenceIndex ?? Math.floor((nt - from) / 2)) };
  const seconds = (performance.now() - t0) / 1000;
  if (cacheDir) await writeCachedEstimate(cacheDir, { key, value, hash: stableHash({ estimate: value }), seconds });
  return { ...value, method, key, seconds, fromCache: false };
}
