import { describe, expect, it } from 'vitest';
import {
  affineFromQuaternion, affineFromRows, affineToQuaternion, applyAffine, composeAffine, invertAffine, identityAffine,
} from '../../src/core/affine.js';

// Tolerance 1e-12: all operations are a handful of float64 products; errors stay near machine epsilon.
const TOL = 1e-12;

function rot(axis: 'x' | 'z', deg: number, t: [number, number, number]) {
  const c = Math.round(Math.cos((deg * Math.PI) / 180) * 1e12) / 1e12;
  const s = Math.round(Math.sin((deg * Math.PI) / 180) * 1e12) / 1e12;
  const r = axis === 'z' ? [[c, -s, 0], [s, c, 0], [0, 0, 1]] : [[1, 0, 0], [0, c, -s], [0, s, c]];
  return affineFromRows(r.map((row, i) => [...row, t[i]]));
}

describe('affine composition (REFERENCES.md §14, computed with numpy [C])', () => {
  const A = rot('z', 90, [1, 2, 3]);
  const B = rot('x', 90, [0, 0, 10]);
  it('"A then B" is B A', () => {
    const BA = composeAffine(B, A);
    const expected = [[0, -1, 0, 1], [0, 0, -1, -3], [1, 0, 0, 12]];
    for (let r = 0; r < 3; r++) for (let c = 0; c < 4; c++) expect(BA[4 * r + c]).toBeCloseTo(expected[r][c], 12);
    const p = applyAffine(BA, [1, 0, 0]);
    expect(p[0]).toBeCloseTo(1, 12); expect(p[1]).toBeCloseTo(-3, 12); expect(p[2]).toBeCloseTo(13, 12);
    const q = applyAffine(composeAffine(A, B), [1, 0, 0]);
    expect(q[0]).toBeCloseTo(1, 12); expect(q[1]).toBeCloseTo(3, 12); expect(q[2]).toBeCloseTo(13, 12);
  });
  it('inverse times affine is the identity', () => {
    const M = affineFromRows([[2, 0.1, 0, -90], [0.2, 3, 0.3, -126], [0, 0.1, 3.5, -72]]);
    const I = composeAffine(invertAffine(M), M);
    const id = identityAffine();
    for (let i = 0; i < 16; i++) expect(Math.abs(I[i] - id[i])).toBeLessThan(TOL);
  });
});

describe('NIfTI-1 quaternion (nifti1.h documentation, "METHOD 2")', () => {
  // 90 deg about z: quaternion (a,b,c,d) = (cos 45, 0, 0, sin 45); R = [[0,-1,0],[1,0,0],[0,0,1]] by the
  // nifti1.h formula R12 = 2(bc - ad) = -1, R21 = 2(bc + ad) = 1. pixdim (2,3,4); qfac -1 negates the k column.
  const q = { quaternB: 0, quaternC: 0, quaternD: Math.SQRT1_2, qoffsetX: -10, qoffsetY: 20, qoffsetZ: 5, pixdimMm: [2, 3, 4] as [number, number, number], qfac: -1 };
  it('gives the worked-example matrix', () => {
    const m = affineFromQuaternion(q);
    const expected = [[0, -3, 0, -10], [2, 0, 0, 20], [0, 0, -4, 5]];
    for (let r = 0; r < 3; r++) for (let c = 0; c < 4; c++) expect(Math.abs(m[4 * r + c] - expected[r][c])).toBeLessThan(TOL);
  });
  it('round-trips matrix -> quaternion -> matrix (nifti_mat44_to_quatern procedure)', () => {
    for (const [b, c, d] of [[0, 0, Math.SQRT1_2], [0.1, -0.2, 0.3], [0.9, 0.1, 0.05], [0, 1, 0]]) {
      for (const qfac of [1, -1]) {
        const m = affineFromQuaternion({ ...q, quaternB: b, quaternC: c, quaternD: d, qfac });
        const back = affineToQuaternion(m);
        expect(back.qfac).toBe(qfac);
        const m2 = affineFromQuaternion(back);
        for (let i = 0; i < 12; i++) expect(Math.abs(m2[i] - m[i])).toBeLessThan(1e-9);
      }
    }
  });
});
