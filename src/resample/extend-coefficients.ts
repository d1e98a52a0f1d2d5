import type { BoundaryMode } from '../core/boundary-mode.js';
import { extendIndex } from './extend-index.js';

/**
 * Copy a coefficient (or voxel) array into a larger one with `margin` extra planes on each side,
 * filled by the interpolation extension of the mode (extendIndex: `constant` reads the mirror,
 * `nearest` the edge, the others their own symmetry). Inside that margin the spline of the
 * extended array equals the spline of the folded position, so a resampler may read it directly
 * instead of mapping every tap near an edge.
 * @param c - values, x fastest, on dims (Float32 or Float64; the result has the same type)
 * @param dims - [nx, ny, nz] of `c`
 * @param mode - boundary mode
 * @param margin - planes added on each side
 * @param out - a reusable array of the extended size, optional
 * @returns the extended array and its dims
 * @example extendCoefficients(coefficients, [64, 64, 36], 'constant', 2)
 */
export function extendCoefficients<T extends Float32Array | Float64Array>(c: T, dims: readonly [number, number, number], mode: BoundaryMode, margin: number, out?: T): { values: T; dims: [number, number, number] } {
  const [nx, ny, nz] = dims;
  const ox = nx + 2 * margin, oy = ny + 2 * margin, oz = nz + 2 * margin;
  // the same element type as `c` (Float32 voxels for the linear kernel, Float64 cubic coefficients)
  const values = (out && out.length === ox * oy * oz ? out : c instanceof Float32Array ? new Float32Array(ox * oy * oz) : new Float64Array(ox * oy * oz)) as T;
  const xs = Int32Array.from({ length: ox }, (_, i) => extendIndex(i - margin, nx, mode));
  let p = 0;
  for (let k = 0; k < oz; k++) {
    const kk = extendIndex(k - margin, nz, mode) * nx * ny;
    for (let j = 0; j < oy; j++) {
      const row = kk + extendIndex(j - margin, ny, mode) * nx;
      if (margin > 0) {
        for (let i = 0; i < margin; i++) values[p + i] = c[row + xs[i]];
        values.set(c.subarray(row, row + nx) as ArrayLike<number>, p + margin);
        for (let i = margin + nx; i < ox; i++) values[p + i] = c[row + xs[i]];
      } else {
        values.set(c.subarray(row, row + nx) as ArrayLike<number>, p);
      }
      p += ox;
    }
  }
  return { values, dims: [ox, oy, oz] };
}
