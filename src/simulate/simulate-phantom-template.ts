import { composeAffine, invertAffine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { makeVolume, type Volume } from '../core/volume.js';
import { smoothVolume3d } from '../filter/gaussian-smooth.js';
import { headAnatomy } from './head-anatomy.js';
import { phantomAnatomyGrids } from './phantom-anatomy-grids.js';
import { resolvePhantomSpec, type PhantomSpecInput } from './phantom-spec.js';
import { phantomT1wSignal } from './phantom-t1w-signal.js';
import { PHANTOM_TISSUES } from './tissue-properties.js';

/**
 * boldsweep's own template image: the phantom head carried into template space by the known affine
 * `spec.template.fromReferenceRows` (reference-frame world -> template world), drawn on the template
 * grid with the structural image's T1-weighted contrast (the structural sequence, or the default
 * one when the spec has no structural part), without noise or non-uniformity, then smoothed with a
 * Gaussian of `smoothingFwhmMm` (what averaging many aligned heads does to the fine folds).
 * Deterministic: no random stream.
 * @param input - a phantom spec with a `template` part
 * @returns a 3D float32 volume on the template grid (template world mm)
 * @throws BoldsweepError INVALID_ARGUMENT when the spec has no template part
 * @example const template = simulatePhantomTemplate(demoPhantomSpec())
 */
export function simulatePhantomTemplate(input: PhantomSpecInput): Volume {
  const spec = resolvePhantomSpec(input);
  const tp = spec.template;
  if (!tp) fail('INVALID_ARGUMENT', 'the phantom spec has no template part (set spec.template, e.g. defaultPhantomTemplate())');
  const grids = phantomAnatomyGrids(spec);
  const grid = grids.template!;
  // template voxel -> template world -> the head's reference-frame position
  const headFromVoxel = composeAffine(invertAffine(grids.templateFromReference!), grid.affine);
  const anatomy = headAnatomy(grid.dims, headFromVoxel, spec.anatomy.geometry, tp.supersample);
  const sequence = spec.structural?.sequence ?? { trSec: 0.02, teSec: 0.004, flipAngleDeg: 25 };
  const signal = phantomT1wSignal(spec.tissues, sequence, tp.whiteMatterSignal);
  const [nx, ny, nz] = grid.dims;
  const n = nx * ny * nz;
  const data = new Float32Array(n);
  for (let p = 0; p < n; p++) {
    let s = 0;
    for (const t of PHANTOM_TISSUES) s += anatomy.fractions[t][p] * signal[t];
    data[p] = s;
  }
  const h = tp.spacingMm;
  const smoothed = tp.smoothingFwhmMm > 0 ? smoothVolume3d(data, [nx, ny, nz], [h, h, h], tp.smoothingFwhmMm, { mode: 'constant' }) : data;
  return makeVolume({ dims: [nx, ny, nz, 1], spacingMm: [h, h, h], trSec: 0, affine: new Float64Array(grid.affine), data: smoothed });
}
