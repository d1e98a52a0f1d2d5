import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import type { BoldEvent } from '../io/run-types.js';
import { buildDesign } from '../model/design.js';
import { residualNorm } from '../model/residual-norm.js';
import { plantTimeCourse } from '../plant/plant-time-course.js';
import { shiftEvents } from '../steps/drop-initial-volumes.js';
import { motionNuisance } from './motion-nuisance.js';
import type { SweepSpec } from './spec.js';

/**
 * sqrt(p' M p) of the planted time course (peak 1) against the model's other regressors (drift, censored
 * volumes, the spec's own motion regressors and volumes censored by framewise displacement, intercept),
 * for the theory's expected statistic (predictDetection). Computed on the run's events (or the first
 * repeat's random design) after any volumes the recipe drops, with the model options fixed in the spec
 * (a varied model option is not in it); the AR(1) whitening is left out (it changes the norm little for
 * slow designs).
 * @param events - the task timing planted and modelled
 * @param ntRun - volumes of the run as opened
 * @param trSec - repetition time
 * @param spec - the sweep spec (recipe for dropped volumes, model options, trial type)
 * @param motionTable - the sweep's motion table (one row per volume of the run as opened), or null
 * @returns the norm, or null when the time course cannot be built (no or ambiguous condition)
 * @example plantDesignNorm(run.events, 200, 2, spec)
 */
export function plantDesignNorm(events: readonly BoldEvent[], ntRun: number, trSec: number, spec: SweepSpec, motionTable: readonly MotionRow[] | null = null): number | null {
  const drop = spec.recipe.filter((s) => s.step === 'drop-initial-volumes').reduce((a, s) => a + (typeof s.params.count === 'number' ? s.params.count : 0), 0);
  const nt = ntRun - drop;
  if (nt < 3) return null;
  const ev = drop > 0 ? shiftEvents(events, drop * trSec).events : [...events];
  const types = [...new Set(ev.map((e) => e.trialType))];
  const condition = spec.model.trialType ?? (types.length === 1 ? types[0] : null);
  if (condition === null || !types.includes(condition)) return null;
  try {
    const p = plantTimeCourse(ev, nt, trSec, { condition });
    const motion = motionTable ? motionNuisance(motionTable, nt, spec.model) : { censorVolumes: [], regressors: [] };
    const censored = [...new Set([...spec.model.censorVolumes, ...motion.censorVolumes])].map((c) => c - drop).filter((c) => c >= 0 && c < nt);
    const nuisance = [
      ...censored.map((c) => ({ name: `censor_${c}`, values: Float64Array.from({ length: nt }, (_, t) => (t === c ? 1 : 0)) })),
      ...motion.regressors,
    ];
    const design = buildDesign(ev, { nt, trSec, drift: spec.model.highpassCutoffSec ? { kind: 'dct', cutoffSec: spec.model.highpassCutoffSec } : { kind: 'none' }, nuisance });
    const others: Float64Array[] = [];
    design.columns.forEach((name, j) => {
      if (name === condition) return;
      others.push(Float64Array.from({ length: nt }, (_, t) => design.x[t * design.p + j]));
    });
    return residualNorm(p, others);
  } catch {
    return null;
  }
}
