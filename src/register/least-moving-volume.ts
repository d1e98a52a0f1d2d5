import { fail } from '../core/fail.js';

/**
 * The volume whose pose is closest, summed over all other volumes, to every other pose: the one
 * minimising sum over s of D(t, s), D = sum of |shift differences| (mm) + 50 mm x sum of |rotation
 * differences| (radians), the displacement measure of framewise displacement (Power et al. 2012,
 * NeuroImage 59:2142-2154 [memory]) taken between any two volumes rather than neighbours. Scales
 * and shears of an affine table are left out (they are not head movement). Ties go to the earlier volume.
 * @param parameters - 6 or 12 parameters per volume, concatenated (shifts mm, rotations degrees first)
 * @param perVolume - 6 or 12
 * @returns the 0-based index of the least-moving volume
 * @throws BoldsweepError INVALID_ARGUMENT for a length that is not a multiple of perVolume, or no volume
 * @example leastMovingVolume(Float64Array.from([0,0,0,0,0,0, 1,0,0,0,0,0, 2,0,0,0,0,0]), 6) // 1
 */
export function leastMovingVolume(parameters: Float64Array, perVolume: number): number {
  const nt = parameters.length / perVolume;
  if (!Number.isInteger(nt) || nt < 1) fail('INVALID_ARGUMENT', `${parameters.length} parameters are not a whole number of volumes of ${perVolume}`);
  const rad = (50 * Math.PI) / 180;
  let best = 0, bestSum = Infinity;
  for (let t = 0; t < nt; t++) {
    let sum = 0;
    for (let s = 0; s < nt; s++) {
      for (let k = 0; k < 6; k++) {
        const d = Math.abs(parameters[t * perVolume + k] - parameters[s * perVolume + k]);
        sum += k < 3 ? d : d * rad;
      }
    }
    if (sum < bestSum) { bestSum = sum; best = t; }
  }
  return best;
}
