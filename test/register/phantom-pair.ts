import { invertAffine, type Affine } from '../../src/core/affine.js';
import type { Grid } from '../../src/core/grid-frame.js';
import { createRng } from '../../src/core/random.js';
import { volumeAt, volumeLike, type Volume } from '../../src/core/volume.js';
import { smoothVolume3d } from '../../src/filter/gaussian-smooth.js';
import { resampleVolume } from '../../src/resample/resample-volume.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';

/**
 * One noise-free volume of the default digital phantom (44 x 52 x 34 voxels of 3.5 mm), without
 * physiology, drift, activation or motion, blurred by a Gaussian of FWHM `psfVoxels` voxels: the
 * phantom's tissue edges are sharper than any EPI image (whose point spread function, from k-space
 * truncation and T2* decay over the readout, is at least about a voxel wide: common practice, no source).
 */
export function phantomVolume(psfVoxels = 1): Volume {
  const run = simulatePhantomRun({ nVolumes: 1, thermalNoiseSd: 0, rician: false, smoothNoise: null, physio: null, drift: null, activation: null, motion: null, spikes: [], dropouts: [] });
  const v = run.volume;
  const data = psfVoxels > 0 ? smoothVolume3d(volumeAt(v, 0), [v.dims[0], v.dims[1], v.dims[2]], v.spacingMm, psfVoxels * Math.max(...v.spacingMm), { mode: 'nearest' }) : volumeAt(v, 0).slice();
  return volumeLike(v, 1, data);
}

/** Grid of a volume. */
export function gridOf(v: Volume): Grid {
  return { dims: [v.dims[0], v.dims[1], v.dims[2]], affine: v.affine };
}

/**
 * The volume seen after the head moved by `pose` (fixed world -> moving world): moving(pose x) =
 * fixed(x), made by cubic B-spline resampling (src/resample) with the edge voxels repeated, then
 * independent Gaussian noise of `noiseSd` added to each image (seeded), as two volumes of a run have.
 */
export function movedPair(fixed: Volume, pose: Affine, noiseSd: number, seed: number): { fixed: Float32Array; moving: Float32Array } {
  const moved = resampleVolume(fixed, { kernel: 'cubic', transform: invertAffine(pose), mode: 'nearest' });
  const rng = createRng(seed);
  return { fixed: fixed.data.map((v) => v + rng.normal(0, noiseSd)), moving: moved.data.map((v) => v + rng.normal(0, noiseSd)) };
}
