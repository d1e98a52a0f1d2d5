import { open } from 'node:fs/promises';
import { constants as zlibConstants, gunzipSync } from 'node:zlib';
import { fail } from '../core/fail.js';
import { parseNiftiHeader, type NiftiHeaderFacts } from './nifti-header.js';

/** Compressed bytes decompressed to reach the header of a .nii.gz (gzip blocks are small; 4 KiB covers one). */
const GZIP_PROBE_BYTES = 4096;

/** A NIfTI file's header and its size on disk, read without reading the voxels. */
export interface NiftiHeaderOnly {
  header: NiftiHeaderFacts;
  /** Whether the file is gzip-compressed. */
  compressed: boolean;
  /** Size of the file on disk (compressed size for .nii.gz). */
  fileBytes: number;
}

/**
 * Read and check only the header of a NIfTI-1/2 file (`.nii` or `.nii.gz`): enough to plan
 * resources for a run of any size (dimensions, datatype) without holding its voxels.
 * @param path - the image file
 * @returns the checked header, whether the file is compressed, and its size on disk
 * @throws BoldsweepError FILE_NOT_FOUND, READ_FAILED, NIFTI_TRUNCATED, NIFTI_BAD_MAGIC and the other header checks of parseNiftiHeader
 * @example const { header } = await readNiftiHeaderFacts('sub-01_task-x_bold.nii.gz'); header.dims4 // [104, 104, 72, 600]
 */
export async function readNiftiHeaderFacts(path: string): Promise<NiftiHeaderOnly> {
  let fh;
  try {
    fh = await open(path, 'r');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') fail('FILE_NOT_FOUND', `no file at ${path}`, { file: path, cause: e });
    fail('READ_FAILED', `cannot open ${path} (${(e as Error).message})`, { file: path, cause: e });
  }
  try {
    const st = await fh.stat();
    if (!st.isFile()) fail('READ_FAILED', `${path} is not a regular file`, { file: path });
    const probe = new Uint8Array(Math.min(st.size, GZIP_PROBE_BYTES));
    const { bytesRead } = await fh.read(probe, 0, probe.byteLength, 0);
    const first = probe.subarray(0, bytesRead);
    const compressed = first.byteLength >= 2 && first[0] === 0x1f && first[1] === 0x8b;
    let head: Uint8Array = first;
    if (compressed) {
      try {
        head = gunzipSync(first, { finishFlush: zlibConstants.Z_SYNC_FLUSH });
      } catch (e) {
        fail('GZIP_CORRUPT', `the gzip stream of ${path} could not be decompressed at its start (${(e as Error).message})`, { file: path, cause: e });
      }
    }
    return { header: parseNiftiHeader(head, path), compressed, fileBytes: st.size };
  } finally {
    await fh.close();
  }
}
