import { z } from 'zod';
import { fail } from '../core/fail.js';
import { DEFAULT_AR1_SMOOTH_FWHM_MM } from '../model/glm-ar1.js';
import { minimumNullDesigns } from '../model/threshold-calibrated.js';

/**
 * A sweep spec: what to run, what to vary, what to plant and how to judge it. The same object is
 * accepted from TypeScript, JSON or YAML (see `readSweepSpec`), and validated by `sweepSpecSchema`.
 *
 *   recipe (ordered steps)  x  vary (grid of step parameters)  x  plant (sizes x amplitudes)  x  repeats
 */

/** One step of a recipe: a registered step name and its parameters. */
export interface RecipeStep {
  /** Registered step name, e.g. "smooth" (see the steps module's registry). */
  step: string;
  /** Parameters given to the step; missing ones take the step's defaults. */
  params: Record<string, unknown>;
}

/** What to plant in each repeat: every size x amplitude pair is its own plant condition. */
export interface PlantSpec {
  /** Blob profile. __Default value:__ 'gaussian' */
  shape: 'gaussian' | 'sphere';
  /** Blob sizes in mm: FWHM of a Gaussian blob; for a sphere, its diameter (where its weight is one half). */
  sizesFwhmMm: number[];
  /** Peak amplitudes in percent of the local baseline. */
  amplitudesPct: number[];
  /** Blobs per planting; 0 plants nothing (a null sweep that measures false alarms only). */
  count: number;
  /**
   * How far (mm) blob centres stay inside the placement mask's edge; null takes half the blob size.
   * Use 0 for a thin placement mask such as grey matter. __Default value:__ null
   */
  marginMm: number | null;
  /** Smallest centre-to-centre distance as a multiple of the blob size. __Default value:__ 2 */
  separation: number;
}

/**
 * How planted activations follow the run's acquisition. Head poses (a motion table) and a B0 field
 * map are inputs of the sweep (runSweep options `motionTable`, `fieldMapHz`; CLI `--motion-table`,
 * `--field-map`), not part of the spec.
 */
export interface AcquisitionSpec {
  /**
   * 'sidecar': each slice's planted time course is the task regressor sampled at that slice's
   * acquisition time (the sidecar's SliceTiming), as a real response is; 'none': every slice follows
   * the regressor sampled at the model's sample time (mid-volume). A run without SliceTiming plants
   * as 'none'. __Default value:__ 'sidecar'
   */
  sliceTiming: 'sidecar' | 'none';
}

/** How a statistic map is thresholded before scoring. */
export interface ThresholdRule {
  /**
   * 'fwe-rft' family-wise by the lesser of the random-field and Bonferroni values; 'fwe-calibrated'
   * family-wise from the maximum statistic of `nullDesigns` null fits on the unplanted run, per setting;
   * 'fdr' Benjamini-Hochberg; 'uncorrected'; 'bonferroni'; 'cluster' extent.
   */
  kind: 'fwe-rft' | 'fwe-calibrated' | 'fdr' | 'uncorrected' | 'bonferroni' | 'cluster';
  /** Family-wise or voxelwise error rate (all kinds but 'fdr'). __Default value:__ 0.05 */
  alpha: number;
  /** False discovery rate for 'fdr'. __Default value:__ 0.05 */
  q: number;
  /** Voxelwise p that forms clusters for 'cluster'. __Default value:__ 0.001 */
  clusterFormingP: number;
  /**
   * K, the null designs (random block designs, nothing planted) fitted to the unplanted run after each
   * setting's recipe: they calibrate 'fwe-calibrated' and measure every rule's family-wise false-alarm
   * rate on this run's noise. null: 100 for 'fwe-calibrated', none for the other rules (no measured
   * rate). At least 19 for alpha 0.05 with 'fwe-calibrated'. __Default value:__ null
   */
  nullDesigns?: number | null;
}

/** Null designs fitted when a rule leaves `nullDesigns` out: enough for a 95th percentile to within a few %. */
export const DEFAULT_NULL_DESIGNS = 100;

/**
 * How many null designs a sweep fits per setting.
 * @param rule - the spec's threshold rule
 * @returns K (0 = none)
 * @example nullDesignCount({ kind: 'fwe-calibrated', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 }) // 100
 */
export function nullDesignCount(rule: ThresholdRule): number {
  return rule.nullDesigns ?? (rule.kind === 'fwe-calibrated' ? DEFAULT_NULL_DESIGNS : 0);
}

/**
 * The random block design of the null fits when the spec's own events are the run's: blocks of 20 s
 * with rests of 10 to 40 s, periods inside a 128 s high-pass filter's pass band.
 */
export const NULL_DESIGN = { onSec: 20, offMinSec: 10, offMaxSec: 40, trialType: 'null-task' } as const;

/** Options of the statistical model fitted in every cell. */
export interface ModelOptions {
  /** Prewhiten with an AR(1) noise model. __Default value:__ true */
  ar1: boolean;
  /**
   * FWHM in mm of the Gaussian kernel that smooths the AR(1) autocorrelation map within the brain
   * mask before prewhitening (Worsley et al. 2002); 0 whitens each voxel with its own estimate.
   * Unused when ar1 is false. __Default value:__ 15
   */
  ar1SmoothFwhmMm: number;
  /** Discrete cosine high-pass cutoff in seconds as nuisance regressors; null for none. __Default value:__ 128 */
  highpassCutoffSec: number | null;
  /** Trial type whose events form the tested regressor; null uses every event. __Default value:__ null */
  trialType: string | null;
  /**
   * Volumes to censor, 0-based in the run as opened: each gets its own indicator regressor (so it no
   * longer informs the effect or the noise), e.g. the volumes a look flags. Volumes removed by
   * drop-initial-volumes are skipped and the rest re-indexed. __Default value:__ []
   */
  censorVolumes: number[];
  /**
   * Motion nuisance regressors from the sweep's motion table (the one planting follows): 0 none; 6 the
   * parameters; 12 the parameters and their one-volume backward differences; 24 the parameters, their
   * values one volume earlier and the squares of both (Friston et al. 1996). Each is mean-centred
   * (`motionRegressors` in the model module). Absent = 0: caches and scorecards of sweeps that do not
   * name it keep their keys. __Default value:__ 0
   */
  motionRegressors?: 0 | 6 | 12 | 24;
  /**
   * Censor every volume whose framewise displacement (Power et al. 2012; 50 mm sphere) from the
   * sweep's motion table is above this many mm, each with its own indicator regressor like
   * `censorVolumes` (0.5 mm is common practice); null or absent: no censoring by motion.
   * __Default value:__ null
   */
  censorFdMm?: number | null;
  /**
   * With `censorFdMm`: also censor this many volumes before each volume above it (Power et al. 2014
   * censored one). Absent = 0: caches and scorecards of sweeps that do not name it keep their keys.
   * __Default value:__ 0
   */
  censorFdBefore?: number;
  /**
   * With `censorFdMm`: also censor this many volumes after each volume above it (Power et al. 2014
   * censored two). Absent = 0. __Default value:__ 0
   */
  censorFdAfter?: number;
}

/**
 * Which task timing plants and models use: the run's own events, or a new random block design per
 * repeat (a null task for measuring false alarms on data without that task, such as a rest run).
 */
export type EventsRule =
  | { kind: 'run' }
  | { kind: 'random-blocks'; onSec: number; offMinSec: number; offMaxSec: number; trialType: string };

/**
 * Where a study's runs come from: a list of NIfTI files, or a BIDS folder with a task name (every
 * sub-*\/func/*_task-<task>_bold.nii.gz). Paths are resolved by the command line relative to the spec
 * file; from code, pass the opened runs to runSweep (`studyRuns`). null: the sweep's own run only.
 */
export type StudyRuns = string[] | { bids: string; task: string } | null;

/**
 * A study: the group question. Each simulated subject gets a run (cycling through the given runs),
 * its own random block design, the group's planted activations each displaced by a random
 * misregistration, and its own amplitude around the group's; each is fitted at the first level, and
 * the subjects' effect estimates go into a one-sample t-test at the group level, scored against the
 * group's activations.
 */
export interface StudySpec {
  /** Simulated subjects (at least 3; 5 for random-field rules; 12 or more for a steady group map). */
  subjects: number;
  /** The study's runs (see {@link StudyRuns}). __Default value:__ null */
  runs: StudyRuns;
  /**
   * SD (mm, per axis) of each subject's random displacement of each planted activation: the residual
   * misalignment after spatial normalisation. Vary it as "study.misregistrationMm". __Default value:__ 0
   */
  misregistrationMm: number;
  /** SD of a subject's amplitude as a fraction of the group amplitude (0.3: 30 %). __Default value:__ 0.3 */
  amplitudeSpread: number;
  /** Each subject's random block design (blocks of onSec, rests drawn from offMinSec..offMaxSec). __Default value:__ 20 s on, 10-40 s off */
  design: { onSec: number; offMinSec: number; offMaxSec: number };
}

/** A whole sweep. */
export interface SweepSpec {
  /** Format version of this object. */
  version: 1;
  /** Ordered preprocessing steps with their fixed parameters. */
  recipe: RecipeStep[];
  /** Grid: "<step>.<param>" (or "model.<option>") -> candidate values; the sweep runs every combination. */
  vary: Record<string, Array<number | string | boolean | null>>;
  /** What to plant. */
  plant: PlantSpec;
  /** How planted activations follow the acquisition (see {@link AcquisitionSpec}). */
  acquisition: AcquisitionSpec;
  /** Repeated plantings (new positions, same sizes) per setting. */
  repeats: number;
  /** The false-alarm control used to call detections. */
  threshold: ThresholdRule;
  /** Model fitted in every cell. */
  model: ModelOptions;
  /** Task timing. __Default value:__ { kind: 'run' } */
  events: EventsRule;
  /** Seed of every random choice (blob positions); the same seed gives the same scorecard. */
  seed: number;
  /** Worker threads. __Default value:__ 2 */
  workers: number;
  /** A study (group-level question); absent: the single-run question. */
  study?: StudySpec;
}

const value = z.union([z.number().finite(), z.string(), z.boolean(), z.null()]);

/** zod schema of a sweep spec (fields with defaults may be omitted). */
export const sweepSpecSchema = z.object({
  version: z.literal(1).default(1),
  recipe: z.array(z.object({ step: z.string().min(1), params: z.record(z.unknown()).default({}) }).strict()).min(1),
  vary: z.record(z.array(value).min(1)).default({}),
  plant: z.object({
    shape: z.enum(['gaussian', 'sphere']).default('gaussian'),
    sizesFwhmMm: z.array(z.number().positive().max(100)).min(1),
    amplitudesPct: z.array(z.number().nonnegative().max(100)).min(1),
    count: z.number().int().nonnegative().max(1000),
    marginMm: z.number().nonnegative().nullable().default(null),
    separation: z.number().nonnegative().default(2),
  }).strict(),
  repeats: z.number().int().min(1).max(100000),
  threshold: z.object({
    kind: z.enum(['fwe-rft', 'fwe-calibrated', 'fdr', 'uncorrected', 'bonferroni', 'cluster']),
    alpha: z.number().gt(0).lt(1).default(0.05),
    q: z.number().gt(0).lt(1).default(0.05),
    clusterFormingP: z.number().gt(0).lt(1).default(0.001),
    nullDesigns: z.number().int().nonnegative().max(100000).nullable().default(null),
  }).strict(),
  model: z.object({
    ar1: z.boolean().default(true),
    ar1SmoothFwhmMm: z.number().nonnegative().max(100).default(DEFAULT_AR1_SMOOTH_FWHM_MM),
    highpassCutoffSec: z.number().positive().nullable().default(128),
    trialType: z.string().nullable().default(null),
    censorVolumes: z.array(z.number().int().nonnegative()).default([]),
    motionRegressors: z.union([z.literal(0), z.literal(6), z.literal(12), z.literal(24)]).optional(),
    censorFdMm: z.number().positive().max(100).nullable().optional(),
    censorFdBefore: z.number().int().min(0).max(10).optional(),
    censorFdAfter: z.number().int().min(0).max(10).optional(),
  }).strict().default({}),
  acquisition: z.object({
    sliceTiming: z.enum(['sidecar', 'none']).default('sidecar'),
  }).strict().default({}),
  events: z.discriminatedUnion('kind', [
    z.object({ kind: z.literal('run') }).strict(),
    z.object({ kind: z.literal('random-blocks'), onSec: z.number().positive(), offMinSec: z.number().nonnegative(), offMaxSec: z.number().positive(), trialType: z.string().min(1).default('null-task') }).strict(),
  ]).default({ kind: 'run' }),
  seed: z.number().int().nonnegative().lt(2 ** 32),
  workers: z.number().int().min(1).max(256).default(2),
  study: z.object({
    subjects: z.number().int().positive().max(10000),
    runs: z.union([z.array(z.string().min(1)).min(1), z.object({ bids: z.string().min(1), task: z.string().min(1) }).strict()]).nullable().default(null),
    misregistrationMm: z.number().nonnegative().max(1000).default(0),
    amplitudeSpread: z.number().nonnegative().max(10).default(0.3),
    design: z.object({ onSec: z.number().positive(), offMinSec: z.number().nonnegative(), offMaxSec: z.number().positive() }).strict().default({ onSec: 20, offMinSec: 10, offMaxSec: 40 }),
  }).strict().optional(),
}).strict();

/** The spec as written by a user: fields with defaults may be left out. */
export type SweepSpecInput = z.input<typeof sweepSpecSchema>;

/**
 * Validate a spec's shape and fill in defaults (step names and parameters are checked separately
 * by `checkSpecSteps`, which needs the step registry).
 * @param input - an object, e.g. parsed JSON or YAML
 * @returns the complete spec
 * @throws BoldsweepError SPEC_INVALID listing every offending field
 * @example const spec = parseSweepSpecShape(JSON.parse(text))
 */
export function parseSweepSpecShape(input: unknown): SweepSpec {
  const r = sweepSpecSchema.safeParse(input);
  if (!r.success) {
    const fields = r.error.issues.map((i) => `${i.path.join('.') || '(top level)'}: ${i.message}`);
    fail('SPEC_INVALID', `the sweep spec has ${fields.length} problem(s): ${fields.join('; ')}`, { details: { fields } });
  }
  const spec = r.data as SweepSpec;
  if (spec.events.kind === 'random-blocks' && spec.events.offMaxSec < spec.events.offMinSec) fail('SPEC_INVALID', `events.offMaxSec (${spec.events.offMaxSec} s) must be at least events.offMinSec (${spec.events.offMinSec} s)`, { details: { fields: ['events.offMaxSec'] } });
  const k = spec.threshold.nullDesigns;
  if (k === 0) fail('NULL_DESIGNS_INVALID', 'threshold.nullDesigns is 0: no null design could calibrate a threshold or measure a false-alarm rate', { details: { fields: ['threshold.nullDesigns'] } });
  if (spec.threshold.kind === 'fwe-calibrated' && nullDesignCount(spec.threshold) < minimumNullDesigns(spec.threshold.alpha)) {
    fail('NULL_DESIGNS_INVALID', `threshold.nullDesigns is ${k}, but a calibrated threshold at alpha ${spec.threshold.alpha} needs at least ${minimumNullDesigns(spec.threshold.alpha)}`, { details: { fields: ['threshold.nullDesigns'] } });
  }
  if (spec.study) checkStudySpec(spec);
  else if ('study.misregistrationMm' in spec.vary) fail('SPEC_INVALID', 'vary key "study.misregistrationMm" needs a study section (study.subjects at least)', { details: { fields: ['vary.study.misregistrationMm'] } });
  for (const [key, values] of Object.entries(spec.vary)) {
    if (!/^[A-Za-z][\w-]*\.[A-Za-z]\w*$/.test(key)) fail('SPEC_INVALID', `vary key "${key}" must look like "<step>.<parameter>", e.g. "smooth.fwhmMm"`, { details: { fields: [`vary.${key}`] } });
    const seen = new Set(values.map((v) => JSON.stringify(v)));
    if (seen.size !== values.length) fail('SPEC_INVALID', `vary.${key} lists a value twice`, { details: { fields: [`vary.${key}`] } });
  }
  return spec;
}

/** What a study adds to a spec's checks: enough subjects, a rule that applies to a group map, sane levels. */
function checkStudySpec(spec: SweepSpec): void {
  const study = spec.study!;
  if (study.subjects < 3) fail('TOO_FEW_SUBJECTS', `study.subjects is ${study.subjects}: a group-level test needs at least 3`, { details: { fields: ['study.subjects'] } });
  if ((spec.threshold.kind === 'fwe-rft' || spec.threshold.kind === 'cluster') && study.subjects < 5) fail('TOO_FEW_SUBJECTS', `study.subjects is ${study.subjects}: the ${spec.threshold.kind} rule needs at least 5 subjects (random-field thresholds for t maps need more than 3 degrees of freedom)`, { details: { fields: ['study.subjects'] } });
  if (spec.threshold.kind === 'fwe-calibrated' || spec.threshold.nullDesigns !== null) fail('STUDY_RULE_UNSUPPORTED', `a study's threshold is ${spec.threshold.kind}${spec.threshold.nullDesigns !== null ? ` with ${spec.threshold.nullDesigns} null designs` : ''}`, { details: { fields: ['threshold'] } });
  if (spec.plant.count > 0 && spec.plant.sizesFwhmMm.length * spec.plant.amplitudesPct.length < 1) fail('SPEC_INVALID', 'a study needs a planted size and amplitude');
  if (study.design.offMaxSec < study.design.offMinSec) fail('SPEC_INVALID', `study.design.offMaxSec (${study.design.offMaxSec} s) must be at least study.design.offMinSec (${study.design.offMinSec} s)`, { details: { fields: ['study.design.offMaxSec'] } });
  for (const key of Object.keys(spec.vary)) {
    if (key.startsWith('study.') && key !== 'study.misregistrationMm') fail('SPEC_INVALID', `vary key "${key}": of the study only misregistrationMm can be varied`, { details: { fields: [`vary.${key}`] } });
  }
  const levels = spec.vary['study.misregistrationMm'];
  if (levels && levels.some((v) => typeof v !== 'number' || !(v >= 0) || !Number.isFinite(v))) fail('SPEC_INVALID', 'vary.study.misregistrationMm must list finite numbers >= 0 (mm)', { details: { fields: ['vary.study.misregistrationMm'] } });
}

/**
 * The misregistration levels of a study: the varied values, else the study's one value.
 * @param spec - a validated spec with a study
 * @returns SDs in mm, in the order written
 * @example studyLevels(spec) // [0, 3, 6]
 */
export function studyLevels(spec: SweepSpec): number[] {
  const varied = spec.vary['study.misregistrationMm'];
  return varied ? varied.map(Number) : [spec.study?.misregistrationMm ?? 0];
}
