import type { Vec3 } from '../core/affine.js';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { fail } from '../core/fail.js';
import type { Rng } from '../core/random.js';

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
  /** Further abrupt movements, each added like `jerk` (left out when absent). __Default value:__ none */
  moreJerks?: MotionJerk[];
  /**
   * Slow drift: the head's change in position from the first to the last volume, linear in time
   * (a head settling into the cushions), added to the wander (left out when absent). __Default value:__ none
   */
  drift?: { shiftMm: Vec3; rotationDeg: Vec3 };
  /**
   * Respiration-coupled motion: the shift and rotation at a respiratory trace value of 1 (the trace
   * lies roughly in [-1.2, 1.2]); each volume takes the trace at its own time (left out when absent;
   * none without a trace). __Default value:__ none
   */
  respiration?: { shiftMm: Vec3; rotationDeg: Vec3 };
}

/**
 * A motion table: each of the six parameters follows a slow random walk starting at 0 (volume 0 is
 * the reference position), plus optional abrupt steps (jerks), lasting or transient, a linear slow
 * drift, and motion that follows the respiratory trace (minus its volume-0 value, so volume 0 stays
 * the reference position).
 * @param nVolumes - number of volumes
 * @param spec - wander step sizes, jerks, drift and respiration coupling
 * @param rng - seeded random stream (consumed: six normal draws per volume after the first)
 * @param respirationTrace - the respiratory trace at each volume (used when `spec.respiration` is set). __Default value:__ none
 * @returns one row per volume
 * @example simulatedMotionTable(150, { wanderStepMm: 0.01, wanderStepDeg: 0.01, jerk: null }, createRng(5))
 */
export function simulatedMotionTable(nVolumes: number, spec: MotionSpec, rng: Rng, respirationTrace?: ArrayLike<number>): MotionRow[] {
  if (!Number.isInteger(nVolumes) || nVolumes < 1) fail('INVALID_ARGUMENT', `nVolumes must be a positive integer, got ${nVolumes}`);
  if (!(spec.wanderStepMm >= 0) || !(spec.wanderStepDeg >= 0)) fail('INVALID_ARGUMENT', `wanderStepMm and wanderStepDeg must be >= 0, got ${spec.wanderStepMm} and ${spec.wanderStepDeg}`);
  const jerks = [...(spec.jerk ? [spec.jerk] : []), ...(spec.moreJerks ?? [])];
  const jerkEnds = jerks.map((jerk) => {
    if (!Number.isInteger(jerk.volume) || jerk.volume < 1 || jerk.volume >= nVolumes) fail('INVALID_ARGUMENT', `motion jerk volume must be an integer in 1..${nVolumes - 1}, got ${jerk.volume}`);
    const duration = jerk.durationVolumes ?? null;
    if (duration !== null && (!Number.isInteger(duration) || duration < 1)) fail('INVALID_ARGUMENT', `motion jerk durationVolumes must be a positive integer or null, got ${duration}`);
    return duration === null ? Infinity : jerk.volume + duration;
  });
  const six = (g: { shiftMm: Vec3; rotationDeg: Vec3 } | undefined, what: string): number[] | null => {
    if (!g) return null;
    const v = [...g.shiftMm, ...g.rotationDeg];
    if (v.length !== 6 || !v.every(Number.isFinite)) fail('INVALID_ARGUMENT', `motion ${what} needs three finite shifts (mm) and three finite rotations (deg), got ${JSON.stringify(g)}`);
    return v;
  };
  const drift = six(spec.drift, 'drift');
  const resp = six(spec.respiration, 'respiration');
  if (resp && respirationTrace && respirationTrace.length < nVolumes) fail('INVALID_ARGUMENT', `respiration trace has ${respirationTrace.length} values, the run ${nVolumes} volumes`);
  const p = [0, 0, 0, 0, 0, 0];
  const rows: MotionRow[] = [];
  for (let v = 0; v < nVolumes; v++) {
    if (v > 0) {
      // a standard draw scaled (stdlib returns NaN for a zero standard deviation)
      for (let a = 0; a < 6; a++) p[a] += (a < 3 ? spec.wanderStepMm : spec.wanderStepDeg) * rng.normal();
    }
    const step = [0, 0, 0, 0, 0, 0];
    jerks.forEach((jerk, j) => {
      if (v >= jerk.volume && v < jerkEnds[j]) [...jerk.shiftMm, ...jerk.rotationDeg].forEach((x, a) => { step[a] += x; });
    });
    if (drift && nVolumes > 1) for (let a = 0; a < 6; a++) step[a] += (drift[a] * v) / (nVolumes - 1);
    if (resp && respirationTrace) for (let a = 0; a < 6; a++) step[a] += resp[a] * (respirationTrace[v] - respirationTrace[0]);
    // rounded to 1e-6 mm / deg so the written table and the applied transform agree exactly
    const q = p.map((x, a) => Math.round((x + step[a]) * 1e6) / 1e6);
    rows.push({ volume: v, shiftXMm: q[0], shiftYMm: q[1], shiftZMm: q[2], rotXDeg: q[3], rotYDeg: q[4], rotZDeg: q[5] });
  }
  return rows;
}
