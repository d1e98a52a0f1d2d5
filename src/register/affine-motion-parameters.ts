import { applyAffine, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { RegistrationModel } from './registration-types.js';

/**
 * The motion parameters of an affine about a centre: the inverse of motionParametersAffine. The
 * shift is where the centre goes (t = A c - c); the 3x3 part M is split as M = R U by Gram-Schmidt
 * on its columns (QR with a positive diagonal), U = S H (scales on the diagonal, unit upper-triangular
 * shear), and R = Rz Ry Rx gives the angles (rotY in [-90, 90] degrees). For `rigid` only R is read
 * from the orthogonal factor (the scales of a rigid transform are 1 up to rounding).
 * @param a - world -> world affine
 * @param centreMm - the centre the parameters act about
 * @param model - 'rigid' (6 parameters) or 'affine' (12)
 * @returns the parameters, shifts in mm and rotations in degrees
 * @throws BoldsweepError INVALID_ARGUMENT for a transform that mirrors (determinant <= 0)
 * @example affineMotionParameters(motionParametersAffine(p, c), c, 'rigid') // p again
 */
export function affineMotionParameters(a: Affine, centreMm: Readonly<Vec3>, model: RegistrationModel): Float64Array {
  const moved = applyAffine(a, centreMm);
  const cols = [0, 1, 2].map((c) => [a[c], a[4 + c], a[8 + c]]);
  const dot = (u: number[], v: number[]) => u[0] * v[0] + u[1] * v[1] + u[2] * v[2];
  // Gram-Schmidt: q0 = c0/|c0|; q1 from c1 minus its q0 part; q2 from c2 minus its q0, q1 parts
  const u00 = Math.hypot(...cols[0]);
  const q0 = cols[0].map((x) => x / u00);
  const u01 = dot(q0, cols[1]);
  const r1 = cols[1].map((x, i) => x - u01 * q0[i]);
  const u11 = Math.hypot(...r1);
  const q1 = r1.map((x) => x / u11);
  const u02 = dot(q0, cols[2]);
  const u12 = dot(q1, cols[2]);
  const r2 = cols[2].map((x, i) => x - u02 * q0[i] - u12 * q1[i]);
  const u22 = Math.hypot(...r2);
  const q2 = r2.map((x) => x / u22);
  const det = q0[0] * (q1[1] * q2[2] - q1[2] * q2[1]) - q1[0] * (q0[1] * q2[2] - q0[2] * q2[1]) + q2[0] * (q0[1] * q1[2] - q0[2] * q1[1]);
  if (!(u00 > 0 && u11 > 0 && u22 > 0) || !(det > 0)) fail('INVALID_ARGUMENT', 'the transform mirrors or flattens space (its 3x3 part has a determinant <= 0), so it has no rotation, scale and shear parameters');
  // R has columns q0, q1, q2: R[r][c] = q_c[r]
  const r20 = q0[2], r21 = q1[2], r22 = q2[2], r10 = q0[1], r00 = q0[0];
  const deg = 180 / Math.PI;
  const rotY = Math.asin(Math.max(-1, Math.min(1, -r20))) * deg;
  const rotX = Math.atan2(r21, r22) * deg;
  const rotZ = Math.atan2(r10, r00) * deg;
  const shift = [moved[0] - centreMm[0], moved[1] - centreMm[1], moved[2] - centreMm[2]];
  if (model === 'rigid') return Float64Array.from([...shift, rotX, rotY, rotZ]);
  return Float64Array.from([...shift, rotX, rotY, rotZ, u00, u11, u22, u01 / u00, u02 / u00, u12 / u11]);
}
