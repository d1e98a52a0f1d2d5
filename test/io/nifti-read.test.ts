import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { readNifti } from '../../src/io/nifti-read.js';
import { niftiHeaderBytes, niftiVoxelBytes } from '../../src/io/nifti-write.js';
import { makeVolume } from '../../src/core/volume.js';
import { HAVE_NIFTI_TOOL, niftiToolDescription } from './nifti-tool.js';

// Reference files and values written by test/reference/make_nifti_fixtures.py (numpy + struct, from the
// nifti1.h / nifti2.h layouts; each NIfTI-1 file passed nifti_tool -check_hdr -check_nim when generated).
const REF_DIR = join(import.meta.dirname, '..', 'reference');
interface FixtureFile {
  file: string; niftiVersion: 1 | 2; datatype: string; littleEndian: boolean; dims: number[];
  sclSlope: number; sclInter: number; transformSource: string; affine: number[]; spacingMm: number[];
  trSec: number; spaceUnit: string; timeUnit: string; data: (number | null)[];
  nonFiniteCount?: number; firstNonFiniteIndex?: number; nonFiniteIndices?: number[];
}
const fixtures = (JSON.parse(readFileSync(join(REF_DIR, 'nifti_fixtures.json'), 'utf8')) as { files: FixtureFile[] }).files;
const byName = (name: string) => fixtures.find((f) => f.file === name)!;

// Affine tolerance 1e-9 mm: both sides compute in float64 from the same float32/float64 header values
// (a few products and one square root), so they differ by rounding near 1e-13 only.
const AFFINE_TOL = 1e-9;

function expectAffine(actual: Float64Array, expected: number[]): void {
  for (let i = 0; i < 16; i++) {
    const diff = Math.abs(actual[i] - expected[i]);
    if (diff > AFFINE_TOL) throw new Error(`affine[${i}] = ${actual[i]}, expected ${expected[i]} (diff ${diff} > ${AFFINE_TOL})`);
  }
}

describe('readNifti against numpy-written reference files', () => {
  const regular = fixtures.filter((f) => f.nonFiniteCount === undefined);
  it('covers every datatype in both byte orders, NIfTI-2 and gzip', () => {
    const kinds = new Set(regular.map((f) => `${f.datatype}/${f.littleEndian ? 'le' : 'be'}`));
    for (const dt of ['uint8', 'int8', 'int16', 'uint16', 'int32', 'uint32', 'float32', 'float64']) {
      expect(kinds.has(`${dt}/le`)).toBe(true);
      expect(kinds.has(`${dt}/be`)).toBe(true);
    }
    expect(regular.some((f) => f.niftiVersion === 2 && f.littleEndian)).toBe(true);
    expect(regular.some((f) => f.niftiVersion === 2 && !f.littleEndian)).toBe(true);
    expect(regular.some((f) => f.file.endsWith('.nii.gz'))).toBe(true);
  });

  for (const f of regular) {
    it(`${f.file}: ${f.datatype}, ${f.littleEndian ? 'little' : 'big'}-endian NIfTI-${f.niftiVersion}, ${f.transformSource}`, async () => {
      const { volume, info } = await readNifti(join(REF_DIR, 'nifti', f.file));
      expect(info.niftiVersion).toBe(f.niftiVersion);
      expect(info.datatype).toBe(f.datatype);
      expect(info.littleEndian).toBe(f.littleEndian);
      expect(info.compressed).toBe(f.file.endsWith('.gz'));
      expect(info.transformSource).toBe(f.transformSource);
      expect(info.sclSlope).toBe(f.sclSlope);
      expect(info.sclInter).toBe(f.sclInter);
      expect(info.spaceUnit).toBe(f.spaceUnit);
      expect(info.timeUnit).toBe(f.timeUnit);
      expect(info.nonFiniteCount).toBe(0);
      expect(volume.dims).toEqual(f.dims);
      expectAffine(volume.affine, f.affine);
      // spacing: column norms of the same affine; tolerance as for the affine
      for (let k = 0; k < 3; k++) expect(Math.abs(volume.spacingMm[k] - f.spacingMm[k])).toBeLessThan(AFFINE_TOL);
      // TR: pixdim[4] times a power of ten, float64 on both sides; 1e-12 s covers one rounding
      expect(Math.abs(volume.trSec - f.trSec)).toBeLessThan(1e-12);
      // voxels exactly equal: both sides compute raw * slope + inter in float64 and round once to float32
      expect(volume.data.length).toBe(f.data.length);
      const mismatches: string[] = [];
      f.data.forEach((v, i) => { if (!Object.is(volume.data[i], v)) mismatches.push(`[${i}] ${volume.data[i]} vs ${v}`); });
      expect(mismatches, mismatches.slice(0, 5).join('; ')).toEqual([]);
    });
  }
});

describe('voxel->world by the nifti1.h rule', () => {
  it('sform wins when sform_code > 0, even with a qform present', async () => {
    const { info } = await readNifti(join(REF_DIR, 'nifti', 'xf_sform_and_qform.nii'));
    expect(info.transformSource).toBe('sform');
    expect(info.sformCode).toBe(2);
    expect(info.qformCode).toBe(1);
  });
  it('qform (with qfac -1) when sform_code is 0, and the srow fields are then ignored', async () => {
    const a = await readNifti(join(REF_DIR, 'nifti', 'xf_qform_only.nii'));
    const b = await readNifti(join(REF_DIR, 'nifti', 'xf_sform_and_qform.nii'));
    expect(a.info.transformSource).toBe('qform');
    expect(Math.abs(a.volume.affine[3] - b.volume.affine[3])).toBeGreaterThan(1); // different offsets: srow really unused
  });
  it('pixdim only when both codes are 0', async () => {
    const { volume, info } = await readNifti(join(REF_DIR, 'nifti', 'xf_pixdim_only.nii'));
    expect(info.transformSource).toBe('pixdim');
    expect(Array.from(volume.affine.subarray(0, 12))).toEqual([2, 0, 0, 0, 0, 2.5, 0, 0, 0, 0, 3, 0]);
  });
});

describe('units (nifti1.h xyzt_units) are converted to mm and seconds', () => {
  it('metres and milliseconds', async () => {
    const { volume, info } = await readNifti(join(REF_DIR, 'nifti', 'units_m_ms.nii'));
    expect(info.spaceUnit).toBe('m');
    // 0.002 m stored as float32, times 1000: within float32 resolution (1e-7 relative) of 2 mm
    expect(volume.spacingMm[0]).toBeCloseTo(2, 5);
    expect(volume.trSec).toBeCloseTo(2, 12);
  });
  it('micrometres and microseconds', async () => {
    const { volume, info } = await readNifti(join(REF_DIR, 'nifti', 'units_um_us.nii'));
    expect(info.timeUnit).toBe('us');
    expect(volume.spacingMm).toEqual([2, 2.5, 3]);
    expect(volume.affine[3]).toBeCloseTo(-90, 9);
    expect(volume.trSec).toBeCloseTo(2, 12);
  });
  it('a 3D image has nt = 1 and trSec 0', async () => {
    const { volume } = await readNifti(join(REF_DIR, 'nifti', 'dims_3d.nii'));
    expect(volume.dims).toEqual([3, 4, 2, 1]);
    expect(volume.trSec).toBe(0);
  });
});

describe('NaN/Inf voxels are never silently kept', () => {
  const f = byName('non_finite.nii');
  const path = join(REF_DIR, 'nifti', f.file);
  it("default 'error' throws NON_FINITE_VOXELS with the count and first index", async () => {
    const err = await readNifti(path).catch((e: unknown) => e);
    expect(isBoldsweepError(err, 'NON_FINITE_VOXELS')).toBe(true);
    if (!isBoldsweepError(err)) return;
    expect(err.details.count).toBe(f.nonFiniteCount);
    expect(err.details.firstIndex).toBe(f.firstNonFiniteIndex);
    expect(err.file).toBe(path);
    expect(err.message).toContain(path);
    // index 5 in a 3x4x2 grid: i = 5 % 3 = 2, j = floor(5 / 3) = 1
    expect(err.details.firstVoxel).toEqual([2, 1, 0, 0]);
  });
  it("'zero' replaces them with 0 and reports the count", async () => {
    const { volume, info } = await readNifti(path, { nonFinite: 'zero' });
    expect(info.nonFiniteCount).toBe(3);
    for (const i of f.nonFiniteIndices!) expect(volume.data[i]).toBe(0);
    f.data.forEach((v, i) => { if (v !== null) expect(volume.data[i]).toBe(v); });
  });
});

describe.skipIf(!HAVE_NIFTI_TOOL)('datatype and unit names agree with nifti_tool (its ASCII header form)', () => {
  const scratch = mkdtempSync(join(tmpdir(), 'boldsweep-nia-'));
  afterAll(() => rmSync(scratch, { recursive: true, force: true }));
  // NIfTI-1 files only: nifti_tool 2.09 handles NIfTI-2 headers through the NIfTI-1 struct (see the fixture script)
  for (const f of fixtures.filter((x) => x.niftiVersion === 1 && x.nonFiniteCount === undefined)) {
    it(f.file, async () => {
      const path = join(REF_DIR, 'nifti', f.file);
      const words = niftiToolDescription(path, scratch);
      const { info } = await readNifti(path);
      expect(words.datatype_name).toBe(info.datatype.toUpperCase());
      expect(words.xyz_units_name).toBe(info.spaceUnit);
      expect(words.time_units_name).toBe(info.timeUnit);
    });
  }
});

describe('sharedMemory: the run read straight into a SharedArrayBuffer', () => {
  // the same bytes as the ordinary read: plain float32 (read in place), converted int16, gzip, NIfTI-2 big-endian
  for (const file of ['dt_float32_le.nii', 'dt_int16_be.nii', 'dt_int16_be.nii.gz', 'n2_float64_be.nii.gz']) {
    it(`${file}: identical values, on shared memory`, async () => {
      const plain = await readNifti(join(REF_DIR, 'nifti', file));
      const shared = await readNifti(join(REF_DIR, 'nifti', file), { sharedMemory: true });
      expect(shared.volume.data.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(plain.volume.data.buffer).not.toBeInstanceOf(SharedArrayBuffer);
      expect(Buffer.from(shared.volume.data.buffer).equals(Buffer.from(plain.volume.data.buffer))).toBe(true);
    });
  }
});

describe('.nii.gz read piece by piece: the same values as the plain file', () => {
  // Runs larger than one inflate piece (64 KiB), with vox_offset 353 so voxels straddle the piece
  // boundaries, and with two gzip members one after the other (gzip allows it; RFC 1952, 1996, sec. 2.2).
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-gz-pieces-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const dims: [number, number, number, number] = [13, 11, 7, 61]; // 61061 voxels: 122 KB as int16, 244 KB as float32
  const values = new Float32Array(13 * 11 * 7 * 61);
  let s = 12345;
  for (let i = 0; i < values.length; i++) { s = (s * 1103515245 + 12345) % 2147483648; values[i] = Math.round((s / 2147483648) * 2000 - 1000) * 0.5; }
  const volume = makeVolume({ dims, spacingMm: [2, 2, 2], trSec: 2, affine: new Float64Array([2, 0, 0, 0, 0, 2, 0, 0, 0, 0, 2, 0, 0, 0, 0, 1]), data: values });
  for (const datatype of ['int16', 'float32'] as const) {
    it(`${datatype}, vox_offset 353, one and two gzip members`, async () => {
      const header = Buffer.from(niftiHeaderBytes(volume, datatype, datatype === 'int16' ? 0.5 : 1, 0, '', ''));
      header.writeFloatLE(353, 108); // vox_offset
      const plainBytes = Buffer.concat([header, Buffer.alloc(1), Buffer.from(niftiVoxelBytes(values, datatype, 0.5, 0))]);
      writeFileSync(join(dir, `${datatype}.nii`), plainBytes);
      writeFileSync(join(dir, `${datatype}.nii.gz`), gzipSync(plainBytes));
      const cut = 70001;
      writeFileSync(join(dir, `${datatype}-2.nii.gz`), Buffer.concat([gzipSync(plainBytes.subarray(0, cut)), gzipSync(plainBytes.subarray(cut))]));
      const plain = await readNifti(join(dir, `${datatype}.nii`));
      expect(Array.from(plain.volume.data.subarray(0, 5))).toEqual(Array.from(values.subarray(0, 5)));
      for (const f of [`${datatype}.nii.gz`, `${datatype}-2.nii.gz`]) {
        const gz = await readNifti(join(dir, f), { sharedMemory: true });
        expect(gz.info.compressed).toBe(true);
        expect(Buffer.from(gz.volume.data.buffer).equals(Buffer.from(plain.volume.data.buffer))).toBe(true);
      }
    });
  }
});
