import { createHash } from 'node:crypto';
import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { createWorkerPool } from '../core/worker-pool.js';
import type { BoldEvent, Sidecar } from '../io/run-types.js';
import { brainMaskFromMean } from '../look/brain-mask.js';
import { meanImage } from '../look/mean-image.js';
import type { StepNote } from '../steps/step-types.js';
import { stepModules } from '../steps/registry.js';
import { calibratedCriticalValue } from '../model/threshold-calibrated.js';
import { childSeed } from '../core/child-seed.js';
import { NULL_DESIGN, nullDesignCount } from './spec.js';
import { randomBlockEvents } from './random-block-events.js';
import { collectGarbage } from './collect-garbage.js';
import { FIRST_LEVEL_METRICS, SCORECARD_METRICS } from './cell-metrics.js';
import { DEFAULT_FPR_GRID, type CurveTable } from '../score/curve-table.js';
import { CACHE_FORMAT, planSweep, type CellPlan, type SweepPlan } from './plan.js';
import type { SweepProgress } from './progress.js';
import type { Scorecard, ScorecardRow } from './scorecard.js';
import { parseShard, shardCells, type Shard } from './shard.js';
import { sharedBytes } from './shared-volume.js';
import { claimOutputFolder } from '../io/output-folder.js';
import { acquisitionModel } from '../acquire/acquisition-model.js';
import { checkPhaseEncodePair, type PhaseEncodePair } from '../acquire/phase-encode-pair.js';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import type { Vec3 } from '../core/affine.js';
import { parseSweepSpec } from './parse-sweep-spec.js';
import type { SweepSpec, SweepSpecInput } from './spec.js';
import { stableHash } from './stable-hash.js';
import { readCachedCell, readCachedEstimate, readCachedNull, readCachedTsnr, removeGroupStage, writeCachedNull } from './stage-cache.js';
import { releaseWorkBuffer } from './work-buffer.js';
import { releaseVoxelSumsKernels } from '../look/voxel-sums-wasm.js';
import { studyDesignCorrelation, type StudyDesignCorrelation } from './study-design-correlation.js';
import { studyLevels } from './spec.js';
import { studyDesignSeed } from './study-design-seed.js';

/**
 * The cell pipeline, loaded only when tasks run in this thread: with worker threads the main thread
 * never runs a cell, so it does not hold the pipeline's code (statistics and random generators, about
 * 10 MB resident) while the sweep runs.
 */
const cellPipeline = () => import('./cell-pipeline.js');
import type { CellResult, EstimateResult, EstimateTask, NullResult, NullTask, SweepContext, SweepJob, SweepTask, TsnrResult, TsnrTask } from './sweep-task.js';

/*
 * A sweep, phase by phase:
 *   1. validate the spec (shape, step names, parameters)
 *   2. masks and hashes of the inputs (run voxels, masks, events)
 *   3. plan: groups (plant condition x repeat) and cells (group x setting); keep this shard's cells;
 *      first what the recipe's steps estimate from the unplanted run (once per setting of the steps
 *      up to each estimating step, cached), whose hashes enter the stage and cell keys
 *   4. take finished cells from the cache
 *   5. tasks: the remaining cells of each group (split when there are fewer groups than workers)
 *   6. run tasks on worker threads (or in this thread for workers = 1); each worker plants, runs the
 *      shared steps once per task, then each setting's steps, the model and the scoring, and writes
 *      every finished cell to the cache
 *   7. assemble the scorecard in plan order (the same bytes for any number of workers or shards)
 */

/** The run a sweep works on: a Run from openRun fits. */
export interface SweepRunInput {
  volume: Volume;
  events: BoldEvent[] | null;
  sidecar: Sidecar | null;
}

/** Options of {@link runSweep}. */
export interface SweepOptions {
  /** Folder for the stage cache (resume after interruption, reuse across runs); null keeps nothing. __Default value:__ null */
  cacheDir?: string | null;
  /** Worker threads. __Default value:__ the spec's `workers` */
  workers?: number;
  /**
   * Run the cells in this thread instead of worker threads (for debugging and profiling). Steps
   * that parallelise themselves (smoothing) then start their own threads. __Default value:__ false
   */
  inThisThread?: boolean;
  /** Run only this shard, "i/N" or { index, count }. __Default value:__ everything */
  shard?: Shard | string | null;
  /** Brain mask, one byte per voxel (1 = in). __Default value:__ Otsu mask of the mean image (look module) */
  brainMask?: Uint8Array;
  /** Where blobs may be centred (1 = allowed), e.g. grey matter. __Default value:__ the brain mask */
  placementMask?: Uint8Array;
  /**
   * Voxels where the run already responds to the task (known activation): no blob is placed there
   * and they are left out of scoring, so they count neither as hits nor as false alarms. They stay
   * in the model and in the threshold's search region. __Default value:__ none
   */
  excludeMask?: Uint8Array;
  /**
   * The head's position at each volume of the run (x/y/z shift mm, x/y/z rotation degrees, relative
   * to the reference position), so planted activations move with the head.
   * __Default value:__ none (the head stays in its reference position)
   */
  motionTable?: MotionRow[] | null;
  /** World point (mm) the motion table's rotations turn about. __Default value:__ the grid's centre */
  rotationCentreMm?: Vec3 | null;
  /**
   * Without a motion table: estimate the run's motion once (PLANTING_MOTION_SETTINGS: rigid, least
   * squares, to the middle volume; cached) and plant with its poses, and give the model the same table
   * for its motion regressors and censoring by framewise displacement. Ignored when `motionTable` is
   * given. __Default value:__ true when the spec's model uses the motion table (model.motionRegressors,
   * model.censorFdMm), else false (the head stays in its reference position)
   */
  estimateMotion?: boolean;
  /**
   * First volume the motion estimate uses; earlier ones take its pose (volumes before steady state
   * are brighter than the rest, which a registration can take for movement). __Default value:__ the
   * fewest initial volumes any setting drops (fewestDropped)
   */
  motionFromVolume?: number;
  /**
   * B0 field map in Hz on the run's grid (head in its reference position), so planted activations are
   * displaced along phase encode as the run's signal is (needs the sidecar's PhaseEncodingDirection
   * and TotalReadoutTime or EffectiveEchoSpacing). __Default value:__ none
   */
  fieldMapHz?: Float32Array | null;
  /**
   * Images of the head with opposite phase-encode directions on the run's grid, for the `unwarp`
   * step's method reversed-pe (they do not change planting). __Default value:__ none
   */
  phaseEncodePair?: PhaseEncodePair | null;
  /** Called as cells finish. */
  onProgress?: (p: SweepProgress) => void;
  /** Keep group stages on disk after their cells are done. __Default value:__ false */
  keepStages?: boolean;
  /**
   * A study's runs beyond `run` (same grid), for a spec with a study section: subject s plants into
   * run s mod R of [run, ...studyRuns] (openStudyRuns opens a list of files or a BIDS folder).
   * __Default value:__ none (every subject uses `run`)
   */
  studyRuns?: SweepRunInput[];
  /**
   * Reuse each planting (and the steps before the varied one) across settings. false recomputes them
   * for every cell: only useful to measure what reuse saves. __Default value:__ true
   */
  reuseStages?: boolean;
}

/** How a sweep ran. */
export interface SweepStats {
  cellsInPlan: number;
  cellsRun: number;
  cellsComputed: number;
  cellsFromCache: number;
  /** Estimates computed (not read from the cache) from the unplanted run. */
  estimatesComputed: number;
  tasks: number;
  workers: number;
  wallSeconds: number;
}

/** Everything a sweep produced. */
export interface SweepResult {
  spec: SweepSpec;
  plan: Pick<SweepPlan, 'settings' | 'plants' | 'splitAt' | 'sweepKey'>;
  scorecard: Scorecard;
  curves: CurveTable;
  /** Step notes of one cell per setting (the first repeat run), in setting order. */
  notes: Array<{ settingIndex: number; notes: StepNote[] }>;
  inputs: { runHash: string; contextHash: string };
  shard: Shard | null;
  stats: SweepStats;
  /** sqrt(p' M p) of the planted time course against the model's other regressors (for the theory's prediction); null when unknown. */
  designNorm?: number | null;
  /** Per setting of this shard: the null designs' outcome (absent when the rule fitted none). */
  nullCalibration?: NullCalibration[];
  /** Where the motion table planting and the model used came from (absent when the sweep had none). */
  motion?: { source: 'given' | 'estimated'; method: string; seconds: number; fromCache: boolean; table: MotionRow[] };
  /** A study's facts (absent for a single-run sweep). */
  study?: StudyFacts;
}

/** What a study sweep reports about its subjects besides the scorecard. */
export interface StudyFacts {
  subjects: number;
  /** Runs the subjects cycle through. */
  runs: number;
  /** Misregistration SDs (mm) of the groups. */
  levelsMm: number[];
  /** Correlation of the noise projections of subjects who share a run (all repeats of the first plant condition). */
  designCorrelation: StudyDesignCorrelation;
}

/**
 * The family-wise false-alarm rate of a setting measured on K null designs (random blocks, nothing
 * planted) fitted to the unplanted run after the setting's recipe.
 */
export interface NullCalibration {
  settingIndex: number;
  /** K. */
  designs: number;
  /** The nominal family-wise rate (the spec's alpha). */
  alpha: number;
  /** The threshold 'fwe-calibrated' uses (the order statistic of the maxima); null for other rules. */
  calibratedThreshold: number | null;
  /** Designs whose maximum reached the calibrated threshold (at most alpha x (K + 1) by construction). */
  calibratedExceed: number | null;
  /** The lesser of the random-field and Bonferroni thresholds (first design's smoothness). */
  rftBonferroniThreshold: number;
  /** Designs whose maximum reached it: the measured family-wise rate of 'fwe-rft' is this / K. */
  rftBonferroniExceed: number;
  /** Residual smoothness of the first design, geometric mean FWHM (mm). */
  smoothnessFwhmMm: number;
  /** Maximum t of each design. */
  maxima: number[];
}

/** A copy of a float array in shared memory (read by every worker thread). */
function sharedFloats(a: Float32Array): Float32Array {
  const out = new Float32Array(new SharedArrayBuffer(a.byteLength));
  out.set(a);
  return out;
}

/** mask AND NOT exclude (a copy), or the mask itself when nothing is excluded. */
function without(mask: Uint8Array, exclude: Uint8Array | null): Uint8Array {
  if (!exclude) return mask;
  const out = new Uint8Array(mask.length);
  for (let v = 0; v < mask.length; v++) out[v] = mask[v] && !exclude[v] ? 1 : 0;
  return out;
}

/**
 * SHA-256 of a run's voxels and geometry: the identity of the input in cache keys and records.
 * @param v - the run
 * @returns hex digest
 * @example volumeHash(run.volume)
 */
export function volumeHash(v: Volume): string {
  const h = createHash('sha256');
  h.update(JSON.stringify({ dims: v.dims, spacingMm: v.spacingMm, trSec: v.trSec, affine: Array.from(v.affine) }));
  // a view of a SharedArrayBuffer cannot be passed to update() directly: copy 1 MiB at a time into
  // one small buffer (slices of many MB each left tens of MB of freed memory in the process)
  const bytes = new Uint8Array(v.data.buffer, v.data.byteOffset, v.data.byteLength);
  const chunk = Buffer.alloc(Math.min(bytes.byteLength, 1 << 20));
  for (let o = 0; o < bytes.byteLength; o += chunk.byteLength) {
    const part = bytes.subarray(o, Math.min(bytes.byteLength, o + chunk.byteLength));
    chunk.set(part);
    h.update(chunk.subarray(0, part.byteLength));
  }
  return h.digest('hex');
}

/**
 * Run a sweep on one run: every setting of the spec's grid, on every planted condition, repeated
 * with new blob positions, each modelled, thresholded and scored against the planted truth.
 * @param run - the run (volume, events, sidecar); its data is never modified
 * @param specInput - the sweep spec (validated here)
 * @param options - cache folder, workers, shard, masks, progress callback
 * @returns the scorecard, curves, step notes and statistics of the run
 * @throws BoldsweepError SPEC_INVALID / UNKNOWN_STEP / UNKNOWN_PARAMETER for a bad spec; EVENTS_INVALID
 *   when the run has no events; GRID_MISMATCH for masks of another size; others from the steps and model
 * @example
 * const result = await runSweep(run, defaultSmoothingSpec(), { cacheDir: 'out/cache', onProgress: lineProgress(console.log) })
 * console.log(scorecardToTsv(result.scorecard))
 */
export async function runSweep(run: SweepRunInput, specInput: SweepSpecInput | SweepSpec, options: SweepOptions = {}): Promise<SweepResult> {
  const t0 = performance.now();
  // whatever the caller dropped (say the run before it was moved to shared memory) goes now, not
  // during the sweep, so it does not add to the peak
  collectGarbage();
  // 1. spec
  const spec = parseSweepSpec(specInput);
  const workers = options.workers ?? spec.workers;
  if (!Number.isInteger(workers) || workers < 1) fail('INVALID_ARGUMENT', `workers must be a positive integer, got ${workers}`);
  const volume = run.volume;
  if (volume.dims[3] < 2) fail('NOT_4D', `a sweep needs a 4D run, got ${volume.dims[3]} volume`);
  if (!(volume.trSec > 0)) fail('TR_MISSING', 'the run has no repetition time');
  const events = run.events ?? [];
  if (!spec.study && spec.events.kind === 'run' && events.length === 0) fail('EVENTS_INVALID', 'a sweep needs the run\'s events (task timing) to plant activations and build the model; none were given (or set the spec\'s events to a random block design)');

  // 2. masks and hashes
  const n = voxelsPerVolume(volume);
  const studyRuns = spec.study ? checkStudyRuns(volume, options.studyRuns ?? [], options) : [];
  // a study's brain mask: where every run has brain (the voxels a group analysis keeps)
  const brainMask = options.brainMask ?? [volume, ...studyRuns.map((r) => r.volume)].map((v) => brainMaskFromMean(meanImage(v), v.dims.slice(0, 3)).mask)
    .reduce((a, b) => { for (let v = 0; v < a.length; v++) a[v] = a[v] && b[v] ? 1 : 0; return a; });
  if (spec.study) checkMisregistration(studyLevels(spec), brainMask, volume);
  if (brainMask.length !== n) fail('GRID_MISMATCH', `brain mask has ${brainMask.length} voxels, the run has ${n} per volume`);
  const exclude = options.excludeMask ?? null;
  if (exclude && exclude.length !== n) fail('GRID_MISMATCH', `exclusion mask has ${exclude.length} voxels, the run has ${n} per volume`);
  const placementMask = without(options.placementMask ?? brainMask, exclude);
  if (placementMask.length !== n) fail('GRID_MISMATCH', `placement mask has ${placementMask.length} voxels, the run has ${n} per volume`);
  const scoreMask = without(brainMask, exclude);
  const runHash = studyRuns.length ? stableHash({ runs: [volume, ...studyRuns.map((r) => r.volume)].map(volumeHash) }) : volumeHash(volume);
  const sha = (a: Uint8Array) => createHash('sha256').update(a).digest('hex');
  const fieldMapHz = options.fieldMapHz ?? null;
  if (fieldMapHz && fieldMapHz.length !== n) fail('GRID_MISMATCH', `field map has ${fieldMapHz.length} voxels, the run has ${n} per volume`);
  let motionTable = options.motionTable ?? null;
  let rotationCentreMm = options.rotationCentreMm ?? null;
  let motionInfo: SweepResult['motion'] = motionTable ? { source: 'given', method: 'given', seconds: 0, fromCache: false, table: motionTable } : undefined;
  if (!motionTable && (options.estimateMotion ?? modelNeedsMotion(spec))) {
    // estimated once on the unplanted run (cached): the poses planting follows, and the model's table
    const { plantingMotion } = await import('./planting-motion.js');
    if (options.cacheDir) await claimOutputFolder(options.cacheDir, { force: true, optionName: 'cacheDir' });
    const m = await plantingMotion(volume, brainMask, { runHash, maskHash: sha(brainMask) }, options.cacheDir ?? null, options.motionFromVolume ?? fewestDropped(spec));
    motionTable = m.table;
    rotationCentreMm = m.centreMm;
    motionInfo = { source: 'estimated', method: m.method, seconds: m.seconds, fromCache: m.fromCache, table: m.table };
  }
  // the model is built once here so bad input (a table of another length, a missing readout time)
  // stops the sweep before any work; workers build the same model again from the same inputs
  acquisitionModel({ volume, sidecar: run.sidecar }, { motionTable, fieldMapHz, ...(rotationCentreMm ? { rotationCentreMm } : {}), sliceTimesSec: spec.acquisition.sliceTiming === 'sidecar' ? 'sidecar' : null });
  if (!motionTable && modelNeedsMotion(spec)) fail('MOTION_TABLE_MISSING', 'the spec\'s model asks for motion regressors or censoring by framewise displacement (model.motionRegressors, model.censorFdMm), but the sweep has no motion table');
  const acquisitionKey = motionTable || fieldMapHz ? { motion: motionTable, centre: rotationCentreMm, field: fieldMapHz ? sha(new Uint8Array(fieldMapHz.buffer, fieldMapHz.byteOffset, fieldMapHz.byteLength)) : null } : null;
  const pair = options.phaseEncodePair ?? null;
  if (pair) checkPhaseEncodePair(pair, n);
  const floatsSha = (a: Float32Array) => sha(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
  const pairKey = pair ? { a: floatsSha(pair.imageA), b: floatsSha(pair.imageB), directions: [pair.directionA, pair.directionB], readout: pair.totalReadoutTimeSec } : null;
  const contextHash = stableHash({ brain: sha(brainMask), placement: sha(placementMask), score: sha(scoreMask), events, ...(acquisitionKey ? { acquisition: acquisitionKey } : {}), ...(pairKey ? { phaseEncodePair: pairKey } : {}) });

  // 3. estimates, plan and shard
  // worker threads import the modules that register the recipe's user steps; a user step registered
  // without one cannot run there (STEP_MODULE_MISSING, checked before any work)
  const modules = options.inThisThread ? [] : stepModules(spec.recipe.map((r) => r.step));
  const inputs = { runHash, contextHash };
  const estimates: Record<string, unknown> = {};
  const estimateHashes: Record<string, string> = {};
  const cacheDir = options.cacheDir ?? null;
  // the cache folder is boldsweep's own (it carries the output marker, so an output folder holding it
  // can still be claimed); it only ever adds or replaces its own entries
  if (cacheDir) await claimOutputFolder(cacheDir, { force: true, optionName: 'cacheDir' });
  // masks go to worker threads in shared memory (made once, shared by every task)
  const masks = options.inThisThread ? { brainMask, placementMask, scoreMask } : { brainMask: sharedBytes(brainMask), placementMask: sharedBytes(placementMask), scoreMask: sharedBytes(scoreMask) };
  const sharedField = fieldMapHz && !options.inThisThread ? sharedFloats(fieldMapHz) : fieldMapHz;
  // a study's other runs go to worker threads in shared memory (copied there unless they already are)
  const sharedStudyRuns = studyRuns.map((r) => {
    const v = r.volume;
    const data = options.inThisThread || v.data.buffer instanceof SharedArrayBuffer ? v.data : sharedFloats(v.data);
    return { run: { dims: [...v.dims] as SweepContext['run']['dims'], spacingMm: [...v.spacingMm] as SweepContext['run']['spacingMm'], trSec: v.trSec, affine: Array.from(v.affine), data }, sidecar: r.sidecar };
  });
  const baseContext = (stageMode: SweepContext['stageMode'], progress: Int32Array | null): SweepContext => ({
    run: { dims: [...volume.dims], spacingMm: [...volume.spacingMm], trSec: volume.trSec, affine: Array.from(volume.affine), data: volume.data },
    ...masks,
    acquisition: { motionTable, rotationCentreMm, fieldMapHz: sharedField, sliceTiming: spec.acquisition.sliceTiming, ...(pair ? { phaseEncodePair: pair } : {}) },
    events, sidecar: run.sidecar, threshold: spec.threshold, cacheDir, stageMode, progress, stepModules: modules, estimates,
    ...(sharedStudyRuns.length ? { studyRuns: sharedStudyRuns } : {}),
  });
  const estimatePlans = planSweep(spec, inputs).estimates;
  let estimatesComputed = 0;
  for (const at of [...new Set(estimatePlans.map((e) => e.at))]) {
    // one recipe position at a time: a later estimate runs the earlier estimating steps with theirs
    const todoNow: EstimateTask[] = [];
    for (const e of estimatePlans.filter((x) => x.at === at)) {
      const cached = cacheDir ? readCachedEstimate(cacheDir, e.key) : null;
      if (cached) { estimates[e.key] = cached.value; estimateHashes[e.key] = cached.hash; continue; }
      todoNow.push({ kind: 'estimate', index: todoNow.length, key: e.key, steps: e.steps, before: e.before, context: baseContext('none', null) });
    }
    const keepEstimate = (r: EstimateResult) => { estimates[r.key] = r.value; estimateHashes[r.key] = r.hash; estimatesComputed++; };
    if (todoNow.length === 0) continue;
    if (options.inThisThread) {
      const { runEstimateTask } = await cellPipeline();
      for (const t of todoNow) keepEstimate(await runEstimateTask(t));
    } else {
      const pool = createWorkerPool<SweepJob, EstimateResult>(new URL('./sweep-worker.js', import.meta.url), { size: Math.min(workers, todoNow.length) });
      try {
        (await Promise.all(todoNow.map((t) => pool.run(t)))).forEach(keepEstimate);
      } finally {
        await pool.close();
      }
    }
  }
  const plan = planSweep(spec, inputs, estimateHashes);
  const shard = options.shard ? (typeof options.shard === 'string' ? parseShard(options.shard) : options.shard) : null;
  const mine = shard ? shardCells(plan, shard) : plan.cells.map((c) => c.index);

  // 4. cache
  const results = new Map<number, CellResult>();
  let fromCache = 0;
  if (cacheDir) {
    for (const i of mine) {
      const r = readCachedCell(cacheDir, plan.cells[i].key);
      if (r) { results.set(i, r); fromCache++; }
    }
  }

  // per-setting tSNR (settings of this shard only; equal recipes share one computation)
  const mySettings = new Set(mine.map((i) => plan.cells[i].settingIndex));
  const tsnrByKey = new Map<string, TsnrResult>();
  const tsnrTodo = new Map<string, (typeof plan.tsnr)[number]>();
  for (const t of plan.tsnr) {
    if (!mySettings.has(t.settingIndex) || tsnrByKey.has(t.key) || tsnrTodo.has(t.key)) continue;
    const cached = cacheDir ? readCachedTsnr(cacheDir, t.key) : null;
    if (cached) tsnrByKey.set(t.key, cached);
    else tsnrTodo.set(t.key, t);
  }

  // 5. tasks
  const todo = new Map<number, CellPlan[]>();
  for (const i of mine) {
    if (results.has(i)) continue;
    const c = plan.cells[i];
    const list = todo.get(c.group) ?? [];
    list.push(c);
    todo.set(c.group, list);
  }
  const groupsTodo = [...todo.keys()];
  const split = Math.max(1, Math.ceil((2 * workers) / Math.max(1, groupsTodo.length)));
  const taskCells: Array<{ group: number; cells: CellPlan[] }> = [];
  for (const g of groupsTodo) {
    const cells = todo.get(g)!;
    const k = Math.min(split, cells.length);
    for (let j = 0; j < k; j++) taskCells.push({ group: g, cells: cells.filter((_, m) => m % k === j) });
  }
  const splitGroups = new Set(taskCells.filter((t, i, all) => all.findIndex((u) => u.group === t.group) !== i).map((t) => t.group));
  // cells run in worker threads even for one worker: there, steps run in their calling thread and the
  // memory of one cell is released before the next (see cell-pipeline.ts)
  const useThreads = !options.inThisThread && taskCells.length + tsnrTodo.size > 0;
  const progress = new Int32Array(useThreads ? new SharedArrayBuffer(4 * Math.max(1, taskCells.length)) : new ArrayBuffer(4 * Math.max(1, taskCells.length)));
  const reuse = options.reuseStages ?? true;
  const ctxPlain = baseContext(reuse ? 'memory' : 'none', progress);
  const ctxDisk: SweepContext = { ...ctxPlain, stageMode: 'disk' };
  const tsnrTasks: TsnrTask[] = [...tsnrTodo.values()].map((t, i) => ({ kind: 'tsnr', index: taskCells.length + i, key: t.key, steps: t.steps, estimates: t.estimates, context: ctxPlain }));
  const designCount = nullDesignCount(spec.threshold);
  const designSeeds = Array.from({ length: designCount }, (_, k) => childSeed(spec.seed, 'null-design', k));
  const nullDesign = spec.events.kind === 'random-blocks' ? { onSec: spec.events.onSec, offMinSec: spec.events.offMinSec, offMaxSec: spec.events.offMaxSec, trialType: spec.events.trialType } : { ...NULL_DESIGN };
  const needsNull = designCount > 0;
  // null designs per setting of this shard (see nullDesignCount), run before the cells that may need
  // them, unless the cache has them
  const nullResults: NullResult[] = [];
  const nullKeys = new Map<number, string>();
  const nullTasks: NullTask[] = [];
  if (needsNull) {
    for (const settingIndex of [...mySettings].sort((a, b) => a - b)) {
      const model = { ...spec.model };
      for (const [k, v] of Object.entries(plan.settings[settingIndex])) if (k.startsWith('model.')) (model as Record<string, unknown>)[k.slice(6)] = v;
      const t = plan.tsnr[settingIndex];
      // the tSNR key names the setting's whole recipe on this run and context; the rest is what the null designs add
      const key = stableHash({ format: CACHE_FORMAT, stage: 'null', recipe: t.key, model, designSeeds, design: nullDesign, threshold: spec.threshold });
      nullKeys.set(settingIndex, key);
      const cached = cacheDir ? readCachedNull(cacheDir, key) : null;
      if (cached) nullResults.push(cached);
      else nullTasks.push({ kind: 'null', index: taskCells.length + tsnrTasks.length + nullTasks.length, settingIndex, steps: t.steps, estimates: t.estimates, model, designSeeds, design: nullDesign, context: ctxPlain });
    }
  }
  const jobCount = taskCells.length + tsnrTodo.size + nullTasks.length;
  const nullResultsCached = nullResults.length;
  const keepNull = async (r: NullResult): Promise<void> => {
    nullResults.push(r);
    report();
    if (cacheDir) await writeCachedNull(cacheDir, nullKeys.get(r.settingIndex)!, r);
  };
  const useNull = (): void => {
    cellsFromSec = (performance.now() - t0) / 1000;
    if (!nullResults.length) return;
    const maxima: Record<number, number[]> = {};
    for (const r of nullResults) maxima[r.settingIndex] = r.maxima;
    ctxPlain.nullMaxima = maxima;
    ctxDisk.nullMaxima = maxima;
  };
  const tasks: SweepTask[] = taskCells.map((t, i) => ({
    kind: 'cells', index: i, group: plan.groups[t.group], cells: t.cells,
    // a group stage goes to disk when other tasks (or a resumed sweep) can reuse it (cell-pipeline.ts
    // keeps a stage it can patch in memory instead)
    context: reuse && cacheDir && (splitGroups.has(t.group) || plan.splitAt > 0) ? ctxDisk : ctxPlain,
  }));

  // 6. run
  const total = mine.length;
  let computed = 0;
  // the cells' pace is measured from when they could start: after the null designs, which come first
  let cellsFromSec = 0;
  const report = () => {
    if (!options.onProgress) return;
    let done = 0;
    for (let i = 0; i < progress.length; i++) done += Atomics.load(progress, i);
    done = Math.min(done, total - fromCache);
    const elapsedSec = (performance.now() - t0) / 1000;
    const rate = done > 0 ? (elapsedSec - cellsFromSec) / done : NaN;
    const nullTotal = nullTasks.length;
    options.onProgress({
      done: done + fromCache, total, fromCache, elapsedSec, etaSec: rate * (total - fromCache - done),
      ...(nullTotal ? { nullDesigns: { done: Math.min(nullTotal, nullResults.length - nullResultsCached), total: nullTotal } } : {}),
    });
  };
  report();
  const keep = (out: CellResult[], task: SweepTask) => {
    task.cells.forEach((c, j) => results.set(c.index, out[j]));
    computed += out.length;
  };
  const groupTasksLeft = new Map<number, number>();
  for (const t of tasks) groupTasksLeft.set(t.group.index, (groupTasksLeft.get(t.group.index) ?? 0) + 1);
  const finishGroup = (t: SweepTask) => {
    const left = (groupTasksLeft.get(t.group.index) ?? 1) - 1;
    groupTasksLeft.set(t.group.index, left);
    if (left === 0 && cacheDir && !options.keepStages) removeGroupStage(cacheDir, t.group.key);
  };
  if (!useThreads) {
    const { runNullTask, runSweepTask, runTsnrTask } = await cellPipeline();
    try {
      for (const t of tsnrTasks) tsnrByKey.set(t.key, await runTsnrTask(t));
      for (const t of nullTasks) await keepNull(await runNullTask(t));
      useNull();
      for (const t of tasks) {
        keep(await runSweepTask(t, () => report()), t);
        finishGroup(t);
      }
    } finally {
      releaseWorkBuffer(); // the cells' reusable run-sized array (worker threads drop theirs when they end)
    }
  } else {
    // this thread sums over time no more while the workers run (the look, when there was one, did)
    releaseVoxelSumsKernels();
    // a sweep worker's data are typed arrays outside the JavaScript heap: a small young generation
    // (2 MB instead of V8's default) lowers its resident memory without slowing it measurably (demo
    // run, 4 plantings, 3 runs each: peak 337 MB with 4 MB, 330 MB with 2 MB, 328 MB with 1 MB; the
    // same processor time within the machine's noise)
    const pool = createWorkerPool<SweepJob, CellResult[] | TsnrResult | NullResult>(new URL('./sweep-worker.js', import.meta.url), { size: Math.min(workers, jobCount), resourceLimits: { maxYoungGenerationSizeMb: 2 } });
    const timer = setInterval(report, 250);
    try {
      // the null designs first (a calibrated threshold needs them before any cell), with the tSNR jobs
      const tsnrDone = tsnrTasks.map((t) => pool.run(t).then((out) => { tsnrByKey.set(t.key, out as TsnrResult); }));
      await Promise.all(nullTasks.map((t) => pool.run(t).then((out) => keepNull(out as NullResult))));
      useNull();
      await Promise.all([
        ...tsnrDone,
        ...tasks.map((t) => pool.run(t).then((out) => { keep(out as CellResult[], t); finishGroup(t); report(); })),
      ]);
    } finally {
      clearInterval(timer);
      await pool.close();
    }
  }
  report();

  // 7. scorecard (a study adds its first subject's single-run columns)
  const metricColumns: string[] = spec.study ? [...SCORECARD_METRICS, ...FIRST_LEVEL_METRICS] : [...SCORECARD_METRICS];
  const rows: ScorecardRow[] = [];
  const seconds: number[] = [];
  const curves: CurveTable = { fprGrid: [...DEFAULT_FPR_GRID], rows: [] };
  const notes = new Map<number, StepNote[]>();
  for (const i of [...mine].sort((a, b) => a - b)) {
    const c = plan.cells[i];
    const g = plan.groups[c.group];
    const r = results.get(i)!;
    const row: ScorecardRow = { cell: c.index, group: g.index, settingIndex: c.settingIndex };
    for (const k of Object.keys(spec.vary)) row[k] = c.setting[k];
    Object.assign(row, { plantShape: g.plant.shape, plantSizeMm: g.plant.sizeMm, plantAmplitudePct: g.plant.amplitudePct, plantCount: g.plant.count, repeat: g.repeat, plantSeed: g.plantSeed });
    for (const m of metricColumns) row[m] = r.metrics[m] ?? null;
    row.tsnrMedian = tsnrByKey.get(plan.tsnr[c.settingIndex].key)?.tsnrMedian ?? null;
    rows.push(row);
    seconds.push(r.seconds);
    if (r.tpr.length) curves.rows.push({ cell: c.index, tpr: r.tpr });
    if (!notes.has(c.settingIndex)) notes.set(c.settingIndex, r.notes);
  }
  const scorecard: Scorecard = { sweepKey: plan.sweepKey, varied: Object.keys(spec.vary), metrics: metricColumns, rows, seconds };
  // loaded only now: it brings the design and HRF code (and with it about 230 @stdlib modules), which
  // the main thread otherwise never needs while the workers run, when its resident memory counts most
  const { plantDesignNorm } = await import('./plant-design-norm.js');
  return {
    spec, plan: { settings: plan.settings, plants: plan.plants, splitAt: plan.splitAt, sweepKey: plan.sweepKey }, scorecard, curves,
    notes: [...notes.entries()].sort((a, b) => a[0] - b[0]).map(([settingIndex, ns]) => ({ settingIndex, notes: ns })),
    inputs: { runHash, contextHash }, shard,
    designNorm: spec.study ? null : plantDesignNorm(spec.events.kind === 'run' ? events : randomBlockEvents(childSeed(spec.seed, 'events', 0), volume.dims[3] * volume.trSec, spec.events), volume.dims[3], volume.trSec, spec, motionTable),
    ...(motionInfo ? { motion: motionInfo } : {}),
    ...(spec.study ? { study: studyFacts(spec, plan, 1 + studyRuns.length, volume) } : {}),
    ...(nullResults.length ? { nullCalibration: nullResults.sort((a, b) => a.settingIndex - b.settingIndex).map((r) => nullCalibration(r, spec)) } : {}),
    stats: { cellsInPlan: plan.cells.length, cellsRun: total, cellsComputed: computed, cellsFromCache: fromCache, estimatesComputed, tasks: jobCount, workers: useThreads ? Math.min(workers, jobCount) : jobCount ? 1 : 0, wallSeconds: (performance.now() - t0) / 1000 },
  };
}

/**
 * Whether any setting's model takes terms from the motion table (motion regressors or censoring by
 * framewise displacement), fixed in the spec's model or varied.
 * @param spec - a validated spec
 * @returns true when a motion table is needed
 * @example modelNeedsMotion({ ...spec, vary: { 'model.motionRegressors': [0, 24] } }) // true
 */
export function modelNeedsMotion(spec: Pick<SweepSpec, 'model' | 'vary'>): boolean {
  const uses = (key: string, v: unknown) => (key === 'motionRegressors' ? typeof v === 'number' && v > 0 : key === 'censorFdMm' ? typeof v === 'number' : false);
  if (uses('motionRegressors', spec.model.motionRegressors) || uses('censorFdMm', spec.model.censorFdMm)) return true;
  return Object.entries(spec.vary).some(([k, values]) => k.startsWith('model.') && values.some((v) => uses(k.slice(6), v)));
}

/**
 * The fewest initial volumes any setting of the spec drops (drop-initial-volumes, fixed or varied).
 * @param spec - a validated spec
 * @returns a count (0 without the step)
 * @example fewestDropped({ ...spec, vary: { 'drop-initial-volumes.count': [2, 4] } }) // 2
 */
export function fewestDropped(spec: Pick<SweepSpec, 'recipe' | 'vary'>): number {
  const step = spec.recipe.find((s) => s.step === 'drop-initial-volumes');
  if (!step) return 0;
  const counts = [Number(step.params.count ?? 0), ...(spec.vary['drop-initial-volumes.count'] ?? []).map(Number)];
  return Math.max(0, Math.min(...counts.filter(Number.isFinite)));
}

/** A null task's result as the sweep reports it: the calibrated threshold and the measured rates. */
function nullCalibration(r: NullResult, spec: SweepSpec): NullCalibration {
  const calibrated = spec.threshold.kind === 'fwe-calibrated' ? calibratedCriticalValue(r.maxima, spec.threshold.alpha).threshold : null;
  return {
    settingIndex: r.settingIndex, designs: r.maxima.length, alpha: spec.threshold.alpha,
    calibratedThreshold: calibrated, calibratedExceed: calibrated === null ? null : r.maxima.filter((m) => m >= calibrated).length,
    rftBonferroniThreshold: r.rftBonferroniThreshold, rftBonferroniExceed: r.rftBonferroniExceed, smoothnessFwhmMm: r.smoothnessFwhmMm, maxima: r.maxima,
  };
}

/**
 * A study's other runs, checked: on the first run's grid (dims, voxel size, affine) and with its TR;
 * a motion table or field map (which describe one run) is refused with several runs.
 */
function checkStudyRuns(first: Volume, others: SweepRunInput[], options: SweepOptions): SweepRunInput[] {
  others.forEach((r, i) => {
    const v = r.volume;
    const same = v.dims.length === first.dims.length && v.dims.slice(0, 3).every((d, k) => d === first.dims[k])
      && v.affine.every((a, k) => Math.abs(a - first.affine[k]) <= 1e-4 * (1 + Math.abs(first.affine[k])));
    if (!same) fail('STUDY_GRID_MISMATCH', `study run ${i + 2} has ${v.dims.slice(0, 3).join('x')} voxels of ${v.spacingMm.map((x) => x.toFixed(2)).join('x')} mm, the first run ${first.dims.slice(0, 3).join('x')} of ${first.spacingMm.map((x) => x.toFixed(2)).join('x')} mm${v.dims.slice(0, 3).every((d, k) => d === first.dims[k]) ? ' (same size, another voxel-to-world mapping)' : ''}`);
    if (Math.abs(v.trSec - first.trSec) > 1e-6 * first.trSec) fail('STUDY_GRID_MISMATCH', `study run ${i + 2} has a TR of ${v.trSec} s, the first run ${first.trSec} s: give runs of one acquisition`);
    if (v.dims[3] < 2) fail('NOT_4D', `study run ${i + 2} has ${v.dims[3]} volume`);
  });
  if (others.length && (options.motionTable || options.fieldMapHz)) fail('INVALID_ARGUMENT', 'a motion table or field map describes one run: with several study runs, leave them out (or give one run)');
  return others;
}

/**
 * Refuse misregistrations as large as the brain: twice the largest SD (most displacements) must stay
 * below half the brain's smallest extent (its mask's bounding box, mm).
 */
function checkMisregistration(levelsMm: number[], brain: Uint8Array, v: Volume): void {
  const [nx, ny] = v.dims;
  const lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < brain.length; i++) {
    if (!brain[i]) continue;
    const idx = [i % nx, Math.floor(i / nx) % ny, Math.floor(i / (nx * ny))];
    for (let k = 0; k < 3; k++) { lo[k] = Math.min(lo[k], idx[k]); hi[k] = Math.max(hi[k], idx[k]); }
  }
  const extentMm = Math.min(...[0, 1, 2].map((k) => (hi[k] - lo[k] + 1) * v.spacingMm[k]));
  const largest = Math.max(...levelsMm);
  if (!(2 * largest < extentMm / 2)) fail('MISREGISTRATION_TOO_LARGE', `a misregistration SD of ${largest} mm moves most activations by up to ${2 * largest} mm, more than half the brain's smallest extent (${extentMm.toFixed(0)} mm)`);
}

/** The facts of a study sweep: subjects, runs, levels and how alike the subjects' noise projections are. */
function studyFacts(spec: SweepSpec, plan: SweepPlan, runCount: number, volume: Volume): StudyFacts {
  const study = spec.study!;
  // every repeat of the first plant condition and level (designs do not depend on the level)
  const groups = plan.groups.filter((g) => g.plantIndex === 0 && g.study?.misregistrationMm === studyLevels(spec)[0]);
  const seeds = groups.map((g) => Array.from({ length: study.subjects }, (_, s) => studyDesignSeed(g.plantSeed, s)));
  return { subjects: study.subjects, runs: runCount, levelsMm: studyLevels(spec), designCorrelation: studyDesignCorrelation(spec, runCount, volume.dims[3], volume.trSec, seeds) };
}
