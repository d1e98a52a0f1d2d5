import { mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import type { ErrorCode } from '../../src/core/messages.js';
import { makeVolume } from '../../src/core/volume.js';
import { readNifti } from '../../src/io/nifti-read.js';
import { writeNifti } from '../../src/io/nifti-write.js';

// Each damaged file is made from a good one by changing bytes at the nifti1.h / nifti2.h offsets.
const dir = mkdtempSync(join(tmpdir(), 'boldsweep-nifti-bad-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const dims: [number, number, number, number] = [4, 3, 2, 5];
let good: Buffer; // a valid little-endian NIfTI-1 float32 file: 352 + 120 * 4 bytes

beforeAll(async () => {
  const data = Float32Array.from({ length: 120 }, (_, i) => i * 0.5);
  await writeNifti(join(dir, 'good.nii'), makeVolume({ dims, spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data }));
  good = readFileSync(join(dir, 'good.nii'));
});

function variant(name: string, bytes: Uint8Array): string {
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return path;
}

function patched(edit: (b: Buffer) => void): Buffer {
  const b = Buffer.from(good);
  edit(b);
  return b;
}

async function expectCode(path: string, code: ErrorCode, messagePart?: string): Promise<void> {
  const err = await readNifti(path).catch((e: unknown) => e);
  if (!isBoldsweepError(err)) throw new Error(`expected BoldsweepError ${code}, got ${String(err)}`);
  expect(err.code).toBe(code);
  expect(err.file).toBe(path); // every error names the file
  expect(err.message).toContain(path);
  if (messagePart) expect(err.message).toContain(messagePart);
}

/** A NIfTI-2 version of the good file (540-byte header, 64-bit dims), written field by field from nifti2.h. */
function nifti2(dimValues: number[]): Buffer {
  const b = Buffer.alloc(544 + 120 * 4);
  b.writeInt32LE(540, 0);
  Buffer.from('n+2\0\r\n\x1a\n', 'latin1').copy(b, 4);
  b.writeInt16LE(16, 12); // datatype float32
  b.writeInt16LE(32, 14); // bitpix
  dimValues.forEach((d, i) => b.writeBigInt64LE(BigInt(d), 16 + 8 * i));
  for (let i = 0; i < 8; i++) b.writeDoubleLE(i === 0 ? 1 : 3, 104 + 8 * i); // pixdim
  b.writeBigInt64LE(544n, 168); // vox_offset
  return b;
}

describe('readNifti refuses damaged files with a typed error naming the file', () => {
  it('FILE_NOT_FOUND and READ_FAILED (a folder)', async () => {
    await expectCode(join(dir, 'missing.nii'), 'FILE_NOT_FOUND');
    mkdirSync(join(dir, 'folder.nii'));
    await expectCode(join(dir, 'folder.nii'), 'READ_FAILED');
  });

  it('NIFTI_TRUNCATED: the file ends inside the header or inside the voxel data', async () => {
    await expectCode(variant('tiny.nii', good.subarray(0, 2)), 'NIFTI_TRUNCATED');
    await expectCode(variant('cut-header.nii', good.subarray(0, 200)), 'NIFTI_TRUNCATED', 'inside the 348-byte header');
    await expectCode(variant('cut-data.nii', good.subarray(0, good.length - 10)), 'NIFTI_TRUNCATED', 'need 480 bytes');
  });

  it('NIFTI_BAD_MAGIC: wrong magic string, wrong sizeof_hdr, header/image pair magic', async () => {
    await expectCode(variant('magic.nii', patched((b) => b.write('xyz', 344, 'latin1'))), 'NIFTI_BAD_MAGIC', 'expected "n+1"');
    await expectCode(variant('sizeof.nii', patched((b) => b.writeInt32LE(999, 0))), 'NIFTI_BAD_MAGIC', 'sizeof_hdr is 999');
    await expectCode(variant('pair.nii', patched((b) => b.write('ni1', 344, 'latin1'))), 'NIFTI_BAD_MAGIC', '.hdr + .img');
    await expectCode(variant('text.nii', Buffer.from('onset\tduration\n'.repeat(40))), 'NIFTI_BAD_MAGIC', 'text.nii is not a NIfTI file: it holds text');
    // a text file under a .nii.gz name is named as such, not reported as damaged gzip
    await expectCode(variant('text.nii.gz', Buffer.from('onset\tduration\n'.repeat(40))), 'NIFTI_BAD_MAGIC', 'named .gz but is not gzip-compressed');
  });

  it('NIFTI_SIZE_MISMATCH / NIFTI_TRUNCATED: header dims inconsistent with the file size', async () => {
    // dim[4] 5 -> 4: the file holds one volume more than the header describes
    await expectCode(variant('dims-small.nii', patched((b) => b.writeInt16LE(4, 48))), 'NIFTI_SIZE_MISMATCH', '96 extra');
    // dim[1] 4 -> 5: the header asks for more data than the file holds
    await expectCode(variant('dims-large.nii', patched((b) => b.writeInt16LE(5, 42))), 'NIFTI_TRUNCATED');
    await expectCode(variant('trailing.nii', Buffer.concat([good, Buffer.alloc(7)])), 'NIFTI_SIZE_MISMATCH');
    // the same inside a .gz: the decompressed stream is longer than the header says
    await expectCode(variant('dims-small.nii.gz', gzipSync(patched((b) => b.writeInt16LE(4, 48)))), 'NIFTI_SIZE_MISMATCH');
    await expectCode(variant('voxoffset.nii', patched((b) => b.writeFloatLE(100, 108))), 'NIFTI_SIZE_MISMATCH', 'vox_offset is 100');
  });

  it('NIFTI_UNSUPPORTED_DATATYPE: complex64, int64, rgb24', async () => {
    for (const [code, name] of [[32, 'complex64'], [1024, 'int64'], [128, 'rgb24']] as const) {
      await expectCode(variant(`dt${code}.nii`, patched((b) => b.writeInt16LE(code, 70))), 'NIFTI_UNSUPPORTED_DATATYPE', name);
    }
  });

  it('GZIP_CORRUPT: damaged deflate data or gzip header; a cut .gz is NIFTI_TRUNCATED', async () => {
    const packed = gzipSync(good);
    const damaged = Buffer.from(packed);
    for (let i = 40; i < 60; i++) damaged[i] ^= 0xff;
    await expectCode(variant('damaged.nii.gz', damaged), 'GZIP_CORRUPT');
    const badHeader = Buffer.from(packed);
    badHeader[2] = 7; // compression method must be 8 (deflate), RFC 1952
    await expectCode(variant('bad-method.nii.gz', badHeader), 'GZIP_CORRUPT');
    const crc = Buffer.from(packed);
    crc[crc.length - 6] ^= 0xff; // CRC32 of the trailer
    await expectCode(variant('bad-crc.nii.gz', crc), 'GZIP_CORRUPT');
    await expectCode(variant('cut.nii.gz', packed.subarray(0, packed.length - 20)), 'NIFTI_TRUNCATED', 'gzip stream ends early');
  });

  it('NIFTI_ABSURD_SIZE: refused from the header alone (rule: any dimension > 2^15 or > 2^31 voxels, i.e. 8 GiB as float32)', async () => {
    // NIfTI-1: 32767^3 x 2 voxels (about 7e13) in a file of 832 bytes, also compressed
    const huge = patched((b) => { for (let i = 1; i <= 4; i++) b.writeInt16LE(i === 4 ? 2 : 32767, 40 + 2 * i); });
    await expectCode(variant('huge.nii', huge), 'NIFTI_ABSURD_SIZE', 'more than 2^31 voxels');
    await expectCode(variant('huge.nii.gz', gzipSync(huge)), 'NIFTI_ABSURD_SIZE');
    // NIfTI-2 allows 64-bit dims: one dimension above 2^15
    await expectCode(variant('wide.nii', nifti2([4, 40000, 3, 2, 1, 1, 1, 1])), 'NIFTI_ABSURD_SIZE', 'dim[1] is 40000');
    // ...and the NIfTI-2 control with sane dims reads fine
    const { volume } = await readNifti(variant('n2ok.nii', nifti2([4, 4, 3, 2, 5, 1, 1, 1])));
    expect(volume.dims).toEqual([4, 3, 2, 5]);
  });

  it('NIFTI_BAD_DIMS and NIFTI_TOO_MANY_DIMS', async () => {
    await expectCode(variant('dim0.nii', patched((b) => b.writeInt16LE(0, 40))), 'NIFTI_BAD_DIMS', 'dim[0] is 0');
    await expectCode(variant('dimneg.nii', patched((b) => b.writeInt16LE(-3, 44))), 'NIFTI_BAD_DIMS', 'dim[2] is -3');
    const fiveD = patched((b) => { b.writeInt16LE(5, 40); b.writeInt16LE(1, 48); b.writeInt16LE(5, 50); });
    await expectCode(variant('five.nii', fiveD), 'NIFTI_TOO_MANY_DIMS', 'dim[5] is 5');
    // a fifth dimension of size 1 is only a label and reads as 4D
    const { volume } = await readNifti(variant('five1.nii', patched((b) => { b.writeInt16LE(5, 40); b.writeInt16LE(1, 50); })));
    expect(volume.dims).toEqual(dims);
  });

  it('NIFTI_BAD_TRANSFORM: an sform of zeros', async () => {
    await expectCode(variant('zero-sform.nii', patched((b) => b.fill(0, 280, 328))), 'NIFTI_BAD_TRANSFORM', 'sform');
  });

  it('NON_FINITE_VOXELS, with count and first index (see also the NaN/Inf reference file)', async () => {
    const path = variant('inf.nii', patched((b) => { b.writeFloatLE(Infinity, 352 + 4 * 7); b.writeFloatLE(NaN, 352 + 4 * 9); }));
    await expectCode(path, 'NON_FINITE_VOXELS', '2 of 120 voxels');
    const { info } = await readNifti(path, { nonFinite: 'zero' });
    expect(info.nonFiniteCount).toBe(2);
    // scaling that overflows float32 also makes infinities: voxel values 0, 0.5, ... times scl_slope 1e38
    // exceed float32's maximum (3.4e38) from 3.5 on, i.e. voxels 7..119
    const scaled = variant('overflow.nii', patched((b) => b.writeFloatLE(1e38, 112)));
    await expectCode(scaled, 'NON_FINITE_VOXELS', '113 of 120 voxels');
  });

  it('control: a header extension (nifti1.h: extension flag, esize, ecode) is skipped via vox_offset', async () => {
    const ext = Buffer.alloc(16);
    ext.writeInt32LE(16, 0); // esize: whole extension incl. these 8 bytes, a multiple of 16
    ext.writeInt32LE(6, 4); // ecode 6 = NIFTI_ECODE_COMMENT
    ext.write('comment!', 8, 'latin1');
    const header = Buffer.from(good.subarray(0, 352));
    header[348] = 1; // extension flag
    header.writeFloatLE(368, 108); // vox_offset moves past the extension
    const { volume } = await readNifti(variant('ext.nii', Buffer.concat([header, ext, good.subarray(352)])));
    expect(Array.from(volume.data.subarray(0, 3))).toEqual([0, 0.5, 1]);
  });

  it('never modifies the file it reads', async () => {
    const path = variant('untouched.nii', good);
    const before = statSync(path).mtimeMs;
    await readNifti(path);
    expect(readFileSync(path).equals(good)).toBe(true);
    expect(statSync(path).mtimeMs).toBe(before);
  });
});
