import type { SweepSpec } from './spec.js';
import { specDropCount } from './spec-drop-count.js';

/** What a look recommends doing before a sweep (from look.recommendation or a look folder). */
export interface LookTreatment {
  /** Initial volumes to drop. */
  dropInitialVolumes: number;
  /** Volumes to censor, 0-based in the run as opened. */
  censorVolumes: number[];
}

/**
 * The findings of a look that a spec leaves untreated: bright first volumes it does not drop, abrupt
 * volume changes it neither censors nor drops. One sentence each, for a warning.
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
  return out;
}

