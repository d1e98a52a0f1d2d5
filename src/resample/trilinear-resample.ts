import type { Affine } from '../core/affine.js';
import { BOUNDARY_MODES, type BoundaryMode } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import { extendIndex } from './extend-index.js';
import { foldCoordinate } from './fold-coordinate.js';

/**
 * What a sample outside the grid gets: the shared boundary modes with scipy.ndimage.map_coordinates
 * (order=1) meanings, e.g.
 * - `'constant'`: `cval` for any point outside [0, n-1] on some axis (no blending with `cval` at the
 *   edge);
 * - `'nearest'`: the coordinate is clamped to [0, n-1] (edge value repeated);
 * - `'reflect'`, `'mirror'`, `'wrap'` (period n): see foldCoordinate.
 */
export type TrilinearMode = BoundaryMode;

/** Options of {@link trilinearResample}. */
export interface TrilinearOptions {
  /** __Default value:__ `'constant'` */
  mode?: TrilinearMode;
  /** Value outside the grid in `'constant'` mode. __Default value:__ 0 */
  cval?: number;
}

/**
 * Trilinear interpolation of one 3D image at a continuous voxel position (i, j, k).
 * @param src - voxel values in NIfTI order (x fastest), length nx*ny*nz
 * @param dims - [nx, ny, nz]
 * @param x - position along i, in voxels
 * @param y - position along j, in voxels
 * @param z - position along k, in voxels
 * @param mode - boundary handling, see {@link TrilinearMode}
 * @param cval - value outside the grid in `'constant'` mode
 * @returns the interpolated value
 * @example trilinearAt(img, [4, 4, 4], 1.5, 2, 0.25, 'constant', 0)
 */
export function trilinearAt(src: ArrayLike<number>, dims: readonly [number, number, number] | readonly number[], x: number, y: number, z: number, mode: TrilinearMode, cval: number): number {
  const nx = dims[0], ny = dims[1], nz = dims[2];
  if (mode !== 'constant' && mode !== 'nearest') return trilinearExtended(src, nx, ny, nz, x, y, z, mode);
  if (mode === 'constant') {
    if (!(x >= 0 && x <= nx - 1 && y >= 0 && y <= ny - 1 && z >= 0 && z <= nz - 1)) return cval;
  } else {
    x = x < 0 ? 0 : x > nx - 1 ? nx - 1 : x;
    y = y < 0 ? 0 : y > ny - 1 ? ny - 1 : y;
    z = z < 0 ? 0 : z > nz - 1 ? nz - 1 : z;
  }
  // the upper neighbour is clamped so that a point exactly on the last plane needs no outside value
  let i0 = Math.floor(x), j0 = Math.floor(y), k0 = Math.floor(z);
  if (i0 > nx - 2) i0 = Math.max(nx - 2, 0);
  if (j0 > ny - 2) j0 = Math.max(ny - 2, 0);
  if (k0 > nz - 2) k0 = Math.max(nz - 2, 0);
  const fx = x - i0, fy = y - j0, fz = z - k0;
  const di = nx > 1 ? 1 : 0, dj = ny > 1 ? nx : 0, dk = nz > 1 ? nx * ny : 0;
  const p = i0 + nx * (j0 + ny * k0);
  const c00 = src[p] + fx * (src[p + di] - src[p]);
  const c10 = src[p + dj] + fx * (src[p + dj + di] - src[p + dj]);
  const c01 = src[p + dk] + fx * (src[p + dk + di] - src[p + dk]);
  const c11 = src[p + dk + dj] + fx * (src[p + dk + dj + di] - src[p + dk + dj]);
  const c0 = c00 + fy * (c10 - c00);
  const c1 = c01 + fy * (c11 - c01);
  return c0 + fz * (c1 - c0);
}

/** Trilinear value under reflect, mirror or wrap: the position folded, then the taps extended. */
function trilinearExtended(src: ArrayLike<number>, nx: number, ny: number, nz: number, x: number, y: number, z: number, mode: BoundaryMode): number {
  x = foldCoordinate(x, nx, mode); y = foldCoordinate(y, ny, mode); z = foldCoordinate(z, nz, mode);
  const i0 = Math.floor(x), j0 = Math.floor(y), k0 = Math.floor(z);
  const fx = x - i0, fy = y - j0, fz = z - k0;
  const ia = extendIndex(i0, nx, mode), ib = extendIndex(i0 + 1, nx, mode);
  const ja = nx * extendIndex(j0, ny, mode), jb = nx * extendIndex(j0 + 1, ny, mode);
  const ka = nx * ny * extendIndex(k0, nz, mode), kb = nx * ny * extendIndex(k0 + 1, nz, mode);
  const c00 = src[ia + ja + ka] + fx * (src[ib + ja + ka] - src[ia + ja + ka]);
  const c10 = src[ia + jb + ka] + fx * (src[ib + jb + ka] - src[ia + jb + ka]);
  const c01 = src[ia + ja + kb] + fx * (src[ib + ja + kb] - src[ia + ja + kb]);
  const c11 = src[ia + jb + kb] + fx * (src[ib + jb + kb] - src[ia + jb + kb]);
  const c0 = c00 + fy * (c10 - c00);
  const c1 = c01 + fy * (c11 - c01);
  return c0 + fz * (c1 - c0);
}

/**
 * Resample a 3D image through an affine map of voxel indices: output voxel (i, j, k) takes the
 * trilinear value of `src` at `srcFromOut * [i, j, k, 1]`. Use it to move an image rigidly (pass
 * inverse(voxel->world) . inverse(motion) . voxel->world) or to put it on another grid.
 * @param src - source voxel values, NIfTI order
 * @param srcDims - source [nx, ny, nz]
 * @param srcFromOut - row-major 4x4: output voxel index -> source voxel index
 * @param outDims - output [nx, ny, nz]
 * @param out - where to write (length outDims product); a new array when omitted
 * @param options - boundary mode and fill value
 * @returns `out`
 * @example trilinearResample(img, [44,52,34], translationInVoxels, [44,52,34])
 */
export function trilinearResample(
  src: ArrayLike<number>,
  srcDims: readonly [number, number, number],
  srcFromOut: Affine,
  outDims: readonly [number, number, number],
  out?: Float32Array,
  options: TrilinearOptions = {},
): Float32Array {
  const mode = options.mode ?? 'constant';
  const cval = options.cval ?? 0;
  if (!BOUNDARY_MODES.includes(mode)) fail('INVALID_ARGUMENT', `mode must be one of ${BOUNDARY_MODES.join(', ')}, got '${String(mode)}'`);
  if (srcDims.some((d) => !Number.isInteger(d) || d < 1) || outDims.some((d) => !Number.isInteger(d) || d < 1)) fail('INVALID_ARGUMENT', `dims must be positive integers, got source [${srcDims.join(', ')}] and output [${outDims.join(', ')}]`);
  if (src.length !== srcDims[0] * srcDims[1] * srcDims[2]) fail('INVALID_ARGUMENT', `source length ${src.length} does not match dims [${srcDims.join(', ')}]`);
  if (srcFromOut.length !== 16) fail('INVALID_ARGUMENT', `srcFromOut must have 16 elements, got ${srcFromOut.length}`);
  const [ox, oy, oz] = outDims;
  const result = out ?? new Float32Array(ox * oy * oz);
  if (result.length !== ox * oy * oz) fail('INVALID_ARGUMENT', `out length ${result.length} does not match output dims [${outDims.join(', ')}]`);
  const m = srcFromOut;
  let p = 0;
  for (let k = 0; k < oz; k++) {
    for (let j = 0; j < oy; j++) {
      // position of (0, j, k); stepping i adds the first column
      let x = m[1] * j + m[2] * k + m[3];
      let y = m[5] * j + m[6] * k + m[7];
      let z = m[9] * j + m[10] * k + m[11];
      for (let i = 0; i < ox; i++, p++) {
        result[p] = trilinearAt(src, srcDims, x, y, z, mode, cval);
        x += m[0]; y += m[4]; z += m[8];
      }
    }
  }
  return result;
}
