import { basename } from 'node:path';
import { open, type FileHandle } from 'node:fs/promises';
import { createGunzip } from 'node:zlib';
import { affineSpacing } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { makeVolume, type Volume } from '../core/volume.js';
import { convertVoxels } from './convert-voxels.js';
import { HEADER_PROBE_BYTES, parseNiftiHeader, type NiftiHeaderFacts } from './nifti-header.js';
import { niftiTransform, usableAffine } from './nifti-transform.js';
import { niftiUnits } from './nifti-units.js';
import { scanNonFinite } from './non-finite.js';
import type { NiftiReadInfo } from './run-types.js';

/** Options of {@link readNifti}. */
export interface ReadNiftiOptions {
  /**
   * What to do with NaN/Inf voxels. `'error'` throws NON_FINITE_VOXELS with their count and the first
   * one's index; `'zero'` sets them to 0 and reports the count in `info.nonFiniteCount`.
   * __Default value:__ `'error'`.
   */
  nonFinite?: 'error' | 'zero';
  /**
   * Put the voxels on a SharedArrayBuffer, so worker threads read the run without a copy (a sweep
   * shares its run): the run is then held once while opening instead of twice.
   * __Default value:__ `false`.
   */
  sharedMemory?: boolean;
}

/**
 * A .nii.gz is read and inflated in pieces of this size, below glibc malloc's initial mmap threshold
 * (128 KiB), so no piece is an mmapped block whose release would raise it (see readCompressed).
 */
const INFLATE_PIECE_BYTES = 64 * 1024;
/**
 * Plain files are read in slices of this size when they need conversion: a multiple of every voxel
 * size (1, 2, 3, 4, 8, 16 bytes) and below glibc malloc's initial mmap threshold (128 KiB), for the
 * reason given at readCompressed.
 */
const READ_SLICE_BYTES = 96 * 1024;
/** Largest single read the file system call accepts comfortably (below 2^31). */
const MAX_READ_BYTES = 1 << 30;
const LITTLE_ENDIAN_HOST = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/**
 * Read a NIfTI-1 or NIfTI-2 single-file image (`.nii` or gzip-compressed `.nii.gz`, recognised by its
 * bytes) into one Float32Array, applying scl_slope/scl_inter (slope 0 or non-finite means none).
 * Voxel->world follows nifti1.h: sform if sform_code > 0, else qform if qform_code > 0, else voxel
 * sizes only (`info.transformSource` says which); lengths are converted to mm (m, mm, um) and
 * pixdim[4] to seconds (s, ms, us). Memory: the output and pieces of 64-96 KiB; a .gz file is read
 * and inflated piece by piece, a plain file is converted slice by slice (float32 in host order is read straight into the output).
 * Headers claiming any dimension above 2^15 or more than 2^31 voxels are refused before allocating.
 * @param path - the image file
 * @param options - what to do with NaN/Inf voxels
 * @returns the volume (3D images have nt = 1 and trSec 0) and facts about the file
 * @throws BoldsweepError FILE_NOT_FOUND, READ_FAILED, NIFTI_TRUNCATED, NIFTI_BAD_MAGIC, NIFTI_SIZE_MISMATCH, NIFTI_UNSUPPORTED_DATATYPE, NIFTI_BAD_DIMS, NIFTI_ABSURD_SIZE, NIFTI_TOO_MANY_DIMS, NIFTI_BAD_TRANSFORM, GZIP_CORRUPT, NON_FINITE_VOXELS
 * @example const { volume, info } = await readNifti('sub-01_task-rest_bold.nii.gz')
 */
export async function readNifti(path: string, options: ReadNiftiOptions = {}): Promise<{ volume: Volume; info: NiftiReadInfo }> {
  const nonFinite = options.nonFinite ?? 'error';
  if (nonFinite !== 'error' && nonFinite !== 'zero') fail('INVALID_ARGUMENT', `nonFinite must be 'error' or 'zero', got ${String(nonFinite)}`);
  const fh = await openForReading(path);
  let header: NiftiHeaderFacts;
  let data: Float32Array;
  let compressed: boolean;
  try {
    const size = (await fh.stat()).size;
    const probe = new Uint8Array(Math.min(size, HEADER_PROBE_BYTES));
    await readFully(fh, probe, 0, path);
    compressed = probe.byteLength >= 2 && probe[0] === 0x1f && probe[1] === 0x8b;
    if (!compressed) refuseNonNifti(probe, path);
    ({ header, data } = compressed ? await readCompressed(fh, path, options.sharedMemory === true) : await readPlain(fh, probe, size, path, options.sharedMemory === true));
  } finally {
    await fh.close();
  }

  const at = { file: path };
  const [nx, ny, nz, nt] = header.dims4;
  const scan = scanNonFinite(data, nonFinite === 'zero');
  if (scan.count > 0 && nonFinite === 'error') {
    const i = scan.firstIndex;
    const ijkt = [i % nx, Math.floor(i / nx) % ny, Math.floor(i / (nx * ny)) % nz, Math.floor(i / (nx * ny * nz))];
    fail('NON_FINITE_VOXELS', `${scan.count} of ${data.length} voxels are NaN or infinite; the first is index ${i} (i, j, k, t = ${ijkt.join(', ')}); pass nonFinite: 'zero' to set them to 0`, {
      ...at, details: { count: scan.count, firstIndex: i, firstVoxel: ijkt },
    });
  }

  const units = niftiUnits(header.xyztUnits);
  const { affine, source } = niftiTransform(header, units.toMm);
  if (!usableAffine(affine)) fail('NIFTI_BAD_TRANSFORM', `the ${source} mapping is degenerate (zero determinant or non-finite entries)`, at);
  const headerTr = header.pixdim[4] * units.toSec;
  const headerTrSec = Number.isFinite(headerTr) && headerTr > 0 ? headerTr : 0;
  const volume = makeVolume({
    dims: [nx, ny, nz, nt],
    spacingMm: affineSpacing(affine),
    trSec: nt > 1 ? headerTrSec : 0,
    affine,
    data,
  });
  const info: NiftiReadInfo = {
    path,
    niftiVersion: header.version,
    datatype: header.datatype.name,
    littleEndian: header.littleEndian,
    transformSource: source,
    sformCode: header.sformCode,
    qformCode: header.qformCode,
    sclSlope: header.sclSlope,
    sclInter: header.sclInter,
    nonFiniteCount: scan.count,
    description: header.description,
    intentName: header.intentName,
    compressed,
    spaceUnit: units.space,
    timeUnit: units.time,
    headerTrSec,
  };
  return { volume, info };
}

async function openForReading(path: string): Promise<FileHandle> {
  try {
    const fh = await open(path, 'r');
    const st = await fh.stat().catch(async (e) => { await fh.close(); throw e; });
    if (!st.isFile()) {
      await fh.close();
      fail('READ_FAILED', `${path} is not a regular file`, { file: path });
    }
    return fh;
  } catch (e) {
    if ((e as { name?: string }).name === 'BoldsweepError') throw e;
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') fail('FILE_NOT_FOUND', `no file at ${path}`, { file: path, cause: e });
    fail('READ_FAILED', `cannot open ${path} (${(e as Error).message})`, { file: path, cause: e });
  }
}

/** Fill `into` from `position` on; a short file is the caller's business (it checked the size). */
async function readFully(fh: FileHandle, into: Uint8Array, position: number, path: string): Promise<void> {
  let done = 0;
  while (done < into.byteLength) {
    const want = Math.min(into.byteLength - done, MAX_READ_BYTES);
    const { bytesRead } = await fh.read(into, done, want, position + done);
    if (bytesRead === 0) fail('NIFTI_TRUNCATED', `file ended at byte ${position + done} while reading`, { file: path });
    done += bytesRead;
  }
}

/** scl_slope/scl_inter as the converter wants them: slope 0 for "no scaling" (also for slope 1, inter 0). */
function effectiveScaling(h: NiftiHeaderFacts): { slope: number; inter: number } {
  const slope = h.sclSlope;
  if (slope === 0 || !Number.isFinite(slope)) return { slope: 0, inter: 0 };
  const inter = Number.isFinite(h.sclInter) ? h.sclInter : 0;
  if (slope === 1 && inter === 0) return { slope: 0, inter: 0 };
  return { slope, inter };
}

function floatArray(length: number, shared: boolean): Float32Array {
  return shared ? new Float32Array(new SharedArrayBuffer(length * 4)) : new Float32Array(length);
}

function dataBytesOf(h: NiftiHeaderFacts): number {
  const [nx, ny, nz, nt] = h.dims4;
  return nx * ny * nz * nt * h.datatype.bytes;
}

async function readPlain(fh: FileHandle, probe: Uint8Array, size: number, path: string, shared: boolean): Promise<{ header: NiftiHeaderFacts; data: Float32Array }> {
  const header = parseNiftiHeader(probe, path);
  const need = dataBytesOf(header);
  const have = size - header.voxOffset;
  checkDataLength(header, have, need, path);
  const voxels = need / header.datatype.bytes;
  const out = floatArray(voxels, shared);
  const { slope, inter } = effectiveScaling(header);
  if (header.datatype.name === 'float32' && header.littleEndian === LITTLE_ENDIAN_HOST) {
    // already the output format: read straight into it
    await readFully(fh, new Uint8Array(out.buffer), header.voxOffset, path);
    if (slope !== 0) for (let i = 0; i < voxels; i++) out[i] = out[i] * slope + inter;
    return { header, data: out };
  }
  const slice = new Uint8Array(Math.min(READ_SLICE_BYTES, need));
  for (let done = 0; done < need; done += slice.byteLength) {
    const part = slice.subarray(0, Math.min(slice.byteLength, need - done));
    await readFully(fh, part, header.voxOffset + done, path);
    convertVoxels(part, header.datatype, header.littleEndian, slope, inter, out, done / header.datatype.bytes);
  }
  return { header, data: out };
}

/**
 * Inflate a .nii.gz in pieces of {@link INFLATE_PIECE_BYTES}, converting each piece's voxels straight
 * into the output: neither the compressed file nor its decompressed copy is ever held whole. Why it
 * matters beyond the bytes themselves: glibc's malloc raises its mmap threshold (and its trim
 * threshold, to twice that) to the size of the largest mmapped block a program frees, process-wide;
 * freeing one decompressed copy of a run (tens of MB) so left every later mid-sized array of every
 * thread in malloc's arenas, untrimmed, about 35 MB more at a demo sweep's peak.
 */
async function readCompressed(fh: FileHandle, path: string, shared: boolean): Promise<{ header: NiftiHeaderFacts; data: Float32Array }> {
  const gunzip = createGunzip({ chunkSize: INFLATE_PIECE_BYTES });
  const source = fh.createReadStream({ start: 0, highWaterMark: INFLATE_PIECE_BYTES, autoClose: false, emitClose: false });
  source.on('error', (e) => gunzip.destroy(Object.assign(new Error(e.message), { readFailed: true, cause: e })));
  source.pipe(gunzip);
  let head: Uint8Array = new Uint8Array(0);
  let header: NiftiHeaderFacts | null = null;
  let out: Float32Array | null = null;
  let need = 0;
  let skip = 0; // decompressed bytes between the header probe and vox_offset still to pass over
  let dataDone = 0; // data bytes seen so far
  const carry = new Uint8Array(16); // a voxel split between two pieces
  let carried = 0;
  let slope = 0;
  let inter = 0;
  const startData = (h: NiftiHeaderFacts): void => {
    header = h;
    need = dataBytesOf(h);
    out = floatArray(need / h.datatype.bytes, shared);
    ({ slope, inter } = effectiveScaling(h));
  };
  const takeData = (piece: Uint8Array): void => {
    const h = header!;
    const size = h.datatype.bytes;
    if (dataDone + piece.byteLength > need) {
      fail('NIFTI_SIZE_MISMATCH', `decompressed data are longer than the ${h.voxOffset + need} bytes the header describes (vox_offset ${h.voxOffset} + ${h.dims4.join('x')} ${h.datatype.name} voxels)`, { file: path });
    }
    let p = piece;
    if (carried > 0) {
      const fill = Math.min(size - carried, p.byteLength);
      carry.set(p.subarray(0, fill), carried);
      carried += fill;
      p = p.subarray(fill);
      if (carried === size) {
        convertVoxels(carry.subarray(0, size), h.datatype, h.littleEndian, slope, inter, out!, (dataDone - (carried - fill)) / size);
        carried = 0;
      }
    }
    const whole = p.byteLength - (p.byteLength % size);
    const at = dataDone + piece.byteLength - p.byteLength;
    if (whole > 0) convertVoxels(p.subarray(0, whole), h.datatype, h.littleEndian, slope, inter, out!, at / size);
    if (whole < p.byteLength) {
      carry.set(p.subarray(whole), 0);
      carried = p.byteLength - whole;
    }
    dataDone += piece.byteLength;
  };
  /** Decompressed bytes in file order: the header probe, then the bytes up to vox_offset, then the voxels. */
  const feed = (chunk: Uint8Array, last: boolean): void => {
    let piece = chunk;
    if (header === null) {
      const joined = new Uint8Array(head.byteLength + piece.byteLength);
      joined.set(head, 0);
      joined.set(piece, head.byteLength);
      if (joined.byteLength < HEADER_PROBE_BYTES && !last) {
        head = joined;
        return;
      }
      startData(parseNiftiHeader(joined, path));
      head = new Uint8Array(0);
      piece = joined;
      skip = header!.voxOffset;
    }
    if (skip > 0) {
      const n = Math.min(skip, piece.byteLength);
      skip -= n;
      piece = piece.subarray(n);
    }
    if (piece.byteLength > 0) takeData(piece);
  };
  try {
    for await (const chunk of gunzip as AsyncIterable<Buffer>) feed(chunk, false);
  } catch (e) {
    if ((e as { name?: string }).name === 'BoldsweepError') throw e;
    if ((e as { readFailed?: boolean }).readFailed) fail('READ_FAILED', `cannot read ${path} (${(e as Error).message})`, { file: path, cause: e });
    gzipFailure(e, path, header === null ? 'header' : 'data');
  } finally {
    source.unpipe(gunzip);
    source.destroy();
    gunzip.destroy();
  }
  if (header === null) feed(new Uint8Array(0), true); // the whole file is shorter than the header probe
  const h = header as unknown as NiftiHeaderFacts;
  checkDataLength(h, dataDone - skip, need, path);
  return { header: h, data: out! };
}

function checkDataLength(h: NiftiHeaderFacts, have: number, need: number, path: string): void {
  const what = `header dims ${h.dims4.join('x')} of ${h.datatype.name} need ${need} bytes after vox_offset ${h.voxOffset}`;
  if (have < need) fail('NIFTI_TRUNCATED', `${what}, but the file holds ${Math.max(0, have)}`, { file: path, details: { needBytes: need, haveBytes: have } });
  if (have > need) fail('NIFTI_SIZE_MISMATCH', `${what}, but the file holds ${have} (${have - need} extra)`, { file: path, details: { needBytes: need, haveBytes: have } });
}

/**
 * Say plainly what a file that is neither gzip nor a NIfTI header is: a .gz name on an uncompressed
 * file, or text (an error page or a list saved under an image's name is a common mix-up).
 */
function refuseNonNifti(probe: Uint8Array, path: string): void {
  if (probe.byteLength < 4) return; // parseNiftiHeader reports a too-short file
  const view = new DataView(probe.buffer, probe.byteOffset, probe.byteLength);
  const sizes = [view.getInt32(0, true), view.getInt32(0, false)];
  if (sizes.some((n) => n === 348 || n === 540)) return;
  const head = probe.subarray(0, Math.min(probe.byteLength, 256));
  const text = head.every((b) => b === 9 || b === 10 || b === 13 || (b >= 32 && b < 127) || b >= 128);
  const gz = /\.gz$/i.test(path);
  const what = text ? `it holds text (it starts with ${JSON.stringify(Buffer.from(head.subarray(0, 40)).toString('utf8'))})` : `sizeof_hdr is ${sizes[0]} (should be 348 for NIfTI-1 or 540 for NIfTI-2)`;
  fail('NIFTI_BAD_MAGIC', `${basename(path)} is not a NIfTI file: ${gz ? 'it is named .gz but is not gzip-compressed, and ' : ''}${what}`, { file: path });
}

function gzipFailure(e: unknown, path: string, where: 'header' | 'data'): never {
  const err = e as NodeJS.ErrnoException;
  if (err.code === 'Z_BUF_ERROR') fail('NIFTI_TRUNCATED', `the gzip stream ends early (in the ${where}): ${err.message}`, { file: path, cause: e });
  fail('GZIP_CORRUPT', `gzip decompression failed in the ${where}: ${err.message}`, { file: path, cause: e });
}
