import type { SweepSpec } from './spec.js';
import { specDropCount } from './spec-drop-count.js';

/** What a look recommends doing before a sweep (from look.recommendation or a look folder). */
export interface LookTreatment {
  /** Initial volumes to drop. */
  dropInitialVolumes: number;
  /** Volumes to censor, 0-based in the run as opened. */
  censorVolumes: number[];
  /** Volumes whose framewise displacement is above `fdThresholdMm` (when the look had a motion table). */
  movedVolumes?: number[];
  /** The FD threshold of `movedVolumes`, mm. */
  fdThresholdMm?: number | null;
}

/**
 * The findings of a look that a spec leaves untreated: bright first volumes it does not drop, abrupt
 * volume changes it neither censors nor drops, volumes moved above the framewise-displacement threshold
 * when no setting censors by FD or models motion. One sentence each, for a warning.
 * @param spec - the sweep spec
 * @param look - the look's recommendation
 * @returns warnings (empty when the spec treats everything the look found)
 * @example untreatedFindings(spec, look.recommendation) // ['the look recommends dropping 3 ...']
 */
export function untreatedFindings(spec: SweepSpec, look: LookTreatment): string[] {
  const out: string[] = [];
  const drop = specDropCount(spec);
  if (drop !== null && drop < look.dropInitialVolumes) {
    out.push(`the first ${look.dropInitialVolumes} volume(s) are brighter than the rest (not yet at steady state) and the spec drops ${drop}`);
  }
  const dropped = drop ?? 0;
  const missed = look.censorVolumes.filter((v) => v >= dropped && !spec.model.censorVolumes.includes(v));
  if (missed.length) out.push(`volume(s) ${missed.join(', ')} change abruptly (e.g. head motion) and the spec does not censor them`);
  const moved = (look.movedVolumes ?? []).filter((v) => v > dropped && !spec.model.censorVolumes.includes(v));
  if (moved.length && !modelTreatsMotion(spec)) {
    out.push(`volume(s) ${moved.join(', ')} moved more than ${look.fdThresholdMm ?? 0.5} mm (framewise displacement) and the spec neither censors by it nor models motion (model.censorFdMm, model.motionRegressors)`);
  }
  return out;
}

/** Whether some setting of the spec censors by framewise displacement or has motion regressors. */
function modelTreatsMotion(spec: SweepSpec): boolean {
  const values = (key: 'motionRegressors' | 'censorFdMm') => [spec.model[key], ...(spec.vary[`model.${key}`] ?? [])];
  return values('motionRegressors').some((v) => typeof v === 'number' && v > 0) || values('censorFdMm').some((v) => typeof v === 'number');
}

