import { applyAffine, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';

/** Proton gyromagnetic ratio / 2 pi, Hz per tesla (42.577478 MHz/T, CODATA; from memory). */
export const PROTON_HZ_PER_TESLA = 42.577478e6;

/** An air-filled sphere in tissue and the main field it perturbs. */
export interface AirSphere {
  /** Centre in world mm. */
  centreMm: Vec3;
  /** Radius in mm. */
  radiusMm: number;
  /** Main field strength, tesla. __Default value:__ 3 */
  fieldStrengthT: number;
  /**
   * Susceptibility of the sphere minus that of its surroundings, ppm (SI). Air about +0.36 ppm,
   * tissue about -9.05 ppm, so about 9.4 for air in tissue (from memory; cf. Schenck JF (1996)
   * Med Phys 23(6):815-850). __Default value:__ 9.4
   */
  susceptibilityDifferencePpm: number;
}

/**
 * Off-resonance field map (Hz) around an air-filled sphere with the main field along world z:
 * outside, dB/B0 = (dchi/3) (a/r)^3 (3 cos^2(theta) - 1), theta the angle from z; inside, 0 (the
 * uniform internal field after the Lorentz-sphere correction). A standard magnetostatics result
 * (from memory; e.g. Schenck 1996). Above and below the sphere the field rises, beside it it falls.
 * @param dims - [nx, ny, nz] of the grid
 * @param affine - voxel -> world mm of the grid
 * @param sphere - position, size, field strength and susceptibility difference
 * @returns field offset at each voxel centre, Hz, NIfTI order
 * @example sphereFieldMapHz([44,52,34], affine, { centreMm: [0, 50, -44], radiusMm: 7, fieldStrengthT: 3, susceptibilityDifferencePpm: 9.4 })
 */
export function sphereFieldMapHz(dims: readonly [number, number, number], affine: Affine, sphere: AirSphere): Float32Array {
  if (!(sphere.radiusMm > 0) || !(sphere.fieldStrengthT > 0) || !Number.isFinite(sphere.susceptibilityDifferencePpm)) {
    fail('INVALID_ARGUMENT', `air sphere needs radiusMm > 0, fieldStrengthT > 0 and a finite susceptibilityDifferencePpm, got ${sphere.radiusMm}, ${sphere.fieldStrengthT}, ${sphere.susceptibilityDifferencePpm}`);
  }
  const [nx, ny, nz] = dims;
  const out = new Float32Array(nx * ny * nz);
  const hzPerPpm = sphere.fieldStrengthT * PROTON_HZ_PER_TESLA * 1e-6;
  const scale = (sphere.susceptibilityDifferencePpm / 3) * hzPerPpm;
  const a3 = sphere.radiusMm ** 3;
  const [cx, cy, cz] = sphere.centreMm;
  let p = 0;
  for (let k = 0; k < nz; k++) {
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++, p++) {
        const [x, y, z] = applyAffine(affine, [i, j, k]);
        const dx = x - cx, dy = y - cy, dz = z - cz;
        const r2 = dx * dx + dy * dy + dz * dz;
        const r = Math.sqrt(r2);
        if (r <= sphere.radiusMm) continue;
        const cos2 = (dz * dz) / r2;
        out[p] = scale * (a3 / (r2 * r)) * (3 * cos2 - 1);
      }
    }
  }
  return out;
}
