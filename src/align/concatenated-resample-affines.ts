import { composeAffine, invertAffine, type Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';

/**
 * The affines that resample a run ONCE from its raw grid to a final grid: for volume t, final
 * world -> volume t's raw world = volumeFromReference[t] . inverse(finalFromReference). Composing
 * the maps first (instead of resampling at every stage) interpolates each voxel once.
 * @param finalFromReference - reference-frame world -> final world (e.g. templateFromStructural . structuralFromReference)
 * @param volumeFromReference - each volume's pose (reference world -> the volume's world), or null when the head is taken as still
 * @param nVolumes - volumes of the run (the length of the result)
 * @returns one target world -> source world affine per volume (resampleRun's `perVolume`)
 * @throws BoldsweepError INVALID_ARGUMENT when the poses do not match the run's length
 * @example const perVolume = concatenatedResampleAffines(templateFromReference, poses, run.dims[3])
 */
export function concatenatedResampleAffines(finalFromReference: Affine, volumeFromReference: readonly ArrayLike<number>[] | null, nVolumes: number): Affine[] {
  const referenceFromFinal = invertAffine(finalFromReference);
  if (!volumeFromReference) return Array.from({ length: nVolumes }, () => new Float64Array(referenceFromFinal));
  if (volumeFromReference.length !== nVolumes) fail('INVALID_ARGUMENT', `${volumeFromReference.length} volume poses for a run of ${nVolumes} volumes`);
  return volumeFromReference.map((pose) => composeAffine(Float64Array.from(pose), referenceFromFinal));
}
