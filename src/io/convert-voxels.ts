import type { NiftiDatatype } from './nifti-datatypes.js';

const LITTLE_ENDIAN_HOST = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
/** Bytes converted per pass through the scratch buffer: large enough to amortise the loop, small enough for cache. */
const SCRATCH_BYTES = 1 << 20;

/** Reusable aligned scratch, so misaligned or byte-swapped input never needs a full-size copy. */
let scratch = new Uint8Array(SCRATCH_BYTES);

/**
 * Convert raw NIfTI voxel bytes to float32, applying scl_slope/scl_inter, into `out` starting at
 * `outOffset`. Works through an aligned 1 MiB scratch buffer (swapping bytes when the file's order
 * differs from the host's), so a whole run is never copied twice.
 * @param src - raw bytes of whole voxels (length a multiple of `dtype.bytes`)
 * @param dtype - stored voxel type
 * @param littleEndian - byte order of the file
 * @param slope - scl_slope to apply, or 0 for none
 * @param inter - scl_inter (used only when slope is not 0)
 * @param out - destination
 * @param outOffset - index in `out` of the first converted voxel
 * @returns the number of voxels written
 * @example convertVoxels(bytes, NIFTI_DATATYPES.get(4)!, true, 0, 0, out, 0)
 */
export function convertVoxels(src: Uint8Array, dtype: NiftiDatatype, littleEndian: boolean, slope: number, inter: number, out: Float32Array, outOffset: number): number {
  const size = dtype.bytes;
  const count = Math.floor(src.byteLength / size);
  const swap = size > 1 && littleEndian !== LITTLE_ENDIAN_HOST;
  // plain float32 in host order: a straight byte copy into the output
  if (dtype.name === 'float32' && !swap && slope === 0) {
    new Uint8Array(out.buffer, out.byteOffset + 4 * outOffset, 4 * count).set(src.subarray(0, 4 * count));
    return count;
  }
  if (scratch.byteLength < SCRATCH_BYTES) scratch = new Uint8Array(SCRATCH_BYTES);
  const perPass = Math.floor(SCRATCH_BYTES / size);
  for (let done = 0; done < count; done += perPass) {
    const n = Math.min(perPass, count - done);
    const chunk = src.subarray(done * size, (done + n) * size);
    let typed: ArrayLike<number>;
    if (!swap && (chunk.byteOffset % size === 0)) {
      typed = new dtype.array(chunk.buffer, chunk.byteOffset, n);
    } else {
      scratch.set(chunk);
      if (swap) swapBytes(scratch, n, size);
      typed = new dtype.array(scratch.buffer, 0, n);
    }
    const dest = out.subarray(outOffset + done, outOffset + done + n);
    if (slope === 0) {
      dest.set(typed);
    } else {
      for (let i = 0; i < n; i++) dest[i] = typed[i] * slope + inter;
    }
  }
  return count;
}

/** Reverse the byte order of `n` elements of `size` bytes in place. */
function swapBytes(b: Uint8Array, n: number, size: number): void {
  if (size === 2) {
    for (let i = 0; i < 2 * n; i += 2) { const t = b[i]; b[i] = b[i + 1]; b[i + 1] = t; }
  } else if (size === 4) {
    for (let i = 0; i < 4 * n; i += 4) {
      let t = b[i]; b[i] = b[i + 3]; b[i + 3] = t;
      t = b[i + 1]; b[i + 1] = b[i + 2]; b[i + 2] = t;
    }
  } else {
    for (let i = 0; i < 8 * n; i += 8) {
      for (let k = 0; k < 4; k++) { const t = b[i + k]; b[i + k] = b[i + 7 - k]; b[i + 7 - k] = t; }
    }
  }
}
