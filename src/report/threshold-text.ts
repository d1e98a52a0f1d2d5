import { DEFAULT_NULL_DESIGNS } from '../sweep/spec.js';
import type { ThresholdRule } from '../sweep/spec.js';

/**
 * A threshold rule in a few words, for chart subtitles and the recommendation.
 * @param t - the rule
 * @returns e.g. "FWE p < 0.05 (random-field theory)"
 * @example thresholdText({ kind: 'fdr', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 }) // 'FDR q < 0.05 (Benjamini-Hochberg)'
 */
export function thresholdText(t: ThresholdRule): string {
  switch (t.kind) {
    case 'fwe-rft': return `FWE p < ${t.alpha} (random-field theory or Bonferroni, whichever is lower)`;
    case 'fwe-calibrated': return `FWE p < ${t.alpha} (calibrated on ${t.nullDesigns ?? DEFAULT_NULL_DESIGNS} null designs per setting)`;
    case 'fdr': return `FDR q < ${t.q} (Benjamini-Hochberg)`;
    case 'bonferroni': return `FWE p < ${t.alpha} (Bonferroni)`;
    case 'uncorrected': return `uncorrected p < ${t.alpha}`;
    case 'cluster': return `cluster-extent FWE p < ${t.alpha} (forming p < ${t.clusterFormingP})`;
  }
}
