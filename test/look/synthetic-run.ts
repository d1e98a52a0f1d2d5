// Test helper (not a test): a small ellipsoid "head" run with features planted where a test wants them.
import { diagonalAffine } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';

export interface SyntheticRunOptions {
  dims?: [number, number, number, number];
  seed?: number;
  /** Brain signal and background level. */
  brain?: number;
  background?: number;
  /** Thermal noise SD everywhere. */
  noiseSd?: number;
  /** Fractional excess of each leading volume (e.g. [0.22, 0.011]). */
  excess?: number[];
  /** Volumes whose whole image is shifted by `shift` voxels along x (a jerk). */
  jerk?: { volumes: number[]; shift: number };
  spikes?: Array<{ ijk: [number, number, number]; volume: number; size: number }>;
  dropouts?: Array<{ slice: number; volume: number; factor: number }>;
  trSec?: number;
}

/** Builds the run; the ellipsoid fills about half of each axis. */
export function syntheticRun(o: SyntheticRunOptions = {}): Volume {
  const [nx, ny, nz, nt] = o.dims ?? [24, 24, 14, 60];
  const rng = createRng(o.seed ?? 1);
  const brain = o.brain ?? 1000, background = o.background ?? 20, noiseSd = o.noiseSd ?? 10;
  const n = nx * ny * nz;
  const data = new Float32Array(n * nt);
  const cx = (nx - 1) / 2, cy = (ny - 1) / 2, cz = (nz - 1) / 2;
  const inside = (x: number, y: number, z: number) => ((x - cx) / (0.35 * nx)) ** 2 + ((y - cy) / (0.38 * ny)) ** 2 + ((z - cz) / (0.4 * nz)) ** 2 <= 1;
  const jerkSet = new Set(o.jerk?.volumes ?? []);
  for (let t = 0; t < nt; t++) {
    const gain = 1 + (o.excess?.[t] ?? 0);
    const shift = jerkSet.has(t) ? o.jerk!.shift : 0;
    for (let z = 0; z < nz; z++) for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) {
      const v = x + nx * (y + ny * z);
      const base = inside(x - shift, y, z) ? brain * (1 + 0.1 * Math.sin(x / 3 + y / 5)) : background;
      data[t * n + v] = base * gain + (noiseSd > 0 ? rng.normal(0, noiseSd) : 0);
    }
  }
  for (const s of o.spikes ?? []) data[s.volume * n + s.ijk[0] + nx * (s.ijk[1] + ny * s.ijk[2])] += s.size;
  for (const d of o.dropouts ?? []) for (let i = 0; i < nx * ny; i++) data[d.volume * n + d.slice * nx * ny + i] *= d.factor;
  return makeVolume({ dims: [nx, ny, nz, nt], spacingMm: [3, 3, 3], trSec: o.trSec ?? 2, affine: diagonalAffine([3, 3, 3], [-36, -36, -21]), data });
}
