import { composeAffine, invertAffine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { childSeed, createRng } from '../core/random.js';
import { makeVolume, type Volume } from '../core/volume.js';
import { headAnatomy } from './head-anatomy.js';
import { phantomAnatomyGrids } from './phantom-anatomy-grids.js';
import { resolvePhantomSpec, type PhantomSpecInput } from './phantom-spec.js';
import { phantomT1wSignal } from './phantom-t1w-signal.js';
import { PHANTOM_TISSUES } from './tissue-properties.js';

/**
 * The phantom's structural image: the same head as the run (same geometry and tissues), in the
 * structural scan's pose (`spec.structural.pose`, relative to the run's reference position), on the
 * structural grid, with T1-weighted contrast (partial volumes x each tissue's spoiled-GRE steady
 * state), a linear intensity non-uniformity along z, and Rician thermal noise from its own seeded
 * stream `structural-noise` (so the run's streams are untouched). Eyes are not drawn (they need an
 * axis-aligned grid in the head frame, which a posed grid is not).
 * @param input - a phantom spec with a `structural` part
 * @returns a 3D float32 volume (signal units; pure white matter = whiteMatterSignal before bias and noise)
 * @throws BoldsweepError INVALID_ARGUMENT when the spec has no structural part or a bad field
 * @example const t1w = simulatePhantomStructural(demoPhantomSpec())
 */
export function simulatePhantomStructural(input: PhantomSpecInput): Volume {
  const spec = resolvePhantomSpec(input);
  const st = spec.structural;
  if (!st) fail('INVALID_ARGUMENT', 'the phantom spec has no structural part (set spec.structural, e.g. defaultPhantomStructural())');
  const grids = phantomAnatomyGrids(spec);
  const grid = grids.structural!;
  // structural voxel -> structural world -> the head's reference-frame position
  const headFromVoxel = composeAffine(invertAffine(grids.structuralFromReference!), grid.affine);
  const anatomy = headAnatomy(grid.dims, headFromVoxel, spec.anatomy.geometry, st.supersample);
  const signal = phantomT1wSignal(spec.tissues, st.sequence, st.whiteMatterSignal);
  const [nx, ny, nz] = grid.dims;
  const n = nx * ny * nz;
  const data = new Float32Array(n);
  const rng = createRng(childSeed(spec.seed, 'structural-noise'));
  const sd = st.thermalNoiseSd;
  let p = 0;
  for (let k = 0; k < nz; k++) {
    const gain = 1 + (st.biasPercent / 100) * (nz > 1 ? (2 * k) / (nz - 1) - 1 : 0);
    for (let q = 0; q < nx * ny; q++, p++) {
      let s = 0;
      for (const t of PHANTOM_TISSUES) s += anatomy.fractions[t][p] * signal[t];
      // two draws per voxel, always, so the stream does not depend on the image
      const re = s * gain + rng.normal(0, 1) * sd;
      const im = rng.normal(0, 1) * sd;
      data[p] = Math.sqrt(re * re + im * im);
    }
  }
  return makeVolume({ dims: [nx, ny, nz, 1], spacingMm: [...st.spacingMm], trSec: 0, affine: new Float64Array(grid.affine), data });
}
