import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { fail } from '../core/fail.js';

/** Radius of the sphere on which Power et al. (2012) turn rotations into arc length, mm. */
export const FD_SPHERE_RADIUS_MM = 50;

/**
 * Framewise displacement threshold above which a volume is commonly censored, mm: 0.5 mm is common
 * practice, and the value Power et al. (2012, NeuroImage 59:2142-2154) used.
 */
export const FD_CENSOR_THRESHOLD_MM = 0.5;

/** The six rigid parameters of a motion-table row (its `volume` index is not needed). */
export type MotionParameters = Omit<MotionRow, 'volume'>;

/**
 * Framewise displacement per volume (Power et al. 2012, NeuroImage 59:2142-2154): the sum of the
 * absolute backward differences of the three shifts (mm) and of the three rotations turned into arc
 * length on a sphere of `radiusMm` (degrees -> radians x radius). The first volume has no volume
 * before it: its FD is 0.
 * @param table - one row per volume, shifts in mm and rotations in degrees (not modified)
 * @param radiusMm - sphere radius for the rotations. __Default value:__ {@link FD_SPHERE_RADIUS_MM} (50 mm)
 * @returns FD in mm, one value per row
 * @throws BoldsweepError MOTION_TABLE_INVALID for a non-finite value; INVALID_ARGUMENT for a radius
 *   that is not positive
 * @example framewiseDisplacement(table)[12] // mm moved between volumes 11 and 12
 */
export function framewiseDisplacement(table: readonly MotionParameters[], radiusMm = FD_SPHERE_RADIUS_MM): Float64Array {
  if (!(radiusMm > 0) || !Number.isFinite(radiusMm)) fail('INVALID_ARGUMENT', `the FD sphere radius must be a positive number of mm, got ${radiusMm}`);
  const n = table.length;
  const fd = new Float64Array(n);
  const mmPerDeg = (Math.PI / 180) * radiusMm;
  for (let t = 0; t < n; t++) checkRow(table[t], t);
  for (let t = 1; t < n; t++) {
    const a = table[t - 1];
    const b = table[t];
    const shifts = Math.abs(b.shiftXMm - a.shiftXMm) + Math.abs(b.shiftYMm - a.shiftYMm) + Math.abs(b.shiftZMm - a.shiftZMm);
    const turns = Math.abs(b.rotXDeg - a.rotXDeg) + Math.abs(b.rotYDeg - a.rotYDeg) + Math.abs(b.rotZDeg - a.rotZDeg);
    fd[t] = shifts + mmPerDeg * turns;
  }
  return fd;
}

const COLUMNS = ['shiftXMm', 'shiftYMm', 'shiftZMm', 'rotXDeg', 'rotYDeg', 'rotZDeg'] as const;

function checkRow(row: MotionParameters, t: number): void {
  for (const c of COLUMNS) {
    if (typeof row[c] !== 'number' || !Number.isFinite(row[c])) fail('MOTION_TABLE_INVALID', `motion table row ${t} (volume ${t}) has ${c} = ${String(row[c])}`, { details: { row: t, column: c } });
  }
}
