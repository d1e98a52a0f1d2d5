/**
 * The words of the look: advice per finding kind and the one-line verdicts. Kept in one file so the
 * notebook, the CLI and findings.json say the same thing.
 */
import type { FindingKind } from './finding-types.js';

/** Standing advice per finding kind. */
export const FINDING_ADVICE: Record<FindingKind, string> = {
  'non-steady-start': 'Drop these volumes before any other step (they also bias motion correction and the tSNR maps).',
  'volume-jump': 'Censor these volumes in the model (one regressor per volume, or remove them); check the motion table for a jerk at these times.',
  'global-signal': 'Censor these volumes, or check for a scanner or reconstruction problem at these times.',
  'slice-dropout': 'Censor the volume (the slice lost signal: reconstruction or shim failure); if the same slice drops repeatedly, report it to the scanner operators.',
  'slice-bright': 'Censor the volume (a bright slice suggests a spike artefact in k-space).',
  'voxel-spike': 'A single-voxel spike barely moves a model fit; leave it, or despike. Censor the volume only when many voxels spike together.',
  'unstable-voxel': 'One voxel departs from its own time course at several volumes (often a vessel, or a voxel at the edge of the brain or of a signal void); its own series is unreliable, the rest of the run is not. Leave it out of region-of-interest averages or despike it; do not censor volumes for it.',
  'empty-slices': 'Check the acquisition: slices that hold only zeros were not recorded or were padded in conversion; if the field of view should cover them, the run is incomplete there. They are left out of every measure.',
  'head-motion': 'Model the motion and censor these volumes: in a sweep, model.censorFdMm (the threshold in mm) gives each volume above it its own regressor, and model.motionRegressors (6, 12 or 24) adds the motion table to the model; sweep both to see which detects best on this run. Check the motion table for a jerk at these times.',
  'non-finite': 'These voxels are excluded from every measure; mask or repair them before preprocessing (boldsweep does not guess values).',
};

/**
 * "volume 57", "volumes 80-81", "volumes 3, 9 and 40".
 * @param volumes - 0-based indices, sorted
 * @returns text
 * @example describeVolumes([80, 81]) // 'volumes 80-81'
 */
export function describeVolumes(volumes: readonly number[], noun = 'volume'): string {
  if (volumes.length === 1) return `${noun} ${volumes[0]}`;
  const contiguous = volumes.every((v, i) => i === 0 || v === volumes[i - 1] + 1);
  if (contiguous) return `${noun}s ${volumes[0]}-${volumes[volumes.length - 1]}`;
  if (volumes.length <= 6) return `${noun}s ${volumes.slice(0, -1).join(', ')} and ${volumes[volumes.length - 1]}`;
  return `${volumes.length} ${noun}s (${volumes.slice(0, 5).join(', ')}, ...)`;
}

/** Signed number with a fixed count of decimals: +3.2, -0.5. */
export function signed(x: number, digits = 1): string {
  return `${x >= 0 ? '+' : ''}${x.toFixed(digits)}`;
}
