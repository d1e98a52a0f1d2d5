import { NIFTI1, NIFTI2 } from 'nifti-reader-js';
import { fail } from '../core/fail.js';
import { NIFTI_DATATYPES, niftiDatatypeName, type NiftiDatatype } from './nifti-datatypes.js';

/** The header fields the reader uses, checked and in plain numbers. */
export interface NiftiHeaderFacts {
  version: 1 | 2;
  littleEndian: boolean;
  /** 348 (NIfTI-1) or 540 (NIfTI-2). */
  headerBytes: number;
  /** dim[0..7] as stored. */
  dim: number[];
  /** [nx, ny, nz, nt] with absent dimensions as 1. */
  dims4: [number, number, number, number];
  datatype: NiftiDatatype;
  /** pixdim[0..7] as stored. */
  pixdim: number[];
  voxOffset: number;
  sclSlope: number;
  sclInter: number;
  xyztUnits: number;
  qformCode: number;
  sformCode: number;
  quatern: { b: number; c: number; d: number; x: number; y: number; z: number };
  /** srow_x, srow_y, srow_z. */
  srow: number[][];
  description: string;
  intentName: string;
}

/** Refuse headers claiming more than this many voxels along any axis (2^15). */
export const MAX_DIM = 32768;
/** Refuse headers claiming more voxels than this in total (2^31: 8 GiB as float32). */
export const MAX_VOXELS = 2 ** 31;

/** Bytes to read before knowing anything: a NIfTI-2 header plus its 4-byte extension flag. */
export const HEADER_PROBE_BYTES = 544;

const NIFTI2_MAGIC = [0x6e, 0x2b, 0x32, 0x00, 0x0d, 0x0a, 0x1a, 0x0a]; // "n+2\0\r\n\032\n" (nifti2.h)

/**
 * Parse and check a NIfTI-1 or NIfTI-2 single-file header. Field parsing is done by nifti-reader-js;
 * the 64-bit fields of NIfTI-2 and srow of NIfTI-1 are read here directly (the library's 64-bit
 * reader mishandles big-endian sign bits, and it hides srow when it prefers the qform).
 * Refuses before any allocation: bad magic, dim[0] outside 1..7, a dimension < 1, any dimension
 * above 2^15 or more than 2^31 voxels in total (8 GiB as float32), dimensions beyond the 4th that
 * are not 1, unsupported datatypes, vox_offset inside the header.
 * @param head - the first bytes of the (decompressed) file, at least the header if the file has one
 * @param path - file name for messages
 * @returns the checked header facts
 * @throws BoldsweepError NIFTI_TRUNCATED, NIFTI_BAD_MAGIC, NIFTI_BAD_DIMS, NIFTI_ABSURD_SIZE, NIFTI_TOO_MANY_DIMS, NIFTI_UNSUPPORTED_DATATYPE, NIFTI_SIZE_MISMATCH
 * @example const h = parseNiftiHeader(firstBytes, 'bold.nii.gz')
 */
export function parseNiftiHeader(head: Uint8Array, path: string): NiftiHeaderFacts {
  const at = { file: path };
  if (head.byteLength < 4) fail('NIFTI_TRUNCATED', `file is ${head.byteLength} bytes long, too short to hold a NIfTI header`, at);
  const view = new DataView(head.buffer, head.byteOffset, head.byteLength);
  const sizeLE = view.getInt32(0, true);
  const sizeBE = view.getInt32(0, false);
  const headerBytes = sizeLE === 348 || sizeBE === 348 ? 348 : sizeLE === 540 || sizeBE === 540 ? 540 : 0;
  if (headerBytes === 0) fail('NIFTI_BAD_MAGIC', `sizeof_hdr is ${sizeLE} (should be 348 for NIfTI-1 or 540 for NIfTI-2)`, at);
  const littleEndian = sizeLE === headerBytes;
  if (head.byteLength < headerBytes) fail('NIFTI_TRUNCATED', `file ends at byte ${head.byteLength}, inside the ${headerBytes}-byte header`, at);
  const version: 1 | 2 = headerBytes === 348 ? 1 : 2;
  checkMagic(head, version, path);

  // nifti-reader-js reads from an ArrayBuffer holding exactly the header (so it does not look for extensions)
  const copy = head.slice(0, headerBytes).buffer;
  const lib = version === 1 ? new NIFTI1() : new NIFTI2();
  lib.readHeader(copy);

  const dim = version === 1 ? lib.dims.slice(0, 8) : readInt64s(view, 16, 8, littleEndian);
  const voxOffset = version === 1 ? lib.vox_offset : readInt64s(view, 168, 1, littleEndian)[0];
  const srow = version === 1
    ? [0, 1, 2].map((r) => [0, 1, 2, 3].map((c) => view.getFloat32(280 + 16 * r + 4 * c, littleEndian)))
    : lib.affine.slice(0, 3).map((row) => row.slice(0, 4));

  const ndim = dim[0];
  if (!Number.isInteger(ndim) || ndim < 1 || ndim > 7) fail('NIFTI_BAD_DIMS', `dim[0] is ${ndim} (must be 1..7)`, at);
  for (let i = 1; i <= ndim; i++) {
    if (!(dim[i] >= 1)) fail('NIFTI_BAD_DIMS', `dim[${i}] is ${dim[i]} (must be >= 1); dim = [${dim.join(', ')}]`, at);
    if (dim[i] > MAX_DIM) fail('NIFTI_ABSURD_SIZE', `dim[${i}] is ${dim[i]}; boldsweep refuses any dimension above ${MAX_DIM} (2^15) before allocating`, at);
  }
  let voxels = 1;
  for (let i = 1; i <= ndim; i++) voxels *= dim[i];
  if (voxels > MAX_VOXELS) fail('NIFTI_ABSURD_SIZE', `header claims ${voxels} voxels (dim = [${dim.slice(1, ndim + 1).join(', ')}]); boldsweep refuses more than 2^31 voxels (8 GiB as float32) before allocating`, at);
  for (let i = 5; i <= ndim; i++) {
    if (dim[i] !== 1) fail('NIFTI_TOO_MANY_DIMS', `dim[0] is ${ndim} and dim[${i}] is ${dim[i]}; only x, y, z and time are supported`, at);
  }
  const dims4: [number, number, number, number] = [dim[1], ndim >= 2 ? dim[2] : 1, ndim >= 3 ? dim[3] : 1, ndim >= 4 ? dim[4] : 1];

  const datatype = NIFTI_DATATYPES.get(lib.datatypeCode);
  if (!datatype) fail('NIFTI_UNSUPPORTED_DATATYPE', `datatype is ${niftiDatatypeName(lib.datatypeCode)} (code ${lib.datatypeCode})`, at);

  const minOffset = headerBytes;
  if (!Number.isInteger(voxOffset) || voxOffset < minOffset) {
    fail('NIFTI_SIZE_MISMATCH', `vox_offset is ${voxOffset}, inside the ${headerBytes}-byte header (must be an integer >= ${minOffset})`, at);
  }

  return {
    version,
    littleEndian,
    headerBytes,
    dim,
    dims4,
    datatype,
    pixdim: lib.pixDims.slice(0, 8),
    voxOffset,
    sclSlope: lib.scl_slope,
    sclInter: lib.scl_inter,
    xyztUnits: lib.xyzt_units,
    qformCode: lib.qform_code,
    sformCode: lib.sform_code,
    quatern: { b: lib.quatern_b, c: lib.quatern_c, d: lib.quatern_d, x: lib.qoffset_x, y: lib.qoffset_y, z: lib.qoffset_z },
    srow,
    description: lib.description,
    intentName: lib.intent_name,
  };
}

function checkMagic(head: Uint8Array, version: 1 | 2, path: string): void {
  if (version === 1) {
    const magic = String.fromCharCode(head[344], head[345], head[346]);
    if (magic === 'ni1') fail('NIFTI_BAD_MAGIC', `magic is "ni1": a separate header/image pair (.hdr + .img), which boldsweep does not read; save it as one .nii file`, { file: path });
    if (magic !== 'n+1' || head[347] !== 0) fail('NIFTI_BAD_MAGIC', `magic at byte 344 is ${JSON.stringify(String.fromCharCode(...head.subarray(344, 348)))}, expected "n+1"`, { file: path });
  } else {
    for (let i = 0; i < 8; i++) {
      if (head[4 + i] !== NIFTI2_MAGIC[i]) {
        if (head[5] === 0x69) fail('NIFTI_BAD_MAGIC', `magic is "ni2": a separate header/image pair, which boldsweep does not read; save it as one .nii file`, { file: path });
        fail('NIFTI_BAD_MAGIC', `magic at byte 4 is ${JSON.stringify(String.fromCharCode(...head.subarray(4, 12)))}, expected "n+2\\0\\r\\n\\032\\n"`, { file: path });
      }
    }
  }
}

/** Signed 64-bit integers as numbers (exact up to 2^53; anything larger is absurd for our checks anyway). */
function readInt64s(view: DataView, offset: number, count: number, littleEndian: boolean): number[] {
  const out: number[] = [];
  for (let i = 0; i < count; i++) out.push(Number(view.getBigInt64(offset + 8 * i, littleEndian)));
  return out;
}
