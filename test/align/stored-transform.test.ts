import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { applyAffine, diagonalAffine, type Affine } from '../../src/core/affine.js';
import { rigidMotionAffine } from '../../src/acquire/rigid-motion-affine.js';
import { composeTransforms } from '../../src/align/compose-transforms.js';
import { concatenatedResampleAffines } from '../../src/align/concatenated-resample-affines.js';
import { invertTransform } from '../../src/align/invert-transform.js';
import { readTransformFile } from '../../src/align/read-transform-file.js';
import { resampleAffineOf } from '../../src/align/resample-affine-of.js';
import { storedTransform, type TransformSpace } from '../../src/align/stored-transform.js';
import { writeTransformFile } from '../../src/align/write-transform-file.js';

const space = (name: string, dims: [number, number, number], mm: number, origin: [number, number, number]): TransformSpace => ({ name, grid: { dims, affine: diagonalAffine([mm, mm, mm], origin) } });
const volume = space('volume-7', [44, 52, 34], 3.5, [-75.25, -89.25, -57.75]);
const mean = space('run-mean', [44, 52, 34], 3.5, [-75.25, -89.25, -57.75]);
const structural = space('structural', [100, 120, 92], 1.5, [-74.25, -89.25, -68.25]);
const template = space('template', [80, 100, 76], 2, [-80, -108, -72]);
const rigid = (s: number[], r: number[]) => rigidMotionAffine({ shiftXMm: s[0], shiftYMm: s[1], shiftZMm: s[2], rotXDeg: r[0], rotYDeg: r[1], rotZDeg: r[2] }, [0, 0, 0]);
const meanFromVolume = storedTransform(volume, mean, rigid([0.3, -0.2, 0.5], [0.4, 0.1, -0.3]));
const structuralFromMean = storedTransform(mean, structural, rigid([2.5, -3, 4], [4, -2, 3]));
const templateFromStructural = storedTransform(structural, template, Float64Array.from([1.06, 0.02, 0, 2, 0, 0.96, 0.03, -3, 0.01, 0, 1.04, 5, 0, 0, 0, 1]));

/** Plain 4x4 product written out (row-major), independent of composeAffine. */
function product(a: ArrayLike<number>, b: ArrayLike<number>): number[] {
  const m: number[] = [];
  for (let r = 0; r < 4; r++) for (let c = 0; c < 4; c++) m.push(a[4 * r] * b[c] + a[4 * r + 1] * b[4 + c] + a[4 * r + 2] * b[8 + c] + a[4 * r + 3] * b[12 + c]);
  return m;
}

describe('stored transforms: composition, inverse, file format', () => {
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-transform-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('composing volume -> mean -> structural -> template equals the direct matrix product M3 M2 M1, and maps points as the three in turn', () => {
    const chain = composeTransforms([meanFromVolume, structuralFromMean, templateFromStructural]);
    expect(chain.from.name).toBe('volume-7');
    expect(chain.to.name).toBe('template');
    const direct = product(templateFromStructural.matrix, product(structuralFromMean.matrix, meanFromVolume.matrix));
    // float64 sums of four products reassociated: agreement to ~1e-13 of entries of size <= 100
    Array.from(chain.matrix).forEach((x, i) => expect(Math.abs(x - direct[i])).toBeLessThan(1e-12));
    const p: [number, number, number] = [31, -47, 12];
    const stepwise = applyAffine(templateFromStructural.matrix, applyAffine(structuralFromMean.matrix, applyAffine(meanFromVolume.matrix, p)));
    applyAffine(chain.matrix, p).forEach((x, a) => expect(Math.abs(x - stepwise[a])).toBeLessThan(1e-12));
  });

  it('an inverse round trip gives the identity, and the inverse chain maps the template back to the volume', () => {
    const chain = composeTransforms([meanFromVolume, structuralFromMean, templateFromStructural]);
    const back = composeTransforms([invertTransform(templateFromStructural), invertTransform(structuralFromMean), invertTransform(meanFromVolume)]);
    const roundTrip = product(back.matrix, chain.matrix);
    const identity = [1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1];
    // the inverse by adjugate and two products in float64: 1e-12 is rounding for entries of size <= 100
    roundTrip.forEach((x, i) => expect(Math.abs(x - identity[i])).toBeLessThan(1e-12));
    expect(back.from.name).toBe('template');
    expect(Array.from(resampleAffineOf(chain))).toEqual(Array.from(invertTransform(chain).matrix));
  });

  it('a chain whose link starts on another grid is refused (TRANSFORM_CHAIN_BROKEN)', () => {
    expect(() => composeTransforms([meanFromVolume, templateFromStructural])).toThrow(expect.objectContaining({ code: 'TRANSFORM_CHAIN_BROKEN' }));
    expect(() => composeTransforms([structuralFromMean, meanFromVolume])).toThrow(/link 2/);
  });

  it('writes its own JSON format and reads back the same bits', async () => {
    const chain = composeTransforms([meanFromVolume, structuralFromMean, templateFromStructural]);
    const path = join(dir, 'volume-7_to_template.transform.json');
    await writeTransformFile(path, chain);
    const json = JSON.parse(readFileSync(path, 'utf8'));
    expect(json.boldsweepTransform).toBe(1);
    expect(json.matrix).toHaveLength(4);
    expect(json.from.voxelToWorld[3]).toEqual([0, 0, 0, 1]);
    const back = await readTransformFile(path);
    expect(Array.from(back.matrix)).toEqual(Array.from(chain.matrix));
    expect(Array.from(back.to.grid.affine)).toEqual(Array.from(template.grid.affine));
    expect(back.from.grid.dims).toEqual([44, 52, 34]);
  });

  it('refuses a file that is not JSON, has a wrong field, or a singular matrix (TRANSFORM_FILE_INVALID)', async () => {
    const bad = async (text: string) => { const p = join(dir, 'bad.json'); writeFileSync(p, text); return readTransformFile(p); };
    await expect(bad('{ not json')).rejects.toMatchObject({ code: 'TRANSFORM_FILE_INVALID' });
    const ok = JSON.parse(JSON.stringify((await import('../../src/align/transform-to-json.js')).transformToJson(structuralFromMean)));
    await expect(bad(JSON.stringify({ ...ok, boldsweepTransform: 2 }))).rejects.toThrow(/boldsweepTransform/);
    await expect(bad(JSON.stringify({ ...ok, matrix: [[0, 0, 0, 0], [0, 1, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1]] }))).rejects.toThrow(/singular/);
    await expect(bad(JSON.stringify({ ...ok, extra: 1 }))).rejects.toMatchObject({ code: 'TRANSFORM_FILE_INVALID' });
    await expect(readTransformFile(join(dir, 'missing.json'))).rejects.toMatchObject({ code: 'FILE_NOT_FOUND' });
  });

  it('per-volume resampling affines for one resampling: pose_t . inverse(final <- reference), checked on points', () => {
    const templateFromReference = composeTransforms([structuralFromMean, templateFromStructural]).matrix;
    const poses: Affine[] = [rigid([0, 0, 0], [0, 0, 0]), rigid([0.5, 0, -0.2], [1, 0, 0])];
    const maps = concatenatedResampleAffines(templateFromReference, poses, 2);
    // a template point q comes from reference point r = inverse(T) q, which volume 1 saw at pose_1 r
    const q: [number, number, number] = [10, 20, -5];
    const r = applyAffine(resampleAffineOf(composeTransforms([structuralFromMean, templateFromStructural])), q);
    applyAffine(maps[1], q).forEach((x, a) => expect(Math.abs(x - applyAffine(poses[1], r)[a])).toBeLessThan(1e-12));
    applyAffine(maps[0], q).forEach((x, a) => expect(Math.abs(x - r[a])).toBeLessThan(1e-12));
    expect(() => concatenatedResampleAffines(templateFromReference, poses, 3)).toThrow(/2 volume poses/);
  });
});
