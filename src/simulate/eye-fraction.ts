import type { Affine } from '../core/affine.js';
import type { Ellipsoid } from './head-anatomy.js';
import type { PhantomEyes } from './phantom-spec.js';

/**
 * Fraction of each voxel inside the phantom's eyes: two globes and their optic nerves (rods from each
 * globe's centre towards the brain's centre, ending where they enter the brain envelope), by classifying
 * `supersample`^3 evenly spaced points per voxel as the head anatomy does.
 * @param dims - [nx, ny, nz]
 * @param affine - voxel -> world mm (axis-aligned: only the diagonal and offsets are used)
 * @param eyes - the eyes
 * @param brain - the brain envelope (the nerves point to its centre and stop at its surface)
 * @param supersample - points per voxel edge (default 3)
 * @returns fractions 0..1, NIfTI order
 * @example eyeFraction([44, 52, 34], affine, defaultPhantomEyes(), DEFAULT_HEAD_GEOMETRY.brain)
 */
export function eyeFraction(dims: readonly [number, number, number], affine: Affine, eyes: PhantomEyes, brain: Ellipsoid, supersample = 3): Float32Array {
  const [nx, ny, nz] = dims;
  const out = new Float32Array(nx * ny * nz);
  const nerveLen = 40;
  const rods = eyes.centresMm.map((c) => {
    const towardsMm = brain.centreMm;
    const d = [towardsMm[0] - c[0], towardsMm[1] - c[1], towardsMm[2] - c[2]];
    const l = Math.hypot(d[0], d[1], d[2]) || 1;
    return { c, u: [d[0] / l, d[1] / l, d[2] / l] };
  });
  const inside = (x: number, y: number, z: number): boolean => {
    for (const { c, u } of rods) {
      const dx = x - c[0], dy = y - c[1], dz = z - c[2];
      if (dx * dx + dy * dy + dz * dz <= eyes.radiusMm ** 2) return true;
      const along = dx * u[0] + dy * u[1] + dz * u[2];
      if (along < 0 || along > nerveLen) continue;
      const px = dx - along * u[0], py = dy - along * u[1], pz = dz - along * u[2];
      const inBrain = ((x - brain.centreMm[0]) / brain.semiAxesMm[0]) ** 2 + ((y - brain.centreMm[1]) / brain.semiAxesMm[1]) ** 2 + ((z - brain.centreMm[2]) / brain.semiAxesMm[2]) ** 2 <= 1;
      if (!inBrain && px * px + py * py + pz * pz <= eyes.nerveRadiusMm ** 2) return true;
    }
    return false;
  };
  const reach = eyes.radiusMm + nerveLen + 2 * Math.max(Math.abs(affine[0]), Math.abs(affine[5]), Math.abs(affine[10]));
  const s = supersample;
  for (let k = 0, p = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, p++) {
    const x0 = affine[3] + i * affine[0], y0 = affine[7] + j * affine[5], z0 = affine[11] + k * affine[10];
    if (!rods.some(({ c }) => Math.hypot(x0 - c[0], y0 - c[1], z0 - c[2]) <= reach)) continue;
    let hit = 0;
    for (let a = 0; a < s; a++) for (let b = 0; b < s; b++) for (let e = 0; e < s; e++) {
      const x = x0 + ((a + 0.5) / s - 0.5) * affine[0], y = y0 + ((b + 0.5) / s - 0.5) * affine[5], z = z0 + ((e + 0.5) / s - 0.5) * affine[10];
      if (inside(x, y, z)) hit++;
    }
    out[p] = hit / (s * s * s);
  }
  return out;
}
