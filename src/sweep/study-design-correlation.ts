import { buildDesign } from '../model/design.js';
import { designPseudoInverse } from '../model/design-matrix.js';
import { shiftEvents } from '../steps/drop-initial-volumes.js';
import { randomBlockEvents } from './random-block-events.js';
import type { SweepSpec } from './spec.js';
import { specDropCount } from './spec-drop-count.js';

/** How alike the noise projections of subjects who share a run are (see {@link studyDesignCorrelation}). */
export interface StudyDesignCorrelation {
  /** Subject pairs that share a run (over the repeats measured). */
  pairs: number;
  /** Mean correlation over those pairs (signed: a positive mean would make their errors add up). */
  mean: number;
  /** Mean absolute correlation. */
  meanAbs: number;
  /** Largest absolute correlation. */
  maxAbs: number;
}

/**
 * The correlation of the noise projections of study subjects who share a run. Subject i's effect
 * estimate is c_i'y, with c_i the task row of its design's pseudo-inverse (its random block design,
 * the model's drift and intercept); on the same noise y with covariance sigma^2 I two subjects'
 * estimates correlate by c_i.c_j / (|c_i| |c_j|). Near 0, sharing a run leaves the subjects' errors
 * nearly independent, as the one-sample t-test assumes; serially correlated noise changes the value
 * somewhat (the AR(1) whitening is left out here).
 * @param spec - a spec with a study section (design, subjects, model drift, dropped volumes)
 * @param runCount - the study's runs (subjects s and s' share a run when s = s' mod runCount)
 * @param ntRun - volumes of the runs as opened
 * @param trSec - repetition time
 * @param designSeeds - per repeat, per subject: the seed of its design (as the sweep's tasks draw them)
 * @returns pairs, mean, mean absolute and largest absolute correlation (NaN with no pair)
 * @example studyDesignCorrelation(spec, 1, 200, 2, [[seed0, seed1, seed2]]).meanAbs // ~0.1
 */
export function studyDesignCorrelation(spec: SweepSpec, runCount: number, ntRun: number, trSec: number, designSeeds: readonly (readonly number[])[]): StudyDesignCorrelation {
  const drop = specDropCount(spec) ?? 0; // a varied drop: measured on the whole run
  const nt = ntRun - drop;
  const design = spec.study!.design;
  const rs: number[] = [];
  for (const seeds of designSeeds) {
    const rows = seeds.map((seed) => {
      const drawn = randomBlockEvents(seed, ntRun * trSec, { ...design, trialType: 'task' });
      const ev = drop > 0 ? shiftEvents(drawn, drop * trSec).events : drawn;
      const x = buildDesign(ev, { nt, trSec, drift: spec.model.highpassCutoffSec ? { kind: 'dct', cutoffSec: spec.model.highpassCutoffSec } : { kind: 'none' } });
      const j = x.columns.indexOf('task');
      return designPseudoInverse(x).pinv.subarray(j * nt, (j + 1) * nt);
    });
    for (let a = 0; a < rows.length; a++) {
      for (let b = a + runCount; b < rows.length; b += runCount) {
        let ab = 0, aa = 0, bb = 0;
        for (let t = 0; t < nt; t++) { ab += rows[a][t] * rows[b][t]; aa += rows[a][t] ** 2; bb += rows[b][t] ** 2; }
        rs.push(ab / Math.sqrt(aa * bb));
      }
    }
  }
  if (rs.length === 0) return { pairs: 0, mean: NaN, meanAbs: NaN, maxAbs: NaN };
  return {
    pairs: rs.length,
    mean: rs.reduce((s, r) => s + r, 0) / rs.length,
    meanAbs: rs.reduce((s, r) => s + Math.abs(r), 0) / rs.length,
    maxAbs: Math.max(...rs.map(Math.abs)),
  };
}
