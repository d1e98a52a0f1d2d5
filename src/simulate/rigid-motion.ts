import { affineFromRows, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Rng } from '../core/random.js';

/** One row of a motion table: the head's rigid position at one volume relative to its position at volume 0. */
export interface MotionRow {
  /** Volume index, 0-based. */
  volume: number;
  shiftXMm: number;
  shiftYMm: number;
  shiftZMm: number;
  rotXDeg: number;
  rotYDeg: number;
  rotZDeg: number;
}

/**
 * An abrupt head movement: from `volume` on, the head sits at a new position (added to the slow
 * wander), either for good or, like a cough or a swallow, for a few volumes before it settles back.
 */
export interface MotionJerk {
  /** First volume (0-based) at the new position. */
  volume: number;
  /** Volumes spent at the new position before the head returns; null: it stays there. __Default value:__ null */
  durationVolumes?: number | null;
  /** Step in x, y, z shift, mm. */
  shiftMm: Vec3;
  /** Step in rotation about x, y, z, degrees. */
  rotationDeg: Vec3;
}

/** How the simulated head moves. */
export interface MotionSpec {
  /** Standard deviation of the per-volume steps of a slow random walk of each shift, mm. __Default value:__ 0.01 */
  wanderStepMm: number;
  /** Standard deviation of the per-volume steps of a slow random walk of each rotation, degrees. __Default value:__ 0.01 */
  wanderStepDeg: number;
  /** An abrupt movement, or null for none. __Default value:__ null */
  jerk: MotionJerk | null;
}

/**
 * The rigid transform (world mm -> world mm) that a motion-table row describes:
 * p' = R (p - c) + c + t, with R = Rz Ry Rx (rotation about x applied first; equal to scipy's
 * Rotation.from_euler('xyz', ...) extrinsic convention) about the centre c.
 * @param row - shifts (mm) and rotations (degrees)
 * @param centreMm - world point the rotations turn about (e.g. the head centre)
 * @returns row-major 4x4 affine
 * @example rigidMotionAffine({ volume: 0, shiftXMm: 1, shiftYMm: 0, shiftZMm: 0, rotXDeg: 0, rotYDeg: 0, rotZDeg: 0 }, [0, 0, 0])
 */
export function rigidMotionAffine(row: Omit<MotionRow, 'volume'>, centreMm: Readonly<Vec3>): Affine {
  const d = Math.PI / 180;
  const [cx, sx] = [Math.cos(row.rotXDeg * d), Math.sin(row.rotXDeg * d)];
  const [cy, sy] = [Math.cos(row.rotYDeg * d), Math.sin(row.rotYDeg * d)];
  const [cz, sz] = [Math.cos(row.rotZDeg * d), Math.sin(row.rotZDeg * d)];
  // Rz Ry Rx written out
  const r = [
    [cz * cy, cz * sy * sx - sz * cx, cz * sy * cx + sz * sx],
    [sz * cy, sz * sy * sx + cz * cx, sz * sy * cx - cz * sx],
    [-sy, cy * sx, cy * cx],
  ];
  const t = [row.shiftXMm, row.shiftYMm, row.shiftZMm];
  return affineFromRows(r.map((rr, i) => [rr[0], rr[1], rr[2], t[i] + centreMm[i] - (rr[0] * centreMm[0] + rr[1] * centreMm[1] + rr[2] * centreMm[2])]));
}

/**
 * A motion table: each of the six parameters follows a slow random walk starting at 0 (volume 0 is
 * the reference position), plus an optional abrupt step (jerk), lasting or transient.
 * @param nVolumes - number of volumes
 * @param spec - wander step sizes and the jerk
 * @param rng - seeded random stream (consumed: six normal draws per volume after the first)
 * @returns one row per volume
 * @example simulatedMotionTable(150, { wanderStepMm: 0.01, wanderStepDeg: 0.01, jerk: null }, createRng(5))
 */
export function simulatedMotionTable(nVolumes: number, spec: MotionSpec, rng: Rng): MotionRow[] {
  if (!Number.isInteger(nVolumes) || nVolumes < 1) fail('INVALID_ARGUMENT', `nVolumes must be a positive integer, got ${nVolumes}`);
  if (!(spec.wanderStepMm >= 0) || !(spec.wanderStepDeg >= 0)) fail('INVALID_ARGUMENT', `wanderStepMm and wanderStepDeg must be >= 0, got ${spec.wanderStepMm} and ${spec.wanderStepDeg}`);
  const jerk = spec.jerk;
  if (jerk && (!Number.isInteger(jerk.volume) || jerk.volume < 1 || jerk.volume >= nVolumes)) fail('INVALID_ARGUMENT', `motion jerk volume must be an integer in 1..${nVolumes - 1}, got ${jerk.volume}`);
  const duration = jerk?.durationVolumes ?? null;
  if (duration !== null && (!Number.isInteger(duration) || duration < 1)) fail('INVALID_ARGUMENT', `motion jerk durationVolumes must be a positive integer or null, got ${duration}`);
  const jerkEnd = jerk ? (duration === null ? Infinity : jerk.volume + duration) : 0;
  const p = [0, 0, 0, 0, 0, 0];
  const rows: MotionRow[] = [];
  for (let v = 0; v < nVolumes; v++) {
    if (v > 0) {
      // a standard draw scaled (stdlib returns NaN for a zero standard deviation)
      for (let a = 0; a < 6; a++) p[a] += (a < 3 ? spec.wanderStepMm : spec.wanderStepDeg) * rng.normal();
    }
    const step = jerk && v >= jerk.volume && v < jerkEnd ? [...jerk.shiftMm, ...jerk.rotationDeg] : [0, 0, 0, 0, 0, 0];
    // rounded to 1e-6 mm / deg so the written table and the applied transform agree exactly
    const q = p.map((x, a) => Math.round((x + step[a]) * 1e6) / 1e6);
    rows.push({ volume: v, shiftXMm: q[0], shiftYMm: q[1], shiftZMm: q[2], rotXDeg: q[3], rotYDeg: q[4], rotZDeg: q[5] });
  }
  return rows;
}
