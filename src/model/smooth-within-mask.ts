import { fail } from '../core/fail.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { smoothVolume3d } from '../filter/gaussian-smooth.js';

/** Options for {@link smoothWithinMask}. */
export interface SmoothWithinMaskOptions {
  /**
   * Boundary mode (scipy.ndimage names) where the mask touches the edge of the grid; elsewhere the
   * mask edge, not the grid edge, bounds the kernel. __Default value:__ `'reflect'`
   */
  mode?: BoundaryMode;
  /** Where to write the result (may be `values` itself). __Default value:__ a new array. */
  out?: Float32Array;
}

/**
 * Smooth a map known only at some voxels of a grid (one value per voxel in `voxels`, as a GLM fit
 * stores its maps) with a Gaussian kernel, by normalised convolution inside those voxels:
 * out = smooth(map * mask) / smooth(mask). Voxels outside the set neither contribute nor dilute, so
 * the map near the mask edge is an average of mask voxels only and a constant map stays constant.
 * The Gaussian smoothing of the steps module does the work (same kernel, truncation at 4 sigma and
 * Float64 arithmetic; the result is rounded once to Float32).
 * @param values - one value per voxel of `voxels` (finite); not modified unless passed as `out`
 * @param voxels - ascending voxel indices within one volume of the grid (NIfTI order, x fastest)
 * @param dims - voxels along x, y, z
 * @param spacingMm - voxel size in mm along x, y, z
 * @param fwhmMm - kernel FWHM in mm (0 = a plain copy)
 * @param options - boundary mode, out
 * @returns the smoothed values, one per voxel of `voxels` (options.out when given)
 * @throws BoldsweepError INVALID_ARGUMENT for mismatched lengths, unordered or out-of-grid voxels,
 *   non-finite values, or a bad width, spacing or mode
 * @example const smoothed = smoothWithinMask(fit.rho!, fit.voxels, [64, 64, 36], [3, 3, 3], 15)
 */
export function smoothWithinMask(
  values: ArrayLike<number>,
  voxels: Int32Array,
  dims: readonly [number, number, number],
  spacingMm: readonly [number, number, number],
  fwhmMm: number,
  options: SmoothWithinMaskOptions = {},
): Float32Array {
  const m = voxels.length;
  if (values.length !== m) fail('INVALID_ARGUMENT', `values has ${values.length} entries but voxels has ${m}; give one value per voxel`);
  const out = options.out ?? new Float32Array(m);
  if (out.length !== m) fail('INVALID_ARGUMENT', `out has ${out.length} entries, need ${m}`);
  if (!(fwhmMm >= 0) || !Number.isFinite(fwhmMm)) fail('INVALID_ARGUMENT', `fwhmMm must be finite and >= 0, got ${fwhmMm}`);
  const n = dims[0] * dims[1] * dims[2];
  for (let i = 0; i < m; i++) {
    const v = voxels[i];
    if (!(v >= 0 && v < n) || (i > 0 && v <= voxels[i - 1])) fail('INVALID_ARGUMENT', `voxels must be ascending indices below ${n} (grid ${dims.join('x')}); entry ${i} is ${v}`);
    if (!Number.isFinite(values[i])) fail('INVALID_ARGUMENT', `values[${i}] is ${values[i]}; a non-finite value would spread to its neighbours`);
  }
  if (fwhmMm === 0) {
    for (let i = 0; i < m; i++) out[i] = values[i];
    return out;
  }
  const map = new Float32Array(n);
  const mask = new Uint8Array(n);
  for (let i = 0; i < m; i++) {
    map[voxels[i]] = values[i];
    mask[voxels[i]] = 1;
  }
  // the smoothing's own mask option is the normalised convolution; write the result in place
  smoothVolume3d(map, dims, spacingMm, fwhmMm, { mode: options.mode ?? 'reflect', mask, out: map });
  for (let i = 0; i < m; i++) out[i] = map[voxels[i]];
  return out;
}
