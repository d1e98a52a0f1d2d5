import type { StudyOptima, OptimumEstimate } from '../decide/study-optima.js';
import type { StudyFacts } from '../sweep/runner.js';
import type { SweepSpec } from '../sweep/spec.js';
import { parameterName } from '../sweep/settings-grid.js';
import { METHOD_REFERENCES } from './methods-text.js';

/** Sources the study text cites besides the methods text's own. */
export const STUDY_REFERENCES = {
  summaryStatistics: 'Holmes AP, Friston KJ (1998) Generalisability, random effects and population inference. NeuroImage 7:S754',
  bootstrap: 'Efron B (1979) Bootstrap methods: another look at the jackknife. Ann Stat 7(1):1-26',
} as const;

/** What a report says about a study: which question it answers, the optima side by side, and a methods paragraph. */
export interface StudyText {
  /** One sentence that opens the recommendation: the question it answers. */
  question: string;
  /** Lines for the report's sweep section (the optima side by side, the design correlation). */
  lines: string[];
  /** The methods paragraph on the group level and the simulated subjects. */
  methods: string;
  references: string[];
}

const mm = (x: number) => (Number.isFinite(x) ? `${x.toFixed(1)} mm` : 'n/a');
const interval = (o: OptimumEstimate) => (Number.isFinite(o.low) ? ` (95 % interval ${o.low.toFixed(1)} to ${o.high.toFixed(1)} mm)` : '');

/**
 * The words of a study report: the question the recommendation answers (the group question at one
 * misregistration level), the single-run and group optima side by side with their bootstrap intervals
 * and how much wider the group's is at each level, the subjects' design correlation, and a methods
 * paragraph.
 * @param spec - the sweep spec (with its study section)
 * @param facts - the sweep's study facts
 * @param optima - studyOptima of the scorecard, or null when the width is not numeric
 * @param answerLevelMm - the misregistration level the recommendation was made at
 * @param centre - studyOptima on the statistic at the blob centres (a second view that does not
 *   depend on the threshold), or null
 * @returns question, lines, methods paragraph and references
 * @example const t = studyText(result.spec, result.study!, studyOptima(result.scorecard), 3)
 */
export function studyText(spec: SweepSpec, facts: StudyFacts, optima: StudyOptima | null, answerLevelMm: number, centre: StudyOptima | null = null): StudyText {
  const study = spec.study!;
  const width = optima ? parameterName(optima.key) : 'setting';
  const question = `This recommendation answers the group question: which ${width} makes a group map of ${study.subjects} subjects detect the planted activations best when subjects are misaligned by ${answerLevelMm} mm (SD per axis) after normalisation. The single-run question (which ${width} is best for one run) has its own answer below.`;
  const lines = [
    `Study: ${study.subjects} simulated subjects cycling through ${facts.runs} run${facts.runs === 1 ? '' : 's'}, each with its own random block design (${study.design.onSec} s blocks, rests ${study.design.offMinSec}-${study.design.offMaxSec} s), amplitude spread ${(study.amplitudeSpread * 100).toFixed(0)} % (SD), misregistration SD ${facts.levelsMm.join(', ')} mm`,
    `Subjects sharing a run: their noise projections correlate by ${Number.isFinite(facts.designCorrelation.meanAbs) ? `${facts.designCorrelation.meanAbs.toFixed(2)} on average in absolute value (largest ${facts.designCorrelation.maxAbs.toFixed(2)}, mean ${facts.designCorrelation.mean.toFixed(2)}, ${facts.designCorrelation.pairs} pairs)` : 'n/a (no two subjects share a run)'}; the group test assumes independent subjects, so correlated designs make it less exact`,
  ];
  if (optima) {
    lines.push(`Single-run optimum (${optima.firstLevelMetric}): ${optima.singleRun.noDetection ? 'none (nothing detected at any width)' : `${mm(optima.singleRun.optimum.value)}${interval(optima.singleRun.optimum)}`}${centre ? `; by the statistic at the blob centres ${mm(centre.singleRun.optimum.value)}` : ''}`);
    optima.levels.forEach((l, i) => {
      const c = centre?.levels[i];
      const atCentre = c ? `; by the statistic at the blob centres ${mm(c.optimum.value)}${interval(c.optimum)}` : '';
      const expected = `matched-filter expectation sqrt(w^2 + (2.355 s)^2) for a ${optima.plantSizeMm} mm blob: ${mm(Math.hypot(optima.plantSizeMm, 2.3548 * l.levelMm))}`;
      lines.push(l.noDetection
        ? `Group optimum at misregistration ${l.levelMm} mm: none (the group map detected nothing at any width: more subjects or a larger amplitude would be needed)${atCentre}; ${expected}`
        : `Group optimum at misregistration ${l.levelMm} mm: ${mm(l.optimum.value)}${interval(l.optimum)}; ${l.widerBy.value >= 0 ? 'wider' : 'narrower'} than the single-run optimum by ${mm(Math.abs(l.widerBy.value))}${interval(l.widerBy)}${atCentre}; ${expected}`);
    });
    if (optima.repeats < 5) lines.push(`Only ${optima.repeats} repeat${optima.repeats === 1 ? '' : 's'}: the bootstrap intervals are too narrow to trust; use 10 or more repeats for a study`);
  }
  const methods = `For the group question, ${study.subjects} subjects were simulated on ${facts.runs === 1 ? 'the one run' : `${facts.runs} runs (subject i on run i mod ${facts.runs})`}: each received its own random block design, the group's planted activations each displaced by a random misregistration (normal, SD ${facts.levelsMm.join(', ')} mm per axis) and an amplitude drawn around the group's (SD ${(study.amplitudeSpread * 100).toFixed(0)} %). Each subject was fitted at the first level as a single run is; the subjects' effect estimates (percent signal change) entered a one-sample t-test at every voxel (summary-statistics approach; Holmes & Friston 1998), thresholded by the same rule as the first level with ${study.subjects - 1} degrees of freedom${spec.threshold.kind === 'fwe-rft' || spec.threshold.kind === 'cluster' ? ' and the smoothness estimated from the second-level residuals' : ''}, and scored against the group's activations at their undisplaced positions. Optima are the peaks of the mean detection curves over widths, with 95 % percentile bootstrap intervals over repeats (Efron 1979); a misregistration of SD s blurs the group's activation of width w to about sqrt(w^2 + (2.355 s)^2) FWHM, and the matched-filter principle (Rosenfeld & Kak 1982) places the group's best width near that.`;
  return { question, lines, methods, references: [STUDY_REFERENCES.summaryStatistics, STUDY_REFERENCES.bootstrap, METHOD_REFERENCES.matchedFilter] };
}
