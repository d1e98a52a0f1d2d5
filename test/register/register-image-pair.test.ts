import { beforeAll, describe, expect, it } from 'vitest';
import { gridCentreMm } from '../../src/acquire/grid-centre-mm.js';
import { rigidMotionAffine } from '../../src/acquire/rigid-motion-affine.js';
import { diagonalAffine, invertAffine } from '../../src/core/affine.js';
import type { Volume } from '../../src/core/volume.js';
import { affineMotionParameters } from '../../src/register/affine-motion-parameters.js';
import { motionParametersAffine } from '../../src/register/motion-parameters-affine.js';
import { registerImagePair } from '../../src/register/register-image-pair.js';
import type { RegistrationCost } from '../../src/register/registration-types.js';
import { resampleVolume } from '../../src/resample/resample-volume.js';
import { gridOf, movedPair, phantomVolume } from './phantom-pair.js';

// Typical head motion within a run: shifts of 1-2 mm and rotations of 1-2 degrees.
const RIGID = [1.5, -1.2, 0.8, 1.5, -1.0, 2.0];
const AFFINE = [...RIGID, 1.03, 0.98, 1.02, 0.02, -0.01, 0.015];
// Thermal noise of SD 20 on a brain signal of about 600-1000 (tSNR 30-50, common for 3 mm EPI).
const NOISE_SD = 20;

let head: Volume;
beforeAll(() => { head = phantomVolume(); });

describe('motion parameters', () => {
  it('six parameters give exactly the motion-table pose of rigidMotionAffine', () => {
    const c: [number, number, number] = [3, -5, 10];
    const row = { shiftXMm: 1, shiftYMm: -2, shiftZMm: 0.5, rotXDeg: 3, rotYDeg: -4, rotZDeg: 5 };
    expect(Array.from(motionParametersAffine([1, -2, 0.5, 3, -4, 5], c))).toEqual(Array.from(rigidMotionAffine(row, c)));
  });
  it('the decomposition returns the parameters an affine was built from (shear first, then scale, rotation, shift)', () => {
    const c: [number, number, number] = [1, 2, 3];
    const back = affineMotionParameters(motionParametersAffine(AFFINE, c), c, 'affine');
    // rounding of a handful of double operations
    AFFINE.forEach((v, i) => expect(back[i]).toBeCloseTo(v, 10));
    const rigid = affineMotionParameters(motionParametersAffine(RIGID, c), c, 'rigid');
    RIGID.forEach((v, i) => expect(rigid[i]).toBeCloseTo(v, 10));
  });
  it('a mirroring affine has no parameters (typed error)', () => {
    expect(() => affineMotionParameters(diagonalAffine([-1, 1, 1]), [0, 0, 0], 'affine')).toThrow(/mirrors/);
  });
});

describe('registerImagePair recovers a known motion of the phantom head', () => {
  // Tolerance 0.1 mm and 0.1 degree: a tenth of a typical movement and 1/35 of a voxel, the accuracy
  // within-run motion estimates are held to in common practice (no source); 0.1 degree moves a point
  // 50 mm from the centre by 0.09 mm, so both bounds ask for the same displacement.
  it('rigid, least squares', () => {
    const c = gridCentreMm(gridOf(head));
    const pair = movedPair(head, motionParametersAffine(RIGID, c), NOISE_SD, 1);
    const r = registerImagePair({ data: pair.fixed, grid: gridOf(head) }, { data: pair.moving, grid: gridOf(head) }, { model: 'rigid' });
    expect(r.levels).toEqual([4, 2, 1]);
    expect(r.iterations).toHaveLength(3);
    RIGID.forEach((v, i) => expect(Math.abs(r.parameters[i] - v)).toBeLessThan(0.1));
    // the affine returned is the parameters' pose
    expect(Array.from(r.affine)).toEqual(Array.from(motionParametersAffine(r.parameters, c)));
  });
  it('affine, least squares (scales within 0.002 and shears within 0.002: 0.1 mm at 50 mm)', () => {
    const c = gridCentreMm(gridOf(head));
    const pair = movedPair(head, motionParametersAffine(AFFINE, c), NOISE_SD, 2);
    const r = registerImagePair({ data: pair.fixed, grid: gridOf(head) }, { data: pair.moving, grid: gridOf(head) }, { model: 'affine' });
    AFFINE.forEach((v, i) => expect(Math.abs(r.parameters[i] - v)).toBeLessThan(i < 6 ? 0.1 : 0.002));
  });
  it.each<[RegistrationCost, number]>([
    ['normalised-correlation', 0.1],
    ['normalised-mutual-information', 0.1],
  ])('rigid, %s', (cost, tol) => {
    const c = gridCentreMm(gridOf(head));
    const pair = movedPair(head, motionParametersAffine(RIGID, c), NOISE_SD, 3);
    const r = registerImagePair({ data: pair.fixed, grid: gridOf(head) }, { data: pair.moving, grid: gridOf(head) }, { model: 'rigid', cost });
    console.log(cost, Array.from(r.parameters).map((x) => x.toFixed(4)).join(' '));
    RIGID.forEach((v, i) => expect(Math.abs(r.parameters[i] - v)).toBeLessThan(tol));
  });
});
