import { fail } from '../core/fail.js';
import { distortLines } from './distort-lines.js';

/**
 * Geometric EPI distortion along one axis: the signal of each position y is moved to y + shift(y),
 * on every line of the image along `axis` ({@link distortLines} describes the method: signal and its
 * first moment along each line are kept; converging shifts pile signal up, spreading ones thin it).
 * @param image - one 3D image, NIfTI order
 * @param shiftVoxels - shift at each voxel, in voxels along `axis`
 * @param dims - [nx, ny, nz]
 * @param axis - 0, 1 or 2 (i, j, k)
 * @param out - where to write (length nx*ny*nz, not aliasing `image`); a new array when omitted
 * @param subsamples - pieces per voxel, even. __Default value:__ 8
 * @returns `out`
 * @throws BoldsweepError INVALID_ARGUMENT for mismatched lengths, a bad axis or subsample count
 * @example distortAlongAxis(img, shifts, [44, 52, 34], 1)
 */
export function distortAlongAxis(
  image: ArrayLike<number>,
  shiftVoxels: ArrayLike<number>,
  dims: readonly [number, number, number],
  axis: 0 | 1 | 2,
  out?: Float32Array,
  subsamples = 8,
): Float32Array {
  const n = dims[0] * dims[1] * dims[2];
  if (axis !== 0 && axis !== 1 && axis !== 2) fail('INVALID_ARGUMENT', `axis must be 0, 1 or 2, got ${String(axis)}`);
  const result = out ?? new Float32Array(n);
  return distortLines(image, shiftVoxels, dims, axis, lineStartsAlong(dims, axis), result, subsamples);
}

/** First voxel of every line along `axis`, in the order the lines are stored. */
function lineStartsAlong(dims: readonly [number, number, number], axis: 0 | 1 | 2): Int32Array {
  const lines = (dims[0] * dims[1] * dims[2]) / dims[axis];
  const starts = new Int32Array(lines);
  for (let line = 0; line < lines; line++) {
    starts[line] = axis === 0 ? line * dims[0] : axis === 1 ? (line % dims[0]) + dims[0] * dims[1] * Math.floor(line / dims[0]) : line;
  }
  return starts;
}
