import { constants as zlibConstants, gzipSync } from 'node:zlib';
import { affineToQuaternion } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Volume } from '../core/volume.js';
import { writeFileAtomic } from './atomic-write.js';
import { int16Scaling } from './int16-scaling.js';
import { usableAffine } from './nifti-transform.js';

/** Options of {@link writeNifti}. */
export interface WriteNiftiOptions {
  /** Stored voxel type. __Default value:__ `'float32'` (exact). `'int16'` halves the size; values are scaled (see {@link int16Scaling}). */
  datatype?: 'float32' | 'int16';
  /** Header description (descrip), at most 79 ASCII characters. __Default value:__ `''`. */
  description?: string;
  /** Header intent_name, at most 15 ASCII characters. __Default value:__ `''`. */
  intentName?: string;
  /** gzip level 1-9 for `.nii.gz`. __Default value:__ `6` (the zlib default). */
  gzipLevel?: number;
}

/** NIfTI-1 header size and where the voxel data start (348-byte header + 4-byte empty extension flag). */
const HEADER_BYTES = 348;
const VOX_OFFSET = 352;
/** nifti1.h datatype codes. */
const DT_INT16 = 4;
const DT_FLOAT32 = 16;
/** nifti1.h xyzt_units: NIFTI_UNITS_MM (2) | NIFTI_UNITS_SEC (8). */
const UNITS_MM_SEC = 2 | 8;
/** nifti1.h qform/sform code NIFTI_XFORM_SCANNER_ANAT. */
const XFORM_SCANNER_ANAT = 1;
/** gzip header byte 9 (OS); 255 = unknown, fixed so the bytes do not depend on the platform zlib was built for. */
const GZIP_OS_BYTE = 9;

const LITTLE_ENDIAN_HOST = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/**
 * Build the 352 bytes before the voxel data (NIfTI-1 header + zero extension flag), little-endian.
 * Field offsets follow nifti1.h.
 * @param volume - the image whose geometry to describe
 * @param datatype - stored type
 * @param slope - scl_slope
 * @param inter - scl_inter
 * @param description - descrip text (validated ASCII)
 * @param intentName - intent_name text (validated ASCII)
 * @returns header bytes
 * @example niftiHeaderBytes(volume, 'float32', 1, 0, '', '')
 */
export function niftiHeaderBytes(volume: Volume, datatype: 'float32' | 'int16', slope: number, inter: number, description: string, intentName: string): Uint8Array {
  const buf = new Uint8Array(VOX_OFFSET);
  const view = new DataView(buf.buffer);
  const [nx, ny, nz, nt] = volume.dims;
  const ndim = nt === 1 ? 3 : 4;
  const q = affineToQuaternion(volume.affine);
  view.setInt32(0, HEADER_BYTES, true);
  buf[38] = 0x72; // regular: unused by NIfTI; 'r' as the NIfTI reference library writes it (from memory)
  const dim = [ndim, nx, ny, nz, nt, 1, 1, 1];
  for (let i = 0; i < 8; i++) view.setInt16(40 + 2 * i, dim[i], true);
  view.setInt16(70, datatype === 'float32' ? DT_FLOAT32 : DT_INT16, true);
  view.setInt16(72, datatype === 'float32' ? 32 : 16, true);
  const pixdim = [q.qfac, q.pixdimMm[0], q.pixdimMm[1], q.pixdimMm[2], nt > 1 ? volume.trSec : 1, 1, 1, 1];
  for (let i = 0; i < 8; i++) view.setFloat32(76 + 4 * i, pixdim[i], true);
  view.setFloat32(108, VOX_OFFSET, true);
  view.setFloat32(112, slope, true);
  view.setFloat32(116, inter, true);
  buf[123] = UNITS_MM_SEC;
  writeAscii(buf, 148, description);
  view.setInt16(252, XFORM_SCANNER_ANAT, true);
  view.setInt16(254, XFORM_SCANNER_ANAT, true);
  const quat = [q.quaternB, q.quaternC, q.quaternD, q.qoffsetX, q.qoffsetY, q.qoffsetZ];
  for (let i = 0; i < 6; i++) view.setFloat32(256 + 4 * i, quat[i], true);
  for (let r = 0; r < 3; r++) for (let c = 0; c < 4; c++) view.setFloat32(280 + 16 * r + 4 * c, volume.affine[4 * r + c], true);
  writeAscii(buf, 328, intentName);
  buf[344] = 0x6e; buf[345] = 0x2b; buf[346] = 0x31; buf[347] = 0; // magic "n+1\0": header and data in one file
  return buf;
}

/** Text is checked to be shorter than its field, so the zero bytes after it terminate it. */
function writeAscii(buf: Uint8Array, offset: number, text: string): void {
  for (let i = 0; i < text.length; i++) buf[offset + i] = text.charCodeAt(i);
}

function checkText(text: string, maxChars: number, name: string): string {
  if (text.length > maxChars || !/^[\x20-\x7e]*$/.test(text)) {
    fail('INVALID_ARGUMENT', `${name} must be at most ${maxChars} printable ASCII characters, got ${JSON.stringify(text.slice(0, 100))}`);
  }
  return text;
}

/**
 * Voxel bytes (little-endian) of a volume as float32, or as int16 after scaling.
 * @param data - voxel values
 * @param datatype - stored type
 * @param slope - int16 step (ignored for float32)
 * @param inter - int16 offset (ignored for float32)
 * @returns bytes; for float32 on a little-endian host a view of `data` (no copy)
 * @example niftiVoxelBytes(volume.data, 'float32', 1, 0)
 */
export function niftiVoxelBytes(data: Float32Array, datatype: 'float32' | 'int16', slope: number, inter: number): Uint8Array {
  if (datatype === 'float32') {
    if (LITTLE_ENDIAN_HOST) return new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
    const out = new Uint8Array(data.length * 4);
    const view = new DataView(out.buffer);
    for (let i = 0; i < data.length; i++) view.setFloat32(4 * i, data[i], true);
    return out;
  }
  const out = new Int16Array(data.length);
  for (let i = 0; i < data.length; i++) {
    const q = Math.round((data[i] - inter) / slope);
    out[i] = q > 32767 ? 32767 : q < -32768 ? -32768 : q;
  }
  const bytes = new Uint8Array(out.buffer);
  if (!LITTLE_ENDIAN_HOST) for (let i = 0; i < bytes.length; i += 2) { const t = bytes[i]; bytes[i] = bytes[i + 1]; bytes[i + 1] = t; }
  return bytes;
}

/**
 * Write a volume as a single-file NIfTI-1 image: `.nii.gz` (gzip) when the path ends so, else `.nii`.
 * The header carries both a qform (quaternion, code 1) and an sform (the affine rows, code 1), voxel
 * sizes (pixdim[1..3] = the affine's column lengths; shears survive only in the sform),
 * pixdim[4] = trSec for a 4D run, units mm and s, vox_offset 352. Output is byte-deterministic
 * (no timestamps; the gzip OS byte is fixed; same zlib build -> same bytes). Written atomically.
 * @param path - destination, ending in `.nii` or `.nii.gz`
 * @param volume - the image (3D when dims[3] is 1)
 * @param options - stored datatype, description, intent name, gzip level
 * @returns resolves when the file is in place
 * @throws BoldsweepError INVALID_ARGUMENT for a bad extension, text field or non-finite data with int16; WRITE_FAILED when the file cannot be written
 * @example await writeNifti('out/mean.nii.gz', meanMap, { description: 'mean over time' })
 */
export async function writeNifti(path: string, volume: Volume, options: WriteNiftiOptions = {}): Promise<void> {
  const gz = /\.nii\.gz$/i.test(path);
  if (!gz && !/\.nii$/i.test(path)) fail('INVALID_ARGUMENT', `NIfTI output path must end in .nii or .nii.gz, got ${path}`);
  const datatype = options.datatype ?? 'float32';
  if (datatype !== 'float32' && datatype !== 'int16') fail('INVALID_ARGUMENT', `datatype must be 'float32' or 'int16', got ${String(datatype)}`);
  const description = checkText(options.description ?? '', 79, 'description');
  const intentName = checkText(options.intentName ?? '', 15, 'intentName');
  const level = options.gzipLevel ?? 6;
  if (!Number.isInteger(level) || level < 1 || level > 9) fail('INVALID_ARGUMENT', `gzipLevel must be an integer 1-9, got ${level}`);
  const [nx, ny, nz, nt] = volume.dims;
  if (volume.data.length !== nx * ny * nz * nt) fail('INVALID_ARGUMENT', `data length ${volume.data.length} does not match dims product ${nx * ny * nz * nt}`);
  if (!usableAffine(volume.affine)) fail('INVALID_ARGUMENT', 'the volume affine is singular or not finite, so it has no NIfTI qform/sform');
  if ([nx, ny, nz, nt].some((d) => d > 32767)) fail('INVALID_ARGUMENT', `NIfTI-1 dims are 16-bit: each must be <= 32767, got [${volume.dims.join(', ')}]`);
  const { slope, inter } = datatype === 'int16' ? int16Scaling(volume.data) : { slope: 1, inter: 0 };
  const header = niftiHeaderBytes(volume, datatype, slope, inter, description, intentName);
  const voxels = niftiVoxelBytes(volume.data, datatype, slope, inter);
  if (!gz) {
    await writeFileAtomic(path, [header, voxels]);
    return;
  }
  const whole = new Uint8Array(header.byteLength + voxels.byteLength);
  whole.set(header, 0);
  whole.set(voxels, header.byteLength);
  const packed = gzipSync(whole, { level, strategy: zlibConstants.Z_DEFAULT_STRATEGY });
  packed[GZIP_OS_BYTE] = 255;
  await writeFileAtomic(path, packed);
}
