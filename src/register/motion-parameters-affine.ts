import { affineFromRows, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { rigidMotionAffine } from '../acquire/rigid-motion-affine.js';

/**
 * The world -> world affine of 6 (rigid) or 12 (affine) motion parameters about a centre c:
 * p' = R S H (p - c) + c + t, applied right to left: shear H = [[1, hxy, hxz], [0, 1, hyz], [0, 0, 1]]
 * first, then the scales S = diag(sx, sy, sz), then the rotation R = Rz Ry Rx (the motion-table
 * convention of rigidMotionAffine, rotation about x applied first), then the shift t. With 6
 * parameters this is exactly rigidMotionAffine, so a motion table means the same thing everywhere.
 * @param p - shiftX, shiftY, shiftZ (mm), rotX, rotY, rotZ (degrees)[, scaleX, scaleY, scaleZ, shearXY, shearXZ, shearYZ]
 * @param centreMm - the centre c
 * @returns row-major 4x4 affine
 * @throws BoldsweepError INVALID_ARGUMENT for another count than 6 or 12, or a non-finite value
 * @example motionParametersAffine([1, 0, 0, 0, 0, 2], [0, 0, 0]) // 1 mm along x, 2 degrees about z
 */
export function motionParametersAffine(p: ArrayLike<number>, centreMm: Readonly<Vec3>): Affine {
  if (p.length !== 6 && p.length !== 12) fail('INVALID_ARGUMENT', `motion parameters must be 6 (rigid) or 12 (affine) numbers, got ${p.length}`);
  for (let i = 0; i < p.length; i++) if (!Number.isFinite(p[i])) fail('INVALID_ARGUMENT', `motion parameter ${i} is ${p[i]}, not a finite number`);
  const rigid = rigidMotionAffine({ shiftXMm: p[0], shiftYMm: p[1], shiftZMm: p[2], rotXDeg: p[3], rotYDeg: p[4], rotZDeg: p[5] }, centreMm);
  if (p.length === 6) return rigid;
  const [sx, sy, sz, hxy, hxz, hyz] = [p[6], p[7], p[8], p[9], p[10], p[11]];
  const sh = [[sx, sx * hxy, sx * hxz], [0, sy, sy * hyz], [0, 0, sz]];
  const m: number[][] = [0, 1, 2].map((r) => [0, 1, 2].map((c) => rigid[4 * r] * sh[0][c] + rigid[4 * r + 1] * sh[1][c] + rigid[4 * r + 2] * sh[2][c]));
  return affineFromRows(m.map((row, i) => [row[0], row[1], row[2], p[i] + centreMm[i] - (row[0] * centreMm[0] + row[1] * centreMm[1] + row[2] * centreMm[2])]));
}
