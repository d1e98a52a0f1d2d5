// Small white-noise runs for the study tests (not a test file itself).
import { diagonalAffine } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';

/**
 * A run of spatially and temporally white Gaussian noise, 1000 + sd x N(0, 1) per voxel and volume,
 * with an ellipsoidal brain mask well inside the grid (the matched-filter checks' setting).
 */
export function whiteNoiseRun(options: { dims?: [number, number, number]; nt?: number; spacingMm?: number; sd?: number; seed?: number } = {}): { volume: Volume; mask: Uint8Array } {
  const dims = options.dims ?? [20, 20, 14];
  const nt = options.nt ?? 60;
  const s = options.spacingMm ?? 3;
  const spacing: [number, number, number] = [s, s, s];
  const n = dims[0] * dims[1] * dims[2];
  const data = new Float32Array(n * nt);
  createRng(options.seed ?? 5).fillNormal(data, 1000, options.sd ?? 10);
  const mask = new Uint8Array(n);
  const [cx, cy, cz] = dims.map((d) => (d - 1) / 2);
  for (let k = 0; k < dims[2]; k++) for (let j = 0; j < dims[1]; j++) for (let i = 0; i < dims[0]; i++) {
    const r2 = ((i - cx) / (0.45 * dims[0])) ** 2 + ((j - cy) / (0.45 * dims[1])) ** 2 + ((k - cz) / (0.45 * dims[2])) ** 2;
    if (r2 <= 1) mask[i + dims[0] * (j + dims[1] * k)] = 1;
  }
  return { volume: makeVolume({ dims: [...dims, nt], spacingMm: spacing, trSec: 2, affine: diagonalAffine(spacing), data }), mask };
}
