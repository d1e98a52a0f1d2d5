import { fail } from '../core/fail.js';

/**
 * Geometric EPI distortion of some lines of an image along one axis (the kernel of
 * {@link distortAlongAxis}, which runs it on every line): on each listed line the signal of each
 * position y is moved to y + shift(y). Each voxel is split into `subsamples` pieces (linear
 * interpolation of the image and the shift along the line), and each piece is deposited into the two
 * nearest output voxels by linear weights. This keeps the total signal and its first moment along
 * the line, so a uniform shift moves a line's centre of mass by exactly that shift, and a varying
 * shift piles signal up where it converges and thins it where it spreads, as in a real EPI image.
 * Signal pushed past either end of the line is lost. Only the listed lines of `out` are written.
 * @param image - one 3D image, NIfTI order
 * @param shiftVoxels - shift at each voxel, in voxels along `axis` (read on the listed lines only)
 * @param dims - [nx, ny, nz]
 * @param axis - 0, 1 or 2 (i, j, k)
 * @param lineStarts - index of the first voxel (position 0 along `axis`) of each line to distort
 * @param out - where to write (length nx*ny*nz, not aliasing `image`)
 * @param subsamples - pieces per voxel, even. __Default value:__ 8
 * @returns `out`
 * @throws BoldsweepError INVALID_ARGUMENT for mismatched lengths, a bad axis or subsample count
 * @example distortLines(weights, shifts, [64, 64, 36], 1, Int32Array.of(5 + 64 * 64 * 10), out)
 */
export function distortLines(
  image: ArrayLike<number>,
  shiftVoxels: ArrayLike<number>,
  dims: readonly [number, number, number],
  axis: 0 | 1 | 2,
  lineStarts: ArrayLike<number>,
  out: Float32Array,
  subsamples = 8,
): Float32Array {
  const n = dims[0] * dims[1] * dims[2];
  if (image.length !== n || shiftVoxels.length !== n) fail('INVALID_ARGUMENT', `image (${image.length}) and shiftVoxels (${shiftVoxels.length}) must both have ${n} values`);
  if (axis !== 0 && axis !== 1 && axis !== 2) fail('INVALID_ARGUMENT', `axis must be 0, 1 or 2, got ${String(axis)}`);
  // an even count puts a piece boundary on every voxel centre, where the linear interpolant has its
  // kinks; this is what makes the first moment exact
  if (!Number.isInteger(subsamples) || subsamples < 2 || subsamples % 2 !== 0) fail('INVALID_ARGUMENT', `subsamples must be an even integer >= 2, got ${subsamples}`);
  if (out.length !== n) fail('INVALID_ARGUMENT', `out length ${out.length} does not match dims`);
  const len = dims[axis];
  const stride = axis === 0 ? 1 : axis === 1 ? dims[0] : dims[0] * dims[1];
  const lineVals = new Float64Array(len);
  const lineShift = new Float64Array(len);
  const acc = new Float64Array(len);
  // sub-sample s of voxel t sits at y = t + off[s]; pieces left of the centre interpolate between
  // voxels t-1 and t, pieces right of it between t and t+1 (the image is zero beyond the line's
  // ends; the shift is held constant there)
  const off = Float64Array.from({ length: subsamples }, (_, s) => (s + 0.5) / subsamples - 0.5);
  const half = subsamples / 2;
  for (let li = 0; li < lineStarts.length; li++) {
    const base = lineStarts[li];
    let any = false;
    for (let t = 0; t < len; t++) {
      lineVals[t] = image[base + t * stride];
      lineShift[t] = shiftVoxels[base + t * stride];
      if (lineVals[t] !== 0) any = true;
    }
    if (!any) {
      for (let t = 0; t < len; t++) out[base + t * stride] = 0;
      continue;
    }
    acc.fill(0);
    for (let t = 0; t < len; t++) {
      const vPrev = t > 0 ? lineVals[t - 1] : 0, v0 = lineVals[t], vNext = t < len - 1 ? lineVals[t + 1] : 0;
      if (vPrev === 0 && v0 === 0 && vNext === 0) continue;
      const sPrev = lineShift[t > 0 ? t - 1 : 0], s0 = lineShift[t], sNext = lineShift[t < len - 1 ? t + 1 : t];
      for (let s = 0; s < subsamples; s++) {
        const o = off[s];
        // o < 0: between t-1 (weight -o) and t; o > 0: between t and t+1 (weight o)
        const v = (s < half ? v0 + o * (v0 - vPrev) : v0 + o * (vNext - v0)) / subsamples;
        if (v === 0) continue;
        const dest = t + o + (s < half ? s0 + o * (s0 - sPrev) : s0 + o * (sNext - s0));
        const d0 = Math.floor(dest);
        const f = dest - d0;
        if (d0 >= 0 && d0 < len) acc[d0] += v * (1 - f);
        if (d0 + 1 >= 0 && d0 + 1 < len) acc[d0 + 1] += v * f;
      }
    }
    for (let t = 0; t < len; t++) out[base + t * stride] = acc[t];
  }
  return out;
}
