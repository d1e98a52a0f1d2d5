import { DEFAULT_NULL_DESIGNS } from '../sweep/spec.js';
import type { DecisionRecord } from './decision-record-types.js';
import { parameterName, settingLabel, settingText } from '../sweep/settings-grid.js';
import { metricWords } from '../decide/recommend-setting.js';
import { unitOf } from './chart-labels.js';
import { RESEARCH_CAUTION } from './caution.js';

/** A methods section: paragraphs of plain scientific English and the references they cite. */
export interface MethodsText {
  paragraphs: string[];
  references: string[];
}

/**
 * Published sources the generated text cites, as "Authors (year) Venue". Volume and page numbers
 * marked [M] in REFERENCES.md are from memory; they are quoted as that
 * file gives them.
 */
export const METHOD_REFERENCES = {
  glm: 'Friston KJ, Holmes AP, Worsley KJ, Poline JB, Frith CD, Frackowiak RSJ (1995) Hum Brain Mapp 2(4):189-210',
  hrf: 'Glover GH (1999) NeuroImage 9(4):416-429',
  ar1: 'Worsley KJ, Liao CH, Aston J, Petre V, Duncan GH, Morales F, Evans AC (2002) NeuroImage 15(1):1-15',
  rft: 'Worsley KJ, Marrett S, Neelin P, Vandal AC, Friston KJ, Evans AC (1996) Hum Brain Mapp 4(1):58-73',
  smoothness: 'Kiebel SJ, Poline JB, Friston KJ, Holmes AP, Worsley KJ (1999) NeuroImage 10(6):756-766',
  fdr: 'Benjamini Y, Hochberg Y (1995) J R Stat Soc B 57(1):289-300',
  fdrImaging: 'Genovese CR, Lazar NA, Nichols T (2002) NeuroImage 15(4):870-878',
  cluster: 'Friston KJ, Worsley KJ, Frackowiak RSJ, Mazziotta JC, Evans AC (1994) Hum Brain Mapp 1(3):210-220',
  oneSe: 'Breiman L, Friedman JH, Olshen RA, Stone CJ (1984) Classification and Regression Trees. Wadsworth',
  matchedFilter: 'Rosenfeld A, Kak AC (1982) Digital Picture Processing, 2nd ed. Academic Press',
  autocorrelation: 'Eklund A, Nichols TE, Knutsson H (2016) PNAS 113(28):7900-7905',
  student: 'Student (1908) Biometrika 6(1):1-25',
  lesserOf: 'Nichols T, Hayasaka S (2003) Stat Methods Med Res 12(5):419-446',
  permutation: 'Nichols TE, Holmes AP (2002) Hum Brain Mapp 15(1):1-25',
  motionRegressors: 'Friston KJ, Williams S, Howard R, Frackowiak RSJ, Turner R (1996) Magn Reson Med 35(3):346-355',
  framewiseDisplacement: 'Power JD, Barnes KA, Snyder AZ, Schlaggar BL, Petersen SE (2012) NeuroImage 59(3):2142-2154',
} as const;

/** The model's motion terms as chosen (or fixed in the spec), as a clause starting with ', ', or ''. */
function motionModelText(r: DecisionRecord, cite: (ref: string) => string): string {
  // a varied option's chosen value (null too: no censoring) overrides the spec's fixed one
  const chosen = (key: 'motionRegressors' | 'censorFdMm' | 'censorFdBefore' | 'censorFdAfter') => (`model.${key}` in r.choice.setting ? r.choice.setting[`model.${key}`] : r.sweepSpec.model[key]) ?? null;
  const count = Number(chosen('motionRegressors') ?? 0);
  const fd = chosen('censorFdMm');
  // cited only when used (cite() adds to the reference list)
  const what: Record<number, () => string> = {
    6: () => 'the six rigid-body motion parameters',
    12: () => 'the six rigid-body motion parameters and their differences from the volume before',
    24: () => `the six rigid-body motion parameters, their values one volume earlier and the squares of both (${cite(METHOD_REFERENCES.motionRegressors)})`,
  };
  const parts: string[] = [];
  if (what[count]) parts.push(`${count} mean-centred motion regressors: ${what[count]()}`);
  const before = Number(chosen('censorFdBefore') ?? 0);
  const after = Number(chosen('censorFdAfter') ?? 0);
  const volumes = (n: number) => `${n} volume${n === 1 ? '' : 's'}`;
  const reach = before || after ? ` and for the ${[before ? `${volumes(before)} before` : '', after ? `${volumes(after)} after` : ''].filter(Boolean).join(' and ')} each of them` : '';
  if (typeof fd === 'number') parts.push(`one indicator regressor for each volume whose framewise displacement (${cite(METHOD_REFERENCES.framewiseDisplacement)}; rotations as arc length on a 50 mm sphere) exceeded ${fd} mm${reach}`);
  return parts.map((p) => `, ${p}`).join('');
}

const num = (x: number | null | undefined, d = 2) => (x === null || x === undefined || !Number.isFinite(x) ? 'n/a' : x.toFixed(d));

function thresholdSentence(r: DecisionRecord, cite: (ref: string) => string): string {
  const t = r.sweepSpec.threshold;
  switch (t.kind) {
    case 'fwe-rft': return `Voxels were declared active at a family-wise error rate of ${t.alpha}, at the lower of the random-field threshold (${cite(METHOD_REFERENCES.rft)}), with the smoothness estimated from the standardised residuals (${cite(METHOD_REFERENCES.smoothness)}), and the Bonferroni threshold over the voxels of the brain mask, as both hold the rate (${cite(METHOD_REFERENCES.lesserOf)}).`;
    case 'fwe-calibrated': return `Voxels were declared active at a family-wise error rate of ${t.alpha} calibrated on this run's own noise: for each candidate setting, ${t.nullDesigns ?? DEFAULT_NULL_DESIGNS} random block designs with nothing planted were fitted to the run after that setting's preprocessing, and the threshold was the order statistic of their maximum t values that a new null map exceeds with probability at most ${t.alpha} (${cite(METHOD_REFERENCES.permutation)}); this holds the rate whatever the spatial autocorrelation of the noise (${cite(METHOD_REFERENCES.autocorrelation)}).`;
    case 'fdr': return `Voxels were declared active at a false discovery rate of ${t.q} by the Benjamini-Hochberg procedure (${cite(METHOD_REFERENCES.fdr)}; ${cite(METHOD_REFERENCES.fdrImaging)}).`;
    case 'bonferroni': return `Voxels were declared active at a family-wise error rate of ${t.alpha} by the Bonferroni correction over the voxels of the brain mask.`;
    case 'uncorrected': return `Voxels were declared active at an uncorrected one-sided p < ${t.alpha}.`;
    case 'cluster': return `Clusters were formed at one-sided p < ${t.clusterFormingP} and kept when their extent was significant at a family-wise error rate of ${t.alpha} by random field theory (${cite(METHOD_REFERENCES.cluster)}), with the smoothness estimated from the residuals (${cite(METHOD_REFERENCES.smoothness)}).`;
  }
}

/** Where blobs were centred and which voxels were left out, in words, from the record's masks. */
function placementText(r: DecisionRecord): string {
  const m = r.masks;
  if (r.sweepSpec.plant.count === 0) return '';
  const where = m.placement.kind === 'file'
    ? `, centred within the voxels of ${m.placement.file.path.split('/').pop()}${m.placement.values ? ` labelled ${m.placement.values.join(' or ')}` : m.placement.above !== undefined ? ` above ${m.placement.above}` : ''}`
    : ', centred within the brain mask (the automatic mask of the mean image)';
  const margin = r.sweepSpec.plant.marginMm === null ? ' at least half a blob width inside its edge' : ` at least ${r.sweepSpec.plant.marginMm} mm inside its edge`;
  const excl = m.exclude?.kind === 'file'
    ? `; voxels of ${m.exclude.file.path.split('/').pop()}${m.exclude.above !== undefined ? ` above ${m.exclude.above}` : ''}${m.exclude.growVoxels ? ` grown by ${m.exclude.growVoxels} voxels` : ''} were excluded from planting and scoring because they may respond to the task already`
    : '';
  return `${where}${margin}${excl}`;
}

/**
 * The in-text form of a reference written "Surname AB, Surname CD (year) Venue": "Surname year",
 * "Surname & Surname year" or "Surname et al. year".
 * @param ref - full reference
 * @returns the short form
 * @example shortCitation('Benjamini Y, Hochberg Y (1995) J R Stat Soc B 57(1):289-300') // 'Benjamini & Hochberg 1995'
 */
export function shortCitation(ref: string): string {
  const m = /^(.*?)\s*\((\d{4})\)/.exec(ref);
  if (!m) return ref;
  const surnames = m[1].split(/,\s*|\s+&\s+|\s+and\s+/).filter(Boolean).map((a) => a.trim().split(/\s+/)[0]);
  const who = surnames.length === 1 ? surnames[0] : surnames.length === 2 ? `${surnames[0]} & ${surnames[1]}` : `${surnames[0]} et al.`;
  return `${who} ${m[2]}`;
}

/**
 * Write the methods paragraphs for a decision: the preprocessing as chosen (from the step notes),
 * the model and threshold, and how the choice was made, with its numbers, units and citations.
 * @param r - the decision record
 * @returns paragraphs and numbered references (citations in the text are "(Author year)")
 * @example const m = methodsText(record); console.log(m.paragraphs.join('\n\n'))
 */
export function methodsText(r: DecisionRecord): MethodsText {
  const refs: string[] = [];
  const cite = (ref: string): string => {
    if (!refs.includes(ref)) refs.push(ref);
    return shortCitation(ref);
  };
  const spec = r.sweepSpec;
  const choice = r.choice;
  const paragraphs: string[] = [];

  // 1. data and preprocessing
  const steps = r.stepNotes.map((n) => {
    const c = n.citations.length ? ` (${n.citations.map(cite).join('; ')})` : '';
    const text = n.methodsText.trim().replace(/\.$/, '');
    return `${text}${c}.`;
  });
  // no brackets inside brackets: the run summary's own parentheses become commas
  const runSummary = r.run.summary.replace(/\s*\(([^()]*)\)/g, ', $1');
  paragraphs.push(`The functional run (${runSummary}) was preprocessed with ${r.stepNotes.length} step${r.stepNotes.length === 1 ? '' : 's'}, in this order. ${steps.join(' ')}`);

  // 2. model and threshold (citations numbered in the order they appear)
  const cond = spec.model.trialType ? `the '${spec.model.trialType}' events` : 'the task events';
  const drift = spec.model.highpassCutoffSec ? `, discrete cosine drift regressors with a ${spec.model.highpassCutoffSec} s cutoff` : '';
  const cv = spec.model.censorVolumes;
  const censored = cv.length ? `, one indicator regressor for each of the ${cv.length} censored volumes (volume${cv.length === 1 ? '' : 's'} ${cv.length === 1 ? cv[0] : `${cv.slice(0, -1).join(', ')} and ${cv[cv.length - 1]}`}, numbered from 0 in the run as acquired)` : '';
  const glm = `Each voxel inside the brain mask was fitted with a general linear model (${cite(METHOD_REFERENCES.glm)}) whose regressor of interest was ${cond} convolved with a canonical double-gamma haemodynamic response (${cite(METHOD_REFERENCES.hrf)})${drift}${censored}${motionModelText(r, cite)}, and an intercept.`;
  // the chosen value when the sweep varied it; a record from before the option existed was unsmoothed
  const arFwhm = Number(choice.setting['model.ar1SmoothFwhmMm'] ?? spec.model.ar1SmoothFwhmMm ?? 0);
  const arSmooth = arFwhm > 0 ? `bias-corrected and spatially smoothed with a ${arFwhm} mm FWHM Gaussian kernel within the brain mask` : 'bias-corrected and estimated separately at each voxel';
  const ar = spec.model.ar1 ? ` Serial correlation was modelled as a first-order autoregressive process and removed by prewhitening; its lag-1 autocorrelation was ${arSmooth} (${cite(METHOD_REFERENCES.ar1)}).` : ' Serial correlation was not modelled (ordinary least squares).';
  paragraphs.push(`${glm}${ar} The effect was tested with a one-sided t contrast. ${thresholdSentence(r, cite)}`);

  // 3. how the choice was made
  const varied = Object.keys(spec.vary);
  const candidates = varied.map((k) => `${parameterName(k)} ${spec.vary[k].map((v) => (v === null ? 'none' : v)).join(', ')}${unitOf(k) ? ` ${unitOf(k)}` : ''}`).join('; ');
  const chosenWhat = varied.length ? Object.entries(choice.setting).map(([k, v]) => (v === null ? `no ${parameterName(k)}` : `a ${parameterName(k)} of ${v}${unitOf(k) ? ` ${unitOf(k)}` : ''}`)).join(' and ') : 'the recipe';
  const sameAsBest = settingLabel(choice.best.setting) === settingLabel(choice.setting);
  const plant = spec.plant.count > 0
    ? `${spec.plant.count} ${spec.plant.shape === 'gaussian' ? 'Gaussian' : 'soft-edged spherical'} activations of ${choice.plantSizeMm} mm ${spec.plant.shape === 'gaussian' ? 'FWHM' : 'diameter'} and ${choice.plantAmplitudePct} % peak signal change, following the task time course, were added at random positions of the unprocessed run`
    : 'nothing was added to the run (a null simulation)';
  const ch = choice.chosen;
  const ref = spec.plant.shape === 'gaussian' && varied.some((k) => /fwhm/i.test(k)) ? ` By the matched-filter principle, detection of a Gaussian activation is expected to be best when the kernel width equals the activation width (${cite(METHOD_REFERENCES.matchedFilter)}).` : '';
  const atChoice = r.scorecard.summary.find((s) => settingLabel(s.setting) === settingLabel(choice.setting) && s.plantSizeMm === choice.plantSizeMm && s.plantAmplitudePct === choice.plantAmplitudePct);
  const extras: string[] = [];
  if (atChoice?.metrics.falseClusters) extras.push(`${num(atChoice.metrics.falseClusters.mean)} false clusters per run`);
  if (atChoice?.metrics.tsnrMedian) extras.push(`a median tSNR of ${num(atChoice.metrics.tsnrMedian.mean, 1)}`);
  if (atChoice?.metrics.smoothnessFwhmMm) extras.push(`an estimated smoothness of ${num(atChoice.metrics.smoothnessFwhmMm.mean, 1)} mm FWHM`);
  const interval = ch.low !== null && ch.high !== null && Number.isFinite(ch.low) && Number.isFinite(ch.high) && ch.high > ch.low
    ? `; 95 % t-interval ${num(ch.low, 3)} to ${num(ch.high, 3)}, ${cite(METHOD_REFERENCES.student)}`
    : '';
  const status = choice.status ?? 'chosen';
  const requested = choice.fallback?.from ?? choice.metric;
  const how = status === 'nothing-planted'
    ? `In each of ${spec.repeats} repeats, ${plant}; every candidate setting (${candidates || 'one'}) was then applied, the model fitted and thresholded, and every surviving cluster counted as a false alarm.`
    : `In each of ${spec.repeats} repeats, ${plant}${placementText(r)}; every candidate setting (${candidates || 'one'}) was then applied, the model fitted and thresholded, and the detections compared with the planted truth (a planted voxel is one where the planted signal is at least half its peak).${ref}`;
  let decision: string;
  if (status === 'nothing-planted') {
    decision = `Nothing was planted: the sweep measured the false alarms of each setting on the run's own noise, and no setting is recommended from it.`;
  } else if (status === 'no-detection') {
    decision = `No setting detected the planted activations: the best mean ${metricWords(choice.metric)} across repeats was ${num(choice.best.mean, 3)}, at ${settingText(choice.best.setting)}, so the simulation gives no basis for a choice at this amplitude and no setting is recommended.`;
  } else if (status === 'saturated') {
    decision = choice.fallback
      ? `The ${metricWords(requested)} reached its ceiling at several settings and could not separate them, so the choice was made on the ${metricWords(choice.metric)}, which still did: by the one-standard-error rule (${cite(METHOD_REFERENCES.oneSe)}), ${chosenWhat} was taken, the ${choice.prefer} setting within one standard error of the best mean (mean ${num(ch.mean, 2)} against ${num(choice.best.mean, 2)} at ${settingText(choice.best.setting)}).`
      : `The ${metricWords(requested)} reached its ceiling at several settings and could not separate them; no setting is recommended.`;
  } else if (status === 'tied') {
    decision = `No setting separated from the others: every mean ${metricWords(choice.metric)} lay within one standard error of the best (${num(choice.best.mean, 3)}, SE ${num(choice.best.se, 3)}, at ${settingText(choice.best.setting)}), so the data do not favour ${chosenWhat} over the rest.`;
  } else {
    decision = `By the one-standard-error rule (${cite(METHOD_REFERENCES.oneSe)}), ${chosenWhat} was chosen: the ${choice.prefer} setting whose mean ${metricWords(choice.metric)} across repeats was within one standard error of the best mean. `
      + (sameAsBest
        ? `Here the best setting was also the ${choice.prefer} qualifying one (mean ${num(ch.mean, 3)}${interval}; standard error ${num(choice.best.se, 3)}).`
        : `Its mean was ${num(ch.mean, 3)}${interval ? ` (${interval.slice(2)})` : ''}, against ${num(choice.best.mean, 3)} (standard error ${num(choice.best.se, 3)}) at the best setting, ${settingText(choice.best.setting)}.`)
      + (extras.length ? ` At this setting the simulation found ${extras.join(', ')}.` : '');
  }
  paragraphs.push(`The ${varied.length ? varied.map(parameterName).join(' and ') : 'recipe'} was ${status === 'chosen' || status === 'saturated' ? 'chosen' : 'compared'} by simulation on this run with boldsweep ${r.software.boldsweep} (seed ${r.seed}). ${how} ${decision}`);

  // 4. limits
  paragraphs.push(`These figures are estimates from one run; the simulation assumes activations of the planted shape and the modelled haemodynamic response, and real fMRI noise has non-Gaussian spatial autocorrelation (${cite(METHOD_REFERENCES.autocorrelation)}). The decision record (input hashes, software versions, sweep specification, seed and scorecard summary) allows the simulation to be repeated exactly.`);
  return { paragraphs, references: refs };
}

/**
 * The methods text as Markdown, with the caution at the end.
 * @param m - methods paragraphs and references
 * @param title - heading. __Default value:__ 'Methods'
 * @returns Markdown text
 * @example await writeFileAtomic('out/demo/methods.md', methodsMarkdown(methodsText(record)))
 */
export function methodsMarkdown(m: MethodsText, title = 'Methods'): string {
  return `# ${title}\n\n${m.paragraphs.join('\n\n')}\n\n## References\n\n${m.references.map((r, i) => `${i + 1}. ${r}`).join('\n')}\n\n---\n\n*${RESEARCH_CAUTION}*\n`;
}
