import { fail } from '../core/fail.js';
import type { Rng } from '../core/random.js';

/**
 * A stationary, spatially smooth Gaussian random field with unit variance: white noise convolved
 * separably with a Gaussian of the given FWHM (sigma = FWHM / (2 sqrt(2 ln 2))) on a periodic
 * (wrap-around) grid, then divided by sqrt(prod over axes of sum w^2), the standard deviation that
 * convolution gives unit white noise. Periodic boundaries keep every voxel's variance identical.
 * @param dims - [nx, ny, nz]
 * @param spacingMm - voxel size, mm
 * @param fwhmMm - smoothness of the field, mm (the FWHM of the kernel applied to white noise)
 * @param rng - seeded random stream (consumed: one normal draw per voxel)
 * @param out - where to write (length nx*ny*nz); a new array when omitted
 * @returns `out`, the field
 * @example smoothGaussianField([44, 52, 34], [3.5, 3.5, 3.5], 12, createRng(3))
 */
export function smoothGaussianField(
  dims: readonly [number, number, number],
  spacingMm: readonly [number, number, number],
  fwhmMm: number,
  rng: Rng,
  out?: Float32Array,
): Float32Array {
  if (!(fwhmMm > 0)) fail('INVALID_ARGUMENT', `fwhmMm must be positive, got ${fwhmMm}`);
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  const field = out ?? new Float32Array(n);
  if (field.length !== n) fail('INVALID_ARGUMENT', `out length ${field.length} does not match dims [${dims.join(', ')}]`);
  const work = new Float64Array(n);
  for (let i = 0; i < n; i++) work[i] = rng.normal();
  let norm = 1;
  const strides = [1, nx, nx * ny];
  for (let axis = 0; axis < 3; axis++) {
    const len = dims[axis];
    const sigmaVox = fwhmMm / (2 * Math.sqrt(2 * Math.LN2)) / spacingMm[axis];
    // radius 4 sigma, but never longer than the axis (a kernel wider than the period would wrap onto itself)
    const radius = Math.min(Math.ceil(4 * sigmaVox), Math.floor((len - 1) / 2));
    const w = new Float64Array(2 * radius + 1);
    let sum = 0;
    for (let r = -radius; r <= radius; r++) sum += (w[r + radius] = Math.exp(-0.5 * (r / sigmaVox) ** 2));
    let sq = 0;
    for (let r = 0; r < w.length; r++) { w[r] /= sum; sq += w[r] * w[r]; }
    norm *= sq;
    const stride = strides[axis];
    // each line is copied with `radius` wrapped values on either side, then convolved without index arithmetic
    const ext = new Float64Array(len + 2 * radius);
    const nLines = n / len;
    for (let line = 0; line < nLines; line++) {
      // the first voxel of line number `line`: lines of axis 0 start every nx voxels; of axis 1, at
      // every (i, k); of axis 2, at every (i, j)
      const start = axis === 0 ? line * nx : axis === 1 ? (line % nx) + nx * ny * Math.floor(line / nx) : line;
      for (let t = 0; t < len; t++) ext[t + radius] = work[start + t * stride];
      for (let r = 0; r < radius; r++) {
        ext[r] = ext[len + r];
        ext[len + radius + r] = ext[radius + r];
      }
      for (let t = 0; t < len; t++) {
        let acc = 0;
        for (let r = 0; r < w.length; r++) acc += w[r] * ext[t + r];
        work[start + t * stride] = acc;
      }
    }
  }
  const scale = 1 / Math.sqrt(norm);
  for (let i = 0; i < n; i++) field[i] = work[i] * scale;
  return field;
}
