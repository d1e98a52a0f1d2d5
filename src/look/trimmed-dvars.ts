import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';

/**
 * DVARS of one volume with the `k` mask voxels that changed most left out: tells whether a high
 * DVARS comes from the whole image (motion, a jump) or from a handful of spiking voxels.
 * @param run - the run
 * @param mask - nonzero = in
 * @param t - volume (>= 1)
 * @param k - voxels to leave out
 * @returns DVARS over the rest (signal units) and the left-out voxel indices, largest change first
 * @throws BoldsweepError INVALID_ARGUMENT for t < 1 or a mask with no more than k voxels
 * @example trimmedDvars(run.volume, look.mask.mask, 37, 10).dvars
 */
export function trimmedDvars(run: Volume, mask: ArrayLike<number>, t: number, k: number): { dvars: number; left: number[] } {
  const n = voxelsPerVolume(run);
  if (!Number.isInteger(t) || t < 1 || t >= run.dims[3]) fail('INVALID_ARGUMENT', `volume ${t} has no previous volume in 1..${run.dims[3] - 1}`);
  const d2: number[] = [];
  const idx: number[] = [];
  for (let v = 0; v < n; v++) {
    if (!mask[v]) continue;
    const d = run.data[t * n + v] - run.data[(t - 1) * n + v];
    d2.push(d * d);
    idx.push(v);
  }
  if (d2.length <= k) fail('INVALID_ARGUMENT', `the mask has ${d2.length} voxels, not more than the ${k} to leave out`);
  const order = d2.map((_, i) => i).sort((a, b) => d2[b] - d2[a]);
  let sum = 0;
  for (let i = k; i < order.length; i++) sum += d2[order[i]];
  return { dvars: Math.sqrt(sum / (order.length - k)), left: order.slice(0, k).map((i) => idx[i]) };
}
