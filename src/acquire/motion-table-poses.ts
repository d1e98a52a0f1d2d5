import type { Affine, Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { rigidMotionAffine, type MotionRow } from './rigid-motion-affine.js';

const COLUMNS = ['shiftXMm', 'shiftYMm', 'shiftZMm', 'rotXDeg', 'rotYDeg', 'rotZDeg'] as const;

/**
 * The per-volume poses of a motion table: row t becomes {@link rigidMotionAffine}(row, centre), the
 * map from the head's reference-frame world mm to scanner world mm at volume t.
 * @param table - one row per volume, in volume order (not modified)
 * @param nVolumes - number of volumes of the run the table describes
 * @param centreMm - world point the table's rotations turn about
 * @returns one affine per volume
 * @throws BoldsweepError MOTION_TABLE_LENGTH when the table has another number of rows;
 *   MOTION_TABLE_INVALID for a non-finite value or a row whose volume index is out of order;
 *   INVALID_ARGUMENT for a non-finite centre
 * @example const poses = motionTablePoses(truth.motionTable, 150, [0, 0, 0])
 */
export function motionTablePoses(table: readonly MotionRow[], nVolumes: number, centreMm: Readonly<Vec3>): Affine[] {
  if (!Array.isArray(table) || table.length !== nVolumes) {
    fail('MOTION_TABLE_LENGTH', `the motion table has ${Array.isArray(table) ? table.length : 'no'} rows, the run has ${nVolumes} volumes`, { details: { rows: Array.isArray(table) ? table.length : 0, volumes: nVolumes } });
  }
  if (centreMm.length !== 3 || !centreMm.every(Number.isFinite)) fail('INVALID_ARGUMENT', `the rotation centre must be three finite mm values, got [${centreMm.join(', ')}]`);
  return table.map((row, t) => {
    for (const c of COLUMNS) {
      if (typeof row[c] !== 'number' || !Number.isFinite(row[c])) fail('MOTION_TABLE_INVALID', `motion table row ${t} (volume ${t}) has ${c} = ${String(row[c])}`, { details: { row: t, column: c } });
    }
    if (row.volume !== undefined && row.volume !== t) fail('MOTION_TABLE_INVALID', `motion table row ${t} says it is volume ${row.volume}; rows must be in volume order, one per volume from 0`, { details: { row: t } });
    return rigidMotionAffine(row, centreMm);
  });
}
