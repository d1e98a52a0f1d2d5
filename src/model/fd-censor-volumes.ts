import { fail } from '../core/fail.js';

/**
 * Volumes to censor by framewise displacement: those whose FD is above `thresholdMm` (strictly), i.e.
 * the volume acquired after a movement larger than the threshold. Only that volume is censored, not
 * its neighbours (Power et al. 2012 flagged volumes by FD; extending the censoring to neighbouring
 * volumes is a separate choice not made here).
 * @param fdMm - framewise displacement per volume, mm (framewiseDisplacement)
 * @param thresholdMm - e.g. 0.5 (FD_CENSOR_THRESHOLD_MM)
 * @returns 0-based volume indices, ascending
 * @throws BoldsweepError INVALID_ARGUMENT for a threshold that is not a positive number
 * @example fdCensorVolumes(framewiseDisplacement(table), 0.5) // [41, 97]
 */
export function fdCensorVolumes(fdMm: ArrayLike<number>, thresholdMm: number): number[] {
  if (!(thresholdMm > 0) || !Number.isFinite(thresholdMm)) fail('INVALID_ARGUMENT', `the FD censoring threshold must be a positive number of mm, got ${thresholdMm}`);
  const out: number[] = [];
  for (let t = 0; t < fdMm.length; t++) if (fdMm[t] > thresholdMm) out.push(t);
  return out;
}
