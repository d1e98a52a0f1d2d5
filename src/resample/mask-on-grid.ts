import { composeAffine, invertAffine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';
import { trilinearResample } from './trilinear-resample.js';

/**
 * Carry a 0/1 mask from one grid onto another in the same world space: the mask is interpolated
 * trilinearly at each target voxel centre and kept where the value is at least 0.5 (a target voxel
 * is in when it is mostly made of voxels that were in). Outside the source grid is out. On the same
 * grid the mask comes back unchanged (as a copy).
 * @param mask - one byte per source voxel (nonzero = in), NIfTI order
 * @param from - the mask's grid
 * @param to - the target grid
 * @returns one byte per target voxel (1 = in)
 * @throws BoldsweepError GRID_MISMATCH when the mask's length does not match `from`
 * @example const brainOnTarget = maskOnGrid(brainMask, { dims: [64, 64, 36], affine: run.affine }, frame.grid)
 */
export function maskOnGrid(mask: ArrayLike<number>, from: Grid, to: Grid): Uint8Array {
  const n = from.dims[0] * from.dims[1] * from.dims[2];
  if (mask.length !== n) fail('GRID_MISMATCH', `mask has ${mask.length} voxels, its grid [${from.dims.join('x')}] has ${n}`);
  const src = new Float32Array(n);
  for (let v = 0; v < n; v++) src[v] = mask[v] ? 1 : 0;
  const srcFromOut = composeAffine(invertAffine(from.affine), to.affine);
  const values = trilinearResample(src, from.dims, srcFromOut, to.dims, undefined, { mode: 'constant', cval: 0 });
  const out = new Uint8Array(values.length);
  // 0.5 - 1e-6: a voxel exactly half in stays in despite float32 rounding of the weights
  for (let v = 0; v < values.length; v++) out[v] = values[v] >= 0.5 - 1e-6 ? 1 : 0;
  return out;
}
