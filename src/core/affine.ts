/**
 * 4x4 homogeneous transforms in world millimetres (RAS+), stored row-major in a Float64Array(16):
 * element (r, c) is at index 4r + c. "A then B" is `composeAffine(B, A)` (= B A), as in matrix notation.
 */
export type Affine = Float64Array;

/** A point or vector in 3D. */
export type Vec3 = [number, number, number];

/**
 * The 4x4 identity.
 * @returns a new identity affine
 * @example identityAffine()[0] === 1
 */
export function identityAffine(): Affine {
  const m = new Float64Array(16);
  m[0] = m[5] = m[10] = m[15] = 1;
  return m;
}

/**
 * Build an affine from its first three rows (the bottom row is always 0 0 0 1).
 * @param rows - three rows of four numbers, as in the NIfTI srow_x/srow_y/srow_z fields
 * @returns the affine
 * @example affineFromRows([[2,0,0,-90],[0,2,0,-126],[0,0,2,-72]])
 */
export function affineFromRows(rows: ArrayLike<ArrayLike<number>>): Affine {
  const m = identityAffine();
  for (let r = 0; r < 3; r++) for (let c = 0; c < 4; c++) m[4 * r + c] = rows[r][c];
  return m;
}

/**
 * Matrix product `a b`: apply `b` first, then `a`.
 * @param a - the transform applied second
 * @param b - the transform applied first
 * @returns a new affine
 * @example composeAffine(worldFromScanner, scannerFromVoxel)
 */
export function composeAffine(a: Affine, b: Affine): Affine {
  const m = new Float64Array(16);
  for (let r = 0; r < 4; r++) {
    for (let c = 0; c < 4; c++) {
      let s = 0;
      for (let k = 0; k < 4; k++) s += a[4 * r + k] * b[4 * k + c];
      m[4 * r + c] = s;
    }
  }
  return m;
}

/**
 * Inverse of a 4x4 affine (general 3x3 part by the adjugate; bottom row assumed 0 0 0 1).
 * @param a - an invertible affine
 * @returns the inverse
 * @throws RangeError when the 3x3 part is singular
 * @example invertAffine(affine) // world -> voxel
 */
export function invertAffine(a: Affine): Affine {
  const [a00, a01, a02, a03, a10, a11, a12, a13, a20, a21, a22, a23] = a;
  const c00 = a11 * a22 - a12 * a21;
  const c01 = a02 * a21 - a01 * a22;
  const c02 = a01 * a12 - a02 * a11;
  const c10 = a12 * a20 - a10 * a22;
  const c11 = a00 * a22 - a02 * a20;
  const c12 = a02 * a10 - a00 * a12;
  const c20 = a10 * a21 - a11 * a20;
  const c21 = a01 * a20 - a00 * a21;
  const c22 = a00 * a11 - a01 * a10;
  const det = a00 * c00 + a01 * c10 + a02 * c20;
  if (det === 0 || !Number.isFinite(det)) throw new RangeError('affine is singular (determinant 0) and cannot be inverted');
  const m = identityAffine();
  const inv = [c00, c01, c02, c10, c11, c12, c20, c21, c22].map((v) => v / det);
  m[0] = inv[0]; m[1] = inv[1]; m[2] = inv[2];
  m[4] = inv[3]; m[5] = inv[4]; m[6] = inv[5];
  m[8] = inv[6]; m[9] = inv[7]; m[10] = inv[8];
  m[3] = -(m[0] * a03 + m[1] * a13 + m[2] * a23);
  m[7] = -(m[4] * a03 + m[5] * a13 + m[6] * a23);
  m[11] = -(m[8] * a03 + m[9] * a13 + m[10] * a23);
  return m;
}

/**
 * Apply an affine to a point.
 * @param a - the affine
 * @param p - the point (e.g. voxel indices i, j, k)
 * @returns the transformed point (e.g. world mm)
 * @example applyAffine(affine, [0, 0, 0]) // world position of the first voxel
 */
export function applyAffine(a: Affine, p: Readonly<Vec3>): Vec3 {
  return [
    a[0] * p[0] + a[1] * p[1] + a[2] * p[2] + a[3],
    a[4] * p[0] + a[5] * p[1] + a[6] * p[2] + a[7],
    a[8] * p[0] + a[9] * p[1] + a[10] * p[2] + a[11],
  ];
}

/**
 * Determinant of the 3x3 part (negative for a left-handed voxel grid, as in most radiological storage).
 * @param a - the affine
 * @returns the determinant
 * @example affineDeterminant(diagonalAffine([3,3,3])) === 27
 */
export function affineDeterminant(a: Affine): number {
  return a[0] * (a[5] * a[10] - a[6] * a[9]) - a[1] * (a[4] * a[10] - a[6] * a[8]) + a[2] * (a[4] * a[9] - a[5] * a[8]);
}

/**
 * Voxel spacing implied by an affine: the length of each of its first three columns.
 * @param a - voxel->world affine
 * @returns spacing in mm along i, j, k
 * @example affineSpacing(diagonalAffine([3,3,4])) // [3,3,4]
 */
export function affineSpacing(a: Affine): Vec3 {
  const col = (c: number) => Math.hypot(a[c], a[4 + c], a[8 + c]);
  return [col(0), col(1), col(2)];
}

/**
 * A scaling affine with an optional origin shift.
 * @param spacingMm - voxel size in mm
 * @param originMm - world position of voxel (0,0,0)
 * @returns the affine
 * @example diagonalAffine([3, 3, 3.5], [-94.5, -94.5, -61.25])
 */
export function diagonalAffine(spacingMm: Readonly<Vec3>, originMm: Readonly<Vec3> = [0, 0, 0]): Affine {
  return affineFromRows([
    [spacingMm[0], 0, 0, originMm[0]],
    [0, spacingMm[1], 0, originMm[1]],
    [0, 0, spacingMm[2], originMm[2]],
  ]);
}

/** The quaternion parameters of a NIfTI-1 header (qform method 2). */
export interface NiftiQuaternion {
  quaternB: number;
  quaternC: number;
  quaternD: number;
  qoffsetX: number;
  qoffsetY: number;
  qoffsetZ: number;
  /** pixdim[1..3] in mm (absolute values are used). */
  pixdimMm: Vec3;
  /** pixdim[0]: -1 flips the third axis, anything else is taken as +1 (as nifti1.h says). */
  qfac: number;
}

/**
 * Voxel->world affine from the NIfTI-1 quaternion ("method 2" of the nifti1.h documentation):
 * a = sqrt(1 - b^2 - c^2 - d^2), R from (a, b, c, d), x = R [i*dx, j*dy, qfac*k*dz] + qoffset.
 * @param q - quaternion fields of the header
 * @returns the affine
 * @example affineFromQuaternion({ quaternB: 0, quaternC: 0, quaternD: 0, qoffsetX: 0, qoffsetY: 0, qoffsetZ: 0, pixdimMm: [2,2,2], qfac: 1 })
 */
export function affineFromQuaternion(q: NiftiQuaternion): Affine {
  let b = q.quaternB;
  let c = q.quaternC;
  let d = q.quaternD;
  let a = 1 - (b * b + c * c + d * d);
  if (a < 1e-7) {
    // nifti1.h: a 180-degree rotation; renormalise (b, c, d) and take a = 0
    const s = 1 / Math.sqrt(b * b + c * c + d * d);
    b *= s; c *= s; d *= s;
    a = 0;
  } else {
    a = Math.sqrt(a);
  }
  const xd = Math.abs(q.pixdimMm[0]) || 1;
  const yd = Math.abs(q.pixdimMm[1]) || 1;
  let zd = Math.abs(q.pixdimMm[2]) || 1;
  if (q.qfac < 0) zd = -zd;
  return affineFromRows([
    [(a * a + b * b - c * c - d * d) * xd, 2 * (b * c - a * d) * yd, 2 * (b * d + a * c) * zd, q.qoffsetX],
    [2 * (b * c + a * d) * xd, (a * a + c * c - b * b - d * d) * yd, 2 * (c * d - a * b) * zd, q.qoffsetY],
    [2 * (b * d - a * c) * xd, 2 * (c * d + a * b) * yd, (a * a + d * d - c * c - b * b) * zd, q.qoffsetZ],
  ]);
}

/**
 * Quaternion form of an affine, following nifti_mat44_to_quatern in the NIfTI-1 reference library:
 * columns are normalised to get pixdim, the rotation is made orthogonal (polar decomposition),
 * a negative determinant sets qfac = -1 and flips the third column, and `a` is kept non-negative.
 * Shears in the affine are lost (only the sform can hold them).
 * @param m - voxel->world affine
 * @returns quaternion fields
 * @example affineToQuaternion(affineFromQuaternion(q)) // recovers q
 */
export function affineToQuaternion(m: Affine): NiftiQuaternion {
  const spacing = affineSpacing(m);
  const r: number[][] = [0, 1, 2].map((row) => [0, 1, 2].map((col) => m[4 * row + col] / (spacing[col] || 1)));
  const ortho = orthogonalise(r);
  let det = det3(ortho);
  let qfac = 1;
  if (det < 0) {
    qfac = -1;
    for (let row = 0; row < 3; row++) ortho[row][2] = -ortho[row][2];
    det = -det;
  }
  const [[r11, r12, r13], [r21, r22, r23], [r31, r32, r33]] = ortho;
  let a = r11 + r22 + r33 + 1;
  let b: number, c: number, d: number;
  if (a > 0.5) {
    a = 0.5 * Math.sqrt(a);
    b = (0.25 * (r32 - r23)) / a;
    c = (0.25 * (r13 - r31)) / a;
    d = (0.25 * (r21 - r12)) / a;
  } else {
    const xd = 1 + r11 - (r22 + r33);
    const yd = 1 + r22 - (r11 + r33);
    const zd = 1 + r33 - (r11 + r22);
    if (xd > 1) {
      b = 0.5 * Math.sqrt(xd);
      c = (0.25 * (r12 + r21)) / b;
      d = (0.25 * (r13 + r31)) / b;
      a = (0.25 * (r32 - r23)) / b;
    } else if (yd > 1) {
      c = 0.5 * Math.sqrt(yd);
      b = (0.25 * (r12 + r21)) / c;
      d = (0.25 * (r23 + r32)) / c;
      a = (0.25 * (r13 - r31)) / c;
    } else {
      d = 0.5 * Math.sqrt(zd);
      b = (0.25 * (r13 + r31)) / d;
      c = (0.25 * (r23 + r32)) / d;
      a = (0.25 * (r21 - r12)) / d;
    }
    if (a < 0) { b = -b; c = -c; d = -d; a = -a; }
  }
  return { quaternB: b, quaternC: c, quaternD: d, qoffsetX: m[3], qoffsetY: m[7], qoffsetZ: m[11], pixdimMm: spacing, qfac };
}

function det3(r: number[][]): number {
  return r[0][0] * (r[1][1] * r[2][2] - r[1][2] * r[2][1]) - r[0][1] * (r[1][0] * r[2][2] - r[1][2] * r[2][0]) + r[0][2] * (r[1][0] * r[2][1] - r[1][1] * r[2][0]);
}

/** Nearest orthogonal matrix by the iteration X <- (X + X^-T)/2 (converges for any invertible X). */
function orthogonalise(r: number[][]): number[][] {
  let x = r.map((row) => row.slice());
  for (let iter = 0; iter < 50; iter++) {
    const inv = invert3(x);
    const next = x.map((row, i) => row.map((v, j) => 0.5 * (v + inv[j][i])));
    let change = 0;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) change = Math.max(change, Math.abs(next[i][j] - x[i][j]));
    x = next;
    if (change < 1e-15) break;
  }
  return x;
}

function invert3(r: number[][]): number[][] {
  const m = affineFromRows([[...r[0], 0], [...r[1], 0], [...r[2], 0]]);
  const inv = invertAffine(m);
  return [0, 1, 2].map((i) => [inv[4 * i], inv[4 * i + 1], inv[4 * i + 2]]);
}
