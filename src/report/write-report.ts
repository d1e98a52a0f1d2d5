import { basename, join } from 'node:path';
import { writeFileAtomic } from '../io/atomic-write.js';
import { prepareOutputFiles, type ClaimOptions } from '../io/output-folder.js';
import { recommendSetting, type RecommendOptions, type Recommendation } from '../decide/recommend-setting.js';
import { parameterName, settingSimplicity, settingText, simplerEnd, type Setting } from '../sweep/settings-grid.js';
import { parameterTradeoff } from '../decide/parameter-tradeoff.js';
import { getStep, listSteps } from '../steps/registry.js';
import { summariseScorecard } from '../decide/summarise-scorecard.js';
import { theoryBesideSimulation } from '../decide/theory-beside-simulation.js';
import { theoryChart } from './theory-chart.js';
import { detectionChart, falseAlarmChart, smoothnessChart, tsnrChart } from './charts-sweep.js';
import { rocChart } from './charts-roc.js';
import { buildDecisionRecord } from './decision-record.js';
import type { DecisionRecord } from './decision-record-types.js';
import { htmlReport, type ReportChart } from './html-report.js';
import { methodsMarkdown, methodsText, type MethodsText } from './methods-text.js';
import { renderSvg } from './render-svg.js';
import type { SweepFolder } from './sweep-folder.js';
import { thresholdText } from './threshold-text.js';
import { parameterLabel } from './chart-labels.js';
import { studyOptima } from '../decide/study-optima.js';
import { studyWidthChart } from './study-chart.js';
import { studyText } from './study-text.js';
import type { Scorecard } from '../sweep/scorecard.js';
import { studyLevels, type SweepSpec } from '../sweep/spec.js';

/** Files a report writes into its folder. */
export const REPORT_FILES = ['report.html', 'methods.md', 'decision-record.json'] as const;

/** What {@link writeReport} made. */
export interface WrittenReport {
  recommendation: Recommendation;
  record: DecisionRecord;
  methods: MethodsText;
  charts: ReportChart[];
  files: { report: string; methods: string; record: string };
}

/**
 * The report's charts as rendered SVG, each with a caption.
 * @param folder - sweep result and facts
 * @param rec - the recommendation (its setting is marked)
 * @returns charts in report order
 * @example const charts = await sweepCharts(folder, rec)
 */
export async function sweepCharts(folder: SweepFolder, rec: Recommendation): Promise<ReportChart[]> {
  const { result } = folder;
  const card = result.scorecard;
  const key = card.varied[0];
  // only a choice the sweep supports is drawn as 'recommended' (see the choice's status)
  const recommended = key === undefined || rec.choice.status !== 'chosen' ? undefined : rec.choice.chosen.setting[key];
  const thr = thresholdText(result.spec.threshold);
  const o = { recommended, thresholdText: thr, metric: rec.metric };
  const x = key ? parameterLabel(key) : 'the recipe';
  const charts: ReportChart[] = [];
  const planted = card.rows.some((r) => (r.plantCount as number) > 0);
  if (planted) charts.push({ id: 'chart-detection', title: 'Detection', svg: await renderSvg(detectionChart(card, o)), caption: `Fraction of planted voxels detected at ${thr}, against ${x}; one line per planted size. For smoothing this is the matched-filter curve: detection peaks near a kernel as wide as the activation.` });
  charts.push({ id: 'chart-false-alarms', title: 'False alarms', svg: await renderSvg(falseAlarmChart(card, o)), caption: `Clusters of detected voxels containing no planted voxel, per run, at ${thr}.` });
  charts.push({ id: 'chart-tsnr', title: 'tSNR', svg: await renderSvg(tsnrChart(card, o)), caption: `Median temporal signal-to-noise ratio inside the brain mask after the recipe, against ${x}.` });
  charts.push({ id: 'chart-smoothness', title: 'Smoothness', svg: await renderSvg(smoothnessChart(card, o)), caption: `Smoothness of the noise estimated from the model residuals (FWHM), against ${x}.` });
  const theory = planted ? theoryBesideSimulation(card, result.spec, result.designNorm, folder.run.spacingMm) : null;
  if (theory && theory.rows.length) {
    const off = theory.rows.filter((r) => r.disagrees);
    const why = off.length
      ? ` At ${off.length} of ${theory.rows.length} points the prediction lies outside the simulation's interval (${off.slice(0, 4).map((r) => `${r.plantSizeMm} mm blobs at ${r.kernelFwhmMm} mm`).join('; ')}${off.length > 4 ? '; ...' : ''}). The theory assumes Gaussian noise whose smoothness is the same everywhere and equal to the narrowest setting's, blob centres on voxel centres, and a model without AR(1) whitening; real noise that is not Gaussian, smoothness that varies across the brain, or a noise level measured with a quadratic detrend (tSNR) rather than the model can each move the simulation away from it.`
      : ' The prediction lies within the simulation\'s interval at every point.';
    charts.push({ id: 'chart-theory', title: 'Theory', svg: await renderSvg(theoryChart(theory)), caption: `Statistic at the planted centres against ${x}: simulated (points, 95 % t-interval) and predicted by matched-filter theory (dashed) from the run's noise level (${theory.noiseSdPct.toFixed(2)} % of baseline per volume), its smoothness beyond white noise (${theory.noiseFwhmMm.toFixed(1)} mm FWHM), the planted sizes and amplitudes.${why}` });
  }
  const tsnrMeans = summariseScorecard(card).filter((s) => s.plantSizeMm === card.rows[0]?.plantSizeMm && s.plantAmplitudePct === card.rows[0]?.plantAmplitudePct).map((s) => s.metrics.tsnrMedian?.mean ?? NaN);
  const turns = tsnrMeans.length > 2 && tsnrMeans.some((v, i) => i > 0 && i < tsnrMeans.length - 1 && ((v > tsnrMeans[i - 1] && v > tsnrMeans[i + 1]) || (v < tsnrMeans[i - 1] && v < tsnrMeans[i + 1])));
  const tsnrChartEntry = charts.find((c) => c.id === 'chart-tsnr');
  if (tsnrChartEntry && turns) tsnrChartEntry.caption += ' The curve turns over: smoothing raises tSNR by averaging noise, but past some width it also blends the brain edge with the background and cerebrospinal fluid, whose signal is lower or less stable, so the median tSNR in the mask falls again.';
  if (planted && result.curves.rows.length) charts.push({ id: 'chart-roc', title: 'ROC', svg: await renderSvg(rocChart(card, result.curves)), caption: 'Voxelwise ROC curves per setting (every threshold), averaged across repeats: how well each setting separates planted from other voxels, whatever the threshold. Neighbouring settings alternate solid and dashed lines.' });
  return charts;
}

/**
 * Recommend, render and write the report files of a sweep: report.html (self-contained), methods.md
 * and decision-record.json (inputs by file name and hash). The folder must be new, empty or written
 * by boldsweep; only boldsweep's own files are replaced.
 * @param dir - output folder (created when missing)
 * @param folder - the sweep (from runSweep or readSweepFolder) with run facts and masks
 * @param options - recommendation options (metric, targetSizeMm, prefer; prefer defaults to the end
 *   the varied steps' simplicity orders call simpler, else 'smallest')
 * @param write - force, inputs (see `claimOutputFolder`)
 * @returns the recommendation, record, methods and charts, and the paths written
 * @example const { recommendation } = await writeReport('out/demo', folder)
 */
export async function writeReport(dir: string, folder: SweepFolder, options: RecommendOptions = {}, write: ClaimOptions = {}): Promise<WrittenReport> {
  await prepareOutputFiles(dir, [...REPORT_FILES], { ...write, inputs: write.inputs ?? Object.values(folder.run.files) });
  const { result } = folder;
  const thr = thresholdText(result.spec.threshold);
  // the simpler end of the varied values comes from the steps' own simplicity orders unless given
  const prefer = options.prefer ?? simplerEnd(result.spec) ?? undefined;
  // a study answers the group question at one misregistration level: the spec's own when it is one
  // of the levels, else the middle one (the other levels are compared in the study lines and chart)
  const studyLevel = result.spec.study ? answerLevel(result.spec) : null;
  const recCard = studyLevel === null ? result.scorecard : levelCard(result.scorecard, studyLevel);
  // named values (kernels, methods) have no smaller end: the steps' simplicity orders rank them
  const simplicity = options.prefer === undefined && prefer === undefined ? (s: Setting) => settingSimplicity(s, result.spec.recipe) : undefined;
  const recommendation = recommendSetting(recCard, { thresholdText: thr, simplicity, ...options, prefer });
  const studyOpt = result.spec.study ? studyOptima(result.scorecard, { metric: recommendation.metric, plantSizeMm: recommendation.choice.plantSizeMm, plantAmplitudePct: recommendation.choice.plantAmplitudePct }) : null;
  const centreOpt = result.spec.study ? studyOptima(result.scorecard, { metric: 'centreStatisticMean', plantSizeMm: recommendation.choice.plantSizeMm, plantAmplitudePct: recommendation.choice.plantAmplitudePct }) : null;
  const study = result.spec.study && result.study ? studyText(result.spec, result.study, studyOpt, studyLevel ?? 0, centreOpt) : null;
  if (study) recommendation.summary = `${study.question} ${recommendation.summary}`;
  const rough = roughSettings(folder);
  if (rough.length && (result.spec.threshold.kind === 'fwe-rft' || result.spec.threshold.kind === 'cluster')) {
    recommendation.caveats.push(`At ${rough.join(', ')} the estimated noise smoothness is under 3 voxels FWHM, where the random-field threshold is far more conservative than its nominal level (the lattice is too rough for the continuous theory; Nichols & Hayasaka 2003). The sweep uses the Bonferroni value there when it is lower, but the threshold still falls hardest on the narrowest settings and so biases the choice towards wider kernels; the fwe-calibrated rule measures the threshold on this run's own noise instead.`);
  }
  const record = await buildDecisionRecord({ result, recommendation, run: folder.run, masks: folder.masks });
  const methods = methodsText(record);
  if (study) { methods.paragraphs.push(study.methods); methods.references.push(...study.references.filter((r) => !methods.references.includes(r))); }
  const charts = await sweepCharts(folder, recommendation);
  if (studyOpt) charts.unshift({ id: 'chart-study', title: 'Study', svg: await renderSvg(studyWidthChart(studyOpt)), caption: `Detection against ${parameterLabel(studyOpt.key)}: the group map at each misregistration level (colours) and one subject's own run (dashed grey, the single-run question). Misregistration blurs the group's activation, so its best width moves wider; diamonds and bars under the curves are each optimum and its 95 % bootstrap interval over repeats.` });
  const spec = result.spec;
  // the recipe as chosen: the varied parameters filled in with the chosen setting's values
  const chosenSetting = recommendation.choice.chosen.setting;
  const sweepLines = [
    `Recipe${recommendation.choice.status === 'chosen' ? ' (with the recommended setting)' : ` (with ${settingText(chosenSetting)}, which is not a recommendation)`}: ${record.recipe.map((s) => `${s.step}(${Object.entries(s.params).map(([k, v]) => `${k}=${JSON.stringify(v)}`).join(', ')})`).join(' -> ')}`,
    ...Object.entries(spec.vary).map(([k, v]) => `Varied ${parameterLabel(k)}: ${v.map((x) => (x === null ? 'none' : x)).join(', ')}`),
    // a varied geometric step (interpolation kernel, voxel size): which value detects best and which blurs least
    ...geometricKeys(spec.vary).flatMap((k) => parameterTradeoff(result.scorecard, k, { metric: recommendation.metric }).map((g) => `Trade-off: ${g.text}`)),
    spec.plant.count > 0
      ? `Planted: ${spec.plant.count} ${spec.plant.shape} blobs per run; sizes ${spec.plant.sizesFwhmMm.join(', ')} mm; amplitudes ${spec.plant.amplitudesPct.join(', ')} %`
      : 'Planted: nothing (null sweep: every detection is a false alarm)',
    `Repeats: ${spec.repeats} plantings per setting; seed ${spec.seed}`,
    ...(study ? study.lines : []),
    `Model: GLM${spec.model.ar1 ? ` with AR(1) prewhitening (autocorrelation ${spec.model.ar1SmoothFwhmMm > 0 ? `smoothed at ${spec.model.ar1SmoothFwhmMm} mm FWHM` : 'per voxel'})` : ' (OLS)'}${spec.model.highpassCutoffSec ? `, cosine drift cutoff ${spec.model.highpassCutoffSec} s` : ''}; threshold ${thr}`,
    // motion correction: framewise displacement before and after, per setting that corrects motion
    ...motionLines(folder),
    // guidance a step computed for this run (the slice-time step: shift or model at this TR, aliased rhythms)
    ...[...new Set(record.stepNotes.map((n) => n.diagnostics.guidance).filter((g): g is string => typeof g === 'string'))].map((g) => `Guidance (${record.stepNotes.find((n) => n.diagnostics.guidance === g)!.step}): ${g}`),
  ];
  const st = result.stats;
  const runLines = [
    `${st.cellsRun} cells (${st.cellsComputed} computed, ${st.cellsFromCache} from the cache) in ${st.tasks} tasks on ${st.workers} worker${st.workers === 1 ? '' : 's'}; ${st.wallSeconds.toFixed(1)} s wall time.`,
    `Sweep key ${result.scorecard.sweepKey}; run hash ${result.inputs.runHash}.`,
  ];
  const html = htmlReport({
    title: `Which ${Object.keys(spec.vary).map(parameterName).join(' and ') || 'recipe'}? A boldsweep report`,
    runSummary: `Run: ${folder.run.files.image ? basename(folder.run.files.image) : '(in memory)'}; ${folder.run.summary}.`,
    sweepLines, recommendation, charts, summaries: summariseScorecard(result.scorecard),
    tableMetrics: ['hitRate', 'falseClusters', 'rocAuc', 'dice', 'tsnrMedian', 'smoothnessFwhmMm'].filter((m) => result.scorecard.metrics.includes(m)),
    nullCalibration: result.nullCalibration ?? null, spec,
    methods, runLines, software: { boldsweep: record.software.boldsweep, node: record.software.node, 'vega-lite': record.software.dependencies['vega-lite'] ?? '' },
  });
  const files = { report: join(dir, 'report.html'), methods: join(dir, 'methods.md'), record: join(dir, 'decision-record.json') };
  await writeFileAtomic(files.report, html);
  await writeFileAtomic(files.methods, methodsMarkdown(methods, `Methods: ${settingText(recommendation.choice.chosen.setting)}`));
  await writeFileAtomic(files.record, JSON.stringify(record, null, 1) + '\n');
  return { recommendation, record, methods, charts, files };
}

/** Varied keys of registered geometric steps whose values are not numbers (kernels, methods): the ones a trade-off line compares. */
function geometricKeys(vary: Record<string, unknown[]>): string[] {
  return Object.keys(vary).filter((k) => {
    const step = k.slice(0, k.indexOf('.'));
    return step !== 'model' && listSteps().includes(step) && getStep(step).kind === 'geometric' && vary[k].some((v) => typeof v !== 'number');
  });
}

/**
 * Framewise displacement before and after motion correction (the motion-correct step's note), one
 * line per distinct before/after pair with the settings it holds for.
 */
function motionLines(folder: SweepFolder): string[] {
  const labels = new Map<number, string>();
  for (const s of summariseScorecard(folder.result.scorecard)) labels.set(s.settingIndex, settingText(s.setting));
  const byText = new Map<string, string[]>();
  for (const { settingIndex, notes } of folder.result.notes) {
    const d = notes.find((n) => n.step === 'motion-correct' && typeof n.diagnostics.fdMeanBeforeMm === 'number')?.diagnostics;
    if (!d) continue;
    const mm = (x: unknown, digits: number) => (typeof x === 'number' ? `${x.toFixed(digits)} mm` : 'n/a');
    const after = typeof d.fdMeanAfterMm === 'number'
      ? `after correction mean ${mm(d.fdMeanAfterMm, 3)}, largest ${mm(d.fdMaxAfterMm, 2)}, ${d.fdAbove05After} volumes above 0.5 mm (${d.fdAfterNote})`
      : `after correction ${d.fdAfterNote}`;
    const text = `before correction mean ${mm(d.fdMeanBeforeMm, 3)}, largest ${mm(d.fdMaxBeforeMm, 2)}, ${d.fdAbove05Before} volumes above 0.5 mm; ${after}`;
    byText.set(text, [...(byText.get(text) ?? []), labels.get(settingIndex) ?? `setting ${settingIndex}`]);
  }
  return [...byText.entries()].map(([text, settings]) => `Framewise displacement (Power et al. 2012, 50 mm sphere; ${settings.join('; ')}): ${text}`);
}

/** Settings whose mean estimated smoothness is under 3 voxels FWHM (geometric mean voxel size). */
function roughSettings(folder: SweepFolder): string[] {
  const voxel = Math.cbrt(folder.run.spacingMm[0] * folder.run.spacingMm[1] * folder.run.spacingMm[2]);
  const seen = new Map<number, string>();
  for (const s of summariseScorecard(folder.result.scorecard)) {
    const f = s.metrics.smoothnessFwhmMm?.mean;
    if (f !== undefined && Number.isFinite(f) && f < 3 * voxel && !seen.has(s.settingIndex)) seen.set(s.settingIndex, settingText(s.setting));
  }
  return [...seen.values()];
}

/** The misregistration level a study's recommendation answers: the spec's own value when it is a level, else the middle level. */
function answerLevel(spec: SweepSpec): number {
  const levels = studyLevels(spec);
  return levels.includes(spec.study!.misregistrationMm) ? spec.study!.misregistrationMm : [...levels].sort((a, b) => a - b)[Math.floor((levels.length - 1) / 2)];
}

/** A study scorecard's rows at one misregistration level, with the level no longer a varied key. */
function levelCard(card: Scorecard, levelMm: number): Scorecard {
  const key = 'study.misregistrationMm';
  if (!card.varied.includes(key)) return card;
  const keep = card.rows.map((r, i) => (r[key] === levelMm ? i : -1)).filter((i) => i >= 0);
  return { ...card, varied: card.varied.filter((k) => k !== key), rows: keep.map((i) => card.rows[i]), seconds: keep.map((i) => card.seconds[i]) };
}
