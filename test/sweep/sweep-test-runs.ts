// Small runs for the sweep tests (not a test file itself).
import { createRng } from '../../src/core/random.js';
import { diagonalAffine } from '../../src/core/affine.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { resolvePhantomSpec, simulatePhantomRun, TISSUE_LABEL } from '../../src/simulate/index.js';
import { smoothGaussianField } from '../../src/simulate/smooth-gaussian-field.js';
import type { BoldEvent, Sidecar } from '../../src/io/run-types.js';
import type { MotionRow } from '../../src/acquire/rigid-motion-affine.js';
import type { Vec3 } from '../../src/core/affine.js';
import type { MotionSpec } from '../../src/simulate/simulated-motion-table.js';

/** A small phantom run (5 mm voxels, 80 volumes, no built-in activation) and its grey matter. */
export function smallPhantom(nVolumes = 80): { volume: Volume; events: BoldEvent[]; sidecar: Sidecar | null; greyMatter: Uint8Array } {
  const r = simulatePhantomRun(resolvePhantomSpec({ nVolumes, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 3, anatomy: { supersample: 1 } }));
  const gm = new Uint8Array(r.truth.tissueLabels.data.length);
  r.truth.tissueLabels.data.forEach((l, i) => { gm[i] = l === TISSUE_LABEL['grey-matter'] ? 1 : 0; });
  return { volume: r.volume, events: r.events, sidecar: r.sidecar, greyMatter: gm };
}

/**
 * The small phantom with its head moving as `motion` says (its slow wander, then a jerk), with the
 * motion table and rotation centre the simulation used (so planting can follow the same poses), its
 * grey matter and its brain (grey + white matter + CSF), both in the head's reference position.
 */
export function movingPhantom(motion: MotionSpec, nVolumes = 80): ReturnType<typeof smallPhantom> & { brain: Uint8Array; motionTable: MotionRow[]; rotationCentreMm: Vec3 } {
  const r = simulatePhantomRun(resolvePhantomSpec({ nVolumes, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 3, anatomy: { supersample: 1 }, motion }));
  const labels = r.truth.tissueLabels.data;
  const gm = Uint8Array.from(labels, (l) => (l === TISSUE_LABEL['grey-matter'] ? 1 : 0));
  const brain = Uint8Array.from(labels, (l) => (l === TISSUE_LABEL['grey-matter'] || l === TISSUE_LABEL['white-matter'] || l === TISSUE_LABEL.csf ? 1 : 0));
  return { volume: r.volume, events: r.events, sidecar: r.sidecar, greyMatter: gm, brain, motionTable: r.truth.motionTable, rotationCentreMm: r.truth.rotationCentreMm };
}

/**
 * A null run that meets the model's assumptions: every volume is 1000 + 10 x a stationary smooth
 * Gaussian field (FWHM `fwhmMm`, independent across volumes, so white in time), and an ellipsoidal
 * "brain" mask well inside the grid.
 */
export function gaussianNullRun(options: { dims?: [number, number, number]; nt?: number; fwhmMm?: number; seed?: number } = {}): { volume: Volume; mask: Uint8Array } {
  const dims = options.dims ?? [32, 32, 24];
  const nt = options.nt ?? 100;
  const spacing: [number, number, number] = [3, 3, 3];
  const n = dims[0] * dims[1] * dims[2];
  const data = new Float32Array(n * nt);
  const rng = createRng(options.seed ?? 17);
  const field = new Float32Array(n);
  for (let t = 0; t < nt; t++) {
    smoothGaussianField(dims, spacing, options.fwhmMm ?? 6, rng, field);
    for (let v = 0; v < n; v++) data[t * n + v] = 1000 + 10 * field[v];
  }
  const mask = new Uint8Array(n);
  const [cx, cy, cz] = dims.map((d) => (d - 1) / 2);
  for (let k = 0; k < dims[2]; k++) for (let j = 0; j < dims[1]; j++) for (let i = 0; i < dims[0]; i++) {
    const r2 = ((i - cx) / (0.42 * dims[0])) ** 2 + ((j - cy) / (0.42 * dims[1])) ** 2 + ((k - cz) / (0.42 * dims[2])) ** 2;
    if (r2 <= 1) mask[i + dims[0] * (j + dims[1] * k)] = 1;
  }
  return { volume: makeVolume({ dims: [...dims, nt], spacingMm: spacing, trSec: 2, affine: diagonalAffine(spacing), data }), mask };
}
