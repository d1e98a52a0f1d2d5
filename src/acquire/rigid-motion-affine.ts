import { affineFromRows, type Affine, type Vec3 } from '../core/affine.js';

/**
 * One row of a motion table: the head's rigid position at one volume relative to its reference
 * position (volume 0 in the phantom), as shifts in mm and rotations in degrees about a stated centre.
 */
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
 * The rigid transform (world mm -> world mm) that a motion-table row describes:
 * p' = R (p - c) + c + t, with R = Rz Ry Rx (rotation about x applied first; equal to scipy's
 * Rotation.from_euler('xyz', ...) extrinsic convention) about the centre c. It maps a point fixed
 * to the head, at its reference position, to where it is in the scanner at that volume (the pose).
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
