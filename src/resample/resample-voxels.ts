import type { Affine } from '../core/affine.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { extendIndex } from './extend-index.js';
import { foldCoordinate } from './fold-coordinate.js';
import { kernelTaps, LANCZOS_RADIUS, type InterpolationKernel } from './interpolation-kernel.js';
import { lanczosWeight } from './lanczos-weight.js';

/** What {@link resampleVoxels} reads and writes (plain data: it also travels to worker threads). */
export interface ResampleVoxelsInput {
  /**
   * What is interpolated, x fastest: the source voxel values, or for `cubic` the B-spline
   * coefficients from cubicBSplinePrefilter (possibly padded, see `pad`).
   */
  source: Float32Array | Float64Array;
  /** Dimensions of `source` (including padding). */
  sourceDims: readonly [number, number, number];
  /** Voxels of padding each side of `source` (cubic `nearest` only; else 0). */
  pad: number;
  /** Row-major 4x4: output voxel index -> source voxel index (unpadded). */
  srcFromOut: Affine;
  /**
   * Added to the mapped position of each output voxel, in source voxel units, three per output
   * voxel (x, y, z interleaved), e.g. a displacement field. __Default value:__ none
   */
  displacementVox?: Float32Array | null;
  /** Output dimensions. */
  outDims: readonly [number, number, number];
  kernel: InterpolationKernel;
  mode: BoundaryMode;
  /** Value written for positions outside the grid in `constant` mode. */
  cval: number;
}

// per-axis taps: source offsets (index times stride) and weights, reused across calls
const offX = new Int32Array(8), offY = new Int32Array(8), offZ = new Int32Array(8);
const wX = new Float64Array(8), wY = new Float64Array(8), wZ = new Float64Array(8);

/**
 * Taps of one axis at position x: fills offsets (index times stride) and weights.
 * @returns false when the position is outside the line in `constant` mode
 */
function axisTaps(x: number, n: number, stride: number, kernel: InterpolationKernel, mode: BoundaryMode, off: Int32Array, w: Float64Array): boolean {
  const f = foldCoordinate(x, n, mode);
  if (f !== f) return false;
  switch (kernel) {
    case 'nearest': {
      off[0] = extendIndex(Math.floor(f + 0.5), n, mode) * stride;
      w[0] = 1;
      return true;
    }
    case 'linear': {
      const i0 = Math.floor(f), t = f - i0;
      off[0] = extendIndex(i0, n, mode) * stride;
      off[1] = extendIndex(i0 + 1, n, mode) * stride;
      w[0] = 1 - t; w[1] = t;
      return true;
    }
    case 'cubic': {
      const i0 = Math.floor(f), t = f - i0, u = 1 - t, t2 = t * t, t3 = t2 * t;
      if (i0 >= 1 && i0 + 2 < n) {
        const o = (i0 - 1) * stride;
        off[0] = o; off[1] = o + stride; off[2] = o + 2 * stride; off[3] = o + 3 * stride;
      } else {
        for (let m = 0; m < 4; m++) off[m] = extendIndex(i0 - 1 + m, n, mode) * stride;
      }
      w[0] = (u * u * u) / 6;
      w[1] = (4 - 6 * t2 + 3 * t3) / 6;
      w[2] = (1 + 3 * t + 3 * t2 - 3 * t3) / 6;
      w[3] = t3 / 6;
      return true;
    }
    case 'lanczos3': {
      const i0 = Math.floor(f), start = i0 - LANCZOS_RADIUS + 1;
      let sum = 0;
      for (let m = 0; m < 2 * LANCZOS_RADIUS; m++) {
        off[m] = extendIndex(start + m, n, mode) * stride;
        sum += (w[m] = lanczosWeight(f - (start + m), LANCZOS_RADIUS));
      }
      for (let m = 0; m < 2 * LANCZOS_RADIUS; m++) w[m] /= sum;
      return true;
    }
  }
}

/**
 * Resample a 3D image: output voxel (i, j, k) takes the kernel's value of the source at
 * srcFromOut [i, j, k, 1] (plus its displacement). Positions and taps follow scipy.ndimage 1.10
 * (map_coordinates): the position is folded by the boundary mode, the nearest kernel rounds half up,
 * taps outside the grid read the mode's extension, and `constant` writes cval for a position outside
 * [0, n-1] on any axis. Float64 sums, Float32 out.
 * @param input - source (values or cubic coefficients), maps, kernel, mode, cval
 * @param out - where to write, length of outDims' product
 * @returns `out`
 * @example resampleVoxels({ source: img, sourceDims: [64, 64, 36], pad: 0, srcFromOut, outDims: [64, 64, 36], kernel: 'linear', mode: 'constant', cval: 0 }, out)
 */
export function resampleVoxels(input: ResampleVoxelsInput, out: Float32Array): Float32Array {
  const { source, sourceDims, pad, srcFromOut: m, outDims, kernel, mode, cval } = input;
  const disp = input.displacementVox ?? null;
  const [nx, ny, nz] = sourceDims;
  const sxy = nx * ny;
  const taps = kernelTaps(kernel);
  const [ox, oy, oz] = outDims;
  let p = 0;
  for (let k = 0; k < oz; k++) {
    for (let j = 0; j < oy; j++) {
      // position of (0, j, k) in padded source voxels; stepping i adds the first column
      let x = m[1] * j + m[2] * k + m[3] + pad;
      let y = m[5] * j + m[6] * k + m[7] + pad;
      let z = m[9] * j + m[10] * k + m[11] + pad;
      for (let i = 0; i < ox; i++, p++, x += m[0], y += m[4], z += m[8]) {
        let px = x, py = y, pz = z;
        if (disp !== null) { px += disp[3 * p]; py += disp[3 * p + 1]; pz += disp[3 * p + 2]; }
        if (!axisTaps(px, nx, 1, kernel, mode, offX, wX) || !axisTaps(py, ny, nx, kernel, mode, offY, wY) || !axisTaps(pz, nz, sxy, kernel, mode, offZ, wZ)) {
          out[p] = cval;
          continue;
        }
        let s = 0;
        for (let c = 0; c < taps; c++) {
          const oz2 = offZ[c], wz = wZ[c];
          for (let b = 0; b < taps; b++) {
            const o = oz2 + offY[b], wzy = wz * wY[b];
            let r = 0;
            for (let a = 0; a < taps; a++) r += wX[a] * source[o + offX[a]];
            s += wzy * r;
          }
        }
        out[p] = s;
      }
    }
  }
  return out;
}
