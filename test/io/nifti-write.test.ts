import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { affineFromRows, composeAffine, type Affine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { int16Scaling } from '../../src/io/int16-scaling.js';
import { readNifti } from '../../src/io/nifti-read.js';
import { writeNifti } from '../../src/io/nifti-write.js';
import { HAVE_NIFTI_TOOL, niftiTool, niftiToolNumbers, niftiToolVoxels } from './nifti-tool.js';

const dir = mkdtempSync(join(tmpdir(), 'boldsweep-nifti-write-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function rotation(axis: 'x' | 'z', deg: number): Affine {
  const c = Math.cos((deg * Math.PI) / 180);
  const s = Math.sin((deg * Math.PI) / 180);
  const r = axis === 'z' ? [[c, -s, 0], [s, c, 0], [0, 0, 1]] : [[1, 0, 0], [0, c, -s], [0, s, c]];
  return affineFromRows(r.map((row) => [...row, 0]));
}

/** An oblique, left-handed grid (x flipped, as in radiological storage), 2 x 2.5 x 3 mm, with an origin. */
function obliqueAffine(): Affine {
  const scale = affineFromRows([[-2, 0, 0, 0], [0, 2.5, 0, 0], [0, 0, 3, 0]]);
  const m = composeAffine(composeAffine(rotation('z', 20), rotation('x', 10)), scale);
  m[3] = 90.3; m[7] = -126.7; m[11] = -72.1;
  return m;
}

function testVolume(dims: [number, number, number, number], seed: number, mean = 100, sd = 30, trSec = 1.5): Volume {
  const data = new Float32Array(dims[0] * dims[1] * dims[2] * dims[3]);
  createRng(seed).fillNormal(data, mean, sd);
  return makeVolume({ dims, spacingMm: [2, 2.5, 3], trSec: dims[3] > 1 ? trSec : 0, affine: obliqueAffine(), data });
}

const run = testVolume([5, 4, 3, 6], 11);
const image3d = testVolume([6, 5, 4, 1], 12);

describe('writeNifti output read back by boldsweep', () => {
  it('float32 .nii and .nii.gz: voxels exact, sform = float32 of the affine, TR and dims kept', async () => {
    for (const name of ['rt.nii', 'rt.nii.gz']) {
      const path = join(dir, name);
      await writeNifti(path, run, { description: 'round trip', intentName: 'test' });
      const { volume, info } = await readNifti(path);
      expect(volume.dims).toEqual(run.dims);
      expect(volume.trSec).toBe(Math.fround(1.5));
      expect(Array.from(volume.data)).toEqual(Array.from(run.data));
      // srow is stored as float32, so each element comes back as exactly its float32 rounding
      for (let i = 0; i < 16; i++) expect(volume.affine[i]).toBe(Math.fround(run.affine[i]));
      expect(info.transformSource).toBe('sform');
      expect(info.description).toBe('round trip');
      expect(info.intentName).toBe('test');
      expect(info.compressed).toBe(name.endsWith('.gz'));
    }
  });

  it('a 3D image is written with dim[0] = 3 and read back with nt = 1', async () => {
    const path = join(dir, 'three.nii');
    await writeNifti(path, image3d);
    const bytes = readFileSync(path);
    expect(bytes.readInt16LE(40)).toBe(3); // dim[0] (nifti1.h offset 40)
    expect(bytes.length).toBe(352 + 6 * 5 * 4 * 4); // vox_offset 352 + float32 voxels
    const { volume } = await readNifti(path);
    expect(volume.dims).toEqual([6, 5, 4, 1]);
  });

  it('is byte-deterministic: the same volume written twice gives identical files (no timestamp in the gzip header)', async () => {
    for (const ext of ['.nii', '.nii.gz']) {
      await writeNifti(join(dir, `d1${ext}`), run);
      await writeNifti(join(dir, `d2${ext}`), run);
      const a = readFileSync(join(dir, `d1${ext}`));
      expect(a.equals(readFileSync(join(dir, `d2${ext}`)))).toBe(true);
      if (ext === '.nii.gz') {
        expect(a.readUInt32LE(4)).toBe(0); // RFC 1952 MTIME field: 0 = no time stamp
        expect(gunzipSync(a).equals(readFileSync(join(dir, 'd1.nii')))).toBe(true);
      }
    }
  });

  it('leaves no temp files behind', async () => {
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
});

describe('int16 storage with scl_slope / scl_inter', () => {
  // Bound: stored q = round((x - inter) / slope) is the nearest of the evenly spaced levels
  // q * slope + inter, and the levels cover the data range (nothing is clipped), so the level is at
  // most slope / 2 from x; the reader then rounds that level to float32, adding at most half a float32
  // ulp of the value (2^-24 |x|). 1e-9 slope more covers float64 rounding in the division.
  function checkBound(original: Float32Array, readBack: Float32Array, slope: number): number {
    let worst = 0;
    for (let i = 0; i < original.length; i++) {
      const err = Math.abs(original[i] - readBack[i]);
      const bound = slope / 2 + Math.abs(original[i]) * 2 ** -24 + 1e-9 * slope;
      if (err > bound) throw new Error(`voxel ${i}: |${original[i]} - ${readBack[i]}| = ${err} > ${bound}`);
      worst = Math.max(worst, err / slope);
    }
    return worst;
  }

  it('max error <= slope / 2 (data with a large offset, the hard case for float32 inter)', async () => {
    for (const [label, vol] of [['normal', run], ['offset', testVolume([5, 4, 3, 6], 13, 1000.5, 0.2)]] as const) {
      const path = join(dir, `i16-${label}.nii`);
      await writeNifti(path, vol, { datatype: 'int16' });
      const { volume, info } = await readNifti(path);
      expect(info.datatype).toBe('int16');
      const { slope } = int16Scaling(vol.data);
      expect(info.sclSlope).toBe(slope);
      const worstInSteps = checkBound(vol.data, volume.data, slope);
      // the bound is tight: with a step coarser than float32 resolution (the 'normal' case) the worst
      // error is close to half a step; with the offset data the step (~2e-5) is finer than float32's
      // spacing near 1000 (6e-5), so the nearest level rounds back to the original float32 value
      if (label === 'normal') expect(worstInSteps).toBeGreaterThan(0.4);
      else expect(worstInSteps).toBe(0);
    }
  });

  it('integers already inside -32768..32767 are stored exactly with slope 1, inter 0', async () => {
    const data = Float32Array.from({ length: 5 * 4 * 3 * 6 }, (_, i) => (i * 977) % 65536 - 32768);
    const vol = makeVolume({ ...run, data });
    const path = join(dir, 'i16-int.nii');
    await writeNifti(path, vol, { datatype: 'int16' });
    const { volume, info } = await readNifti(path);
    expect(info.sclSlope).toBe(1);
    expect(info.sclInter).toBe(0);
    expect(Array.from(volume.data)).toEqual(Array.from(data));
  });

  it('refuses NaN for int16 (it has no value for it)', async () => {
    const data = Float32Array.from(run.data);
    data[3] = NaN;
    const err = await writeNifti(join(dir, 'nan.nii'), makeVolume({ ...run, data }), { datatype: 'int16' }).catch((e: unknown) => e);
    expect(isBoldsweepError(err, 'INVALID_ARGUMENT')).toBe(true);
  });
});

describe.skipIf(!HAVE_NIFTI_TOOL)('writeNifti output checked by nifti_tool (Debian nifti-bin)', () => {
  const files: Record<string, Volume> = { 'nt-run.nii': run, 'nt-run.nii.gz': run, 'nt-3d.nii': image3d, 'nt-i16.nii.gz': run };
  it('passes nifti_tool -check_hdr -check_nim', async () => {
    for (const [name, vol] of Object.entries(files)) {
      const path = join(dir, name);
      await writeNifti(path, vol, { datatype: name.includes('i16') ? 'int16' : 'float32', description: 'checked' });
      const out = niftiTool(['-check_hdr', '-check_nim', '-infiles', path]);
      expect(out).toContain('header IS GOOD');
      expect(out).toContain('nifti_image IS GOOD');
      expect(out).not.toContain('BAD');
    }
  });

  it('every voxel printed by nifti_tool -disp_ci matches (float32)', async () => {
    for (const name of ['nt-run.nii', 'nt-run.nii.gz']) {
      const printed = niftiToolVoxels(join(dir, name));
      expect(printed.length).toBe(run.data.length);
      // nifti_tool prints 6 decimals: a difference up to 5e-7 is print rounding
      printed.forEach((v, i) => expect(Math.abs(v - run.data[i])).toBeLessThanOrEqual(5e-7 + 1e-12));
    }
  });

  it('int16: nifti_tool stored values times our slope plus inter reconstruct the data within slope / 2', async () => {
    const path = join(dir, 'nt-i16.nii.gz');
    const stored = niftiToolVoxels(path);
    const [slopePrinted, interPrinted] = niftiToolNumbers(['-disp_hdr', '-field', 'scl_slope', '-field', 'scl_inter', '-quiet', '-infiles', path]);
    const { slope, inter } = int16Scaling(run.data);
    // nifti_tool prints the header floats with 6 decimals
    expect(Math.abs(slopePrinted - slope)).toBeLessThanOrEqual(5e-7);
    expect(Math.abs(interPrinted - inter)).toBeLessThanOrEqual(5e-7);
    stored.forEach((q, i) => {
      expect(Number.isInteger(q) && q >= -32768 && q <= 32767).toBe(true);
      // slope / 2 from rounding to the nearest level; 1e-9 slope for float64 arithmetic
      expect(Math.abs(q * slope + inter - run.data[i])).toBeLessThanOrEqual(slope / 2 + 1e-9 * slope);
    });
  });

  it('header fields as nifti_tool reads them: dims, pixdim (TR), units, codes, vox_offset', () => {
    const num = (file: string, field: string) => niftiToolNumbers(['-disp_hdr', '-field', field, '-quiet', '-infiles', join(dir, file)]);
    expect(num('nt-run.nii', 'dim')).toEqual([4, 5, 4, 3, 6, 1, 1, 1]);
    expect(num('nt-3d.nii', 'dim')).toEqual([3, 6, 5, 4, 1, 1, 1, 1]);
    const pixdim = num('nt-run.nii', 'pixdim');
    expect(pixdim[0]).toBe(-1); // qfac: the grid is left-handed
    // voxel sizes from the affine columns, float32 in the header, printed with 6 decimals
    expect(pixdim.slice(1, 5).map((v, i) => Math.abs(v - [2, 2.5, 3, 1.5][i]) <= 5e-7)).toEqual([true, true, true, true]);
    expect(num('nt-run.nii', 'xyzt_units')).toEqual([10]); // NIFTI_UNITS_MM (2) | NIFTI_UNITS_SEC (8)
    expect(num('nt-run.nii', 'qform_code')).toEqual([1]);
    expect(num('nt-run.nii', 'sform_code')).toEqual([1]);
    expect(num('nt-run.nii', 'vox_offset')).toEqual([352]);
    expect(num('nt-run.nii', 'datatype')).toEqual([16]);
    expect(num('nt-i16.nii.gz', 'datatype')).toEqual([4]);
  });

  it("nifti_tool's qform and sform matrices both equal the volume's affine", () => {
    const [qto, sto] = niftiTool(['-disp_nim', '-field', 'qto_xyz', '-field', 'sto_xyz', '-quiet', '-infiles', join(dir, 'nt-run.nii')])
      .trim().split('\n').map((line) => line.trim().split(/\s+/).map(Number));
    // 1e-4 mm: the quaternion, offsets and srow are float32 (relative 6e-8) on values up to ~130 mm,
    // and nifti_tool prints 6 decimals
    for (let i = 0; i < 16; i++) {
      expect(Math.abs(qto[i] - run.affine[i])).toBeLessThan(1e-4);
      expect(Math.abs(sto[i] - run.affine[i])).toBeLessThan(1e-4);
    }
  });
});

describe('writeNifti argument checks', () => {
  it('needs a .nii or .nii.gz name and short ASCII text fields', async () => {
    for (const [path, options] of [
      [join(dir, 'x.img'), {}],
      [join(dir, 'x.nii'), { description: 'x'.repeat(80) }],
      [join(dir, 'x.nii'), { intentName: 'é' }],
    ] as const) {
      const err = await writeNifti(path, run, options).catch((e: unknown) => e);
      expect(isBoldsweepError(err, 'INVALID_ARGUMENT')).toBe(true);
    }
  });
  it('a singular affine has no qform/sform: INVALID_ARGUMENT', async () => {
    const flat = makeVolume({ ...run, affine: affineFromRows([[2, 0, 0, 0], [0, 2, 0, 0], [0, 0, 0, 0]]) });
    const err = await writeNifti(join(dir, 'flat.nii'), flat).catch((e: unknown) => e);
    expect(isBoldsweepError(err, 'INVALID_ARGUMENT')).toBe(true);
  });
  it('a missing folder gives WRITE_FAILED naming the file', async () => {
    const path = join(dir, 'no-such-folder', 'x.nii');
    const err = await writeNifti(path, run).catch((e: unknown) => e);
    expect(isBoldsweepError(err, 'WRITE_FAILED')).toBe(true);
    if (isBoldsweepError(err)) expect(err.file).toBe(path);
  });
});
