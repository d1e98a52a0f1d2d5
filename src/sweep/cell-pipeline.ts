import { makeVolume, voxelsPerVolume, type Volume } from '../core/volume.js';
import { medianOf } from '../look/median-of.js';
import { voxelTimeStats } from '../look/voxel-time-stats.js';
import { contrastMaps } from '../model/contrast.js';
import { buildDesign } from '../model/design.js';
import { fitGlmAr1 } from '../model/glm-ar1.js';
import { fitGlm } from '../model/glm-ols.js';
import { fitGlmBySliceTime } from '../model/fit-glm-by-slice-time.js';
import type { GlmFit, GlmOptions } from '../model/glm-fit.js';
import { estimateSmoothness } from '../model/smoothness.js';
import { plantActivations, type PlantedSeries, type PlantTruth } from '../plant/plant-activations.js';
import { plantTimeCourses } from '../plant/plant-time-courses.js';
import { acquisitionModel, type AcquisitionModel } from '../acquire/acquisition-model.js';
import type { StepContext, StepNote } from '../steps/step-types.js';
import type { Frame } from '../core/grid-frame.js';
import { affineSpacing, type Vec3 } from '../core/affine.js';
import type { NuisanceRegressor } from '../model/design.js';
import { getStep, parseStepParams } from '../steps/registry.js';
import { maskOnGrid } from '../resample/mask-on-grid.js';
import { truthInFrame } from '../score/truth-in-frame.js';
import { rocCurve } from '../score/roc-curve.js';
import { scoreDetection } from '../score/score-detection.js';
import { DEFAULT_FPR_GRID, tprAtFpr } from '../score/curve-table.js';
import { applyThresholdRule } from './threshold-rule.js';
import { runRecipeStep } from './recipe-step.js';
import { stableHash } from './stable-hash.js';
import { modelSampleTimeSec } from './model-sample-time.js';
import { collectGarbage } from './collect-garbage.js';
import { isMainThread } from 'node:worker_threads';
import { readGroupStage, writeCachedCell, writeCachedEstimate, writeCachedTsnr, writeGroupStage, type GroupStage } from './stage-cache.js';
import { applyStagePatch, stagePatch, type StagePatch } from './stage-patch.js';
import { sharesMemory } from './shares-memory.js';
import { adoptWorkBuffer, currentWorkBuffer, releaseWorkBuffer, workBuffer } from './work-buffer.js';
import { releaseVoxelSumsKernels } from '../look/voxel-sums-wasm.js';
import { fail } from '../core/fail.js';
import type { CellPlan, CellGroup } from './plan.js';
import type { RecipeStep } from './spec.js';
import type { CellResult, EstimateResult, EstimateTask, NullResult, NullTask, SweepContext, SweepTask, TsnrResult, TsnrTask } from './sweep-task.js';
import { shiftEvents } from '../steps/drop-initial-volumes.js';
import { thresholdRftBonferroni } from '../model/threshold-rft-bonferroni.js';
import type { BoldEvent } from '../io/run-types.js';
import { randomBlockEvents } from './random-block-events.js';
import { packVolumewise, type VolumeSource } from './pack-volumewise.js';
import { motionNuisance } from './motion-nuisance.js';
import { studySubjects } from './study-subjects.js';
import { FIRST_LEVEL_METRICS, firstLevelSource } from './cell-metrics.js';
import { groupLevelTest } from './group-level-test.js';
import { blobTruth } from '../plant/blob-truth.js';

/*
 * One task of a sweep, in a worker thread or in the main thread (same code, same bytes):
 *
 *   group stage: raw run -> plant (seeded) -> shared recipe steps     (once per task, or read from cache)
 *   per cell:    group stage -> this setting's steps -> GLM -> contrast -> smoothness
 *                -> threshold rule -> score against the planted truth -> ROC samples -> cache
 *   per setting: the run as it is -> the whole recipe -> tSNR in the brain mask   (a tsnr task)
 *
 * Memory (per thread; the run itself lives once in shared memory for all workers):
 *   - the packed path (a worker thread, when the shared steps only select volumes and each cell's own
 *     steps are volume-wise, as in the default smoothing sweep; also a tSNR task of such a recipe):
 *     no run-sized array at all. The planting is kept as its voxels' series (plantActivations'
 *     seriesOnly), each volume is rebuilt and filtered in a volume-sized scratch (packVolumewise),
 *     and only the brain mask's voxels go into the work buffer, which the model reads and writes its
 *     residuals over (GlmOptions.packed); residual smoothness is read from them (packed as well);
 *   - otherwise (the general path):
 *   - one reusable run-sized work buffer (work-buffer.ts): each cell's input is rebuilt in it, and the
 *     varied step writes its output over it (smoothing in place) and the model its residuals, so a
 *     cell allocates no run of its own; at the start of a group the planted run takes its place;
 *   - the group stage between cells: when the shared steps only select volumes of the unplanted run
 *     (dropping initial volumes), as that selection plus the planted voxels' series (stage-patch.ts,
 *     a few percent of a run; not written to the disk cache, as planting again is cheaper);
 *     otherwise as a whole run (memory mode) or on disk (disk mode, read back into the work buffer);
 *   - while the model runs: the work buffer, holding the residuals once the fit has read each voxel
 *     (a separate residuals array only when the cell's run is not the work buffer). Dropped run-sized
 *     arrays (the work buffer before planting, separate residuals after a cell) are collected at once.
 * A worker so holds at most two run-sized arrays at a time (three with a whole held stage).
 */

function sharedRunVolume(ctx: SweepContext): Volume {
  const r = ctx.run;
  return makeVolume({ dims: [...r.dims], spacingMm: [...r.spacingMm], trSec: r.trSec, affine: Float64Array.from(r.affine), data: r.data });
}

/**
 * The context the first step sees: the run's sidecar, the task events, the brain mask, the raw
 * frame, the slice acquisition times from the sidecar's SliceTiming (when it has one per slice), and
 * the sweep's field map and reversed phase-encode pair when it has them (for the unwarp step).
 */
function initialContext(ctx: SweepContext, events: BoldEvent[]): StepContext {
  const times = ctx.sidecar?.SliceTiming;
  const sliceTimesSec = times && times.length === ctx.run.dims[2] ? Float64Array.from(times) : null;
  // the field map and the reversed phase-encode pair go to the steps (unwarp) only when there are any,
  // so contexts of sweeps without them keep their bytes
  const a = ctx.acquisition;
  return {
    sidecar: ctx.sidecar, events, mask: ctx.brainMask, frame: { kind: 'raw' }, sliceTimesSec,
    ...(a.fieldMapHz ? { fieldMapHz: a.fieldMapHz } : {}), ...(a.phaseEncodePair ? { phaseEncodePair: a.phaseEncodePair } : {}),
  };
}

/** The estimate of key `key` (null key: the step estimates nothing). */
function estimateOf(ctx: SweepContext, key: string | null | undefined): unknown {
  if (key === null || key === undefined) return undefined;
  if (!(key in ctx.estimates)) fail('INVALID_ARGUMENT', `sweep estimate ${key.slice(0, 12)} was not computed before the task that needs it`);
  return ctx.estimates[key];
}

/** Brain and score masks carried onto each target grid a thread has met (key: the grid). */
const masksOnGrid = new Map<string, { brain: Uint8Array; score: Uint8Array }>();

/**
 * The brain mask and the score mask in a frame: the sweep's own for the raw and reference frames
 * (the run's grid); carried onto a target grid with maskOnGrid (trilinear, kept at >= 0.5).
 */
function masksInFrame(ctx: SweepContext, frame: Frame): { brain: Uint8Array; score: Uint8Array } {
  if (frame.kind !== 'target') return { brain: ctx.brainMask, score: ctx.scoreMask };
  const key = stableHash({ dims: frame.grid.dims, affine: frame.grid.affine, run: ctx.run.dims, runAffine: ctx.run.affine, brain: ctx.brainMask.length });
  let m = masksOnGrid.get(key);
  if (!m) {
    const from = { dims: [ctx.run.dims[0], ctx.run.dims[1], ctx.run.dims[2]] as [number, number, number], affine: Float64Array.from(ctx.run.affine) };
    m = { brain: maskOnGrid(ctx.brainMask, from, frame.grid), score: maskOnGrid(ctx.scoreMask, from, frame.grid) };
    if (masksOnGrid.size > 8) masksOnGrid.clear();
    masksOnGrid.set(key, m);
  }
  return m;
}

/**
 * The truth of a planting with nothing planted (a null cell): an empty mask, so every surviving
 * voxel is a false alarm.
 */
function emptyTruth(v: Volume, seed: number, nt: number): PlantTruth {
  const n = voxelsPerVolume(v);
  return {
    dims: [v.dims[0], v.dims[1], v.dims[2]], affine: new Float64Array(v.affine), shape: { shape: 'gaussian', fwhmMm: 1 }, sizeMm: 0,
    amplitudePct: 0, truthFraction: 0.5, seed, mask: new Uint8Array(n), profile: new Float32Array(n), timeCourse: new Float64Array(nt),
    centresMm: [], centresVoxel: [], blobs: [],
  };
}

/**
 * The acquisition model planting follows (poses from the sweep's motion table, the field map, the
 * sidecar's slice times unless the spec says 'none'), or null when it has none of them: planting then
 * takes the plain path, with the same bytes as before acquisition models existed.
 */
function sweepAcquisitionModel(ctx: SweepContext, raw: Volume): AcquisitionModel | null {
  const a = ctx.acquisition;
  const model = acquisitionModel({ volume: raw, sidecar: ctx.sidecar }, {
    motionTable: a.motionTable, fieldMapHz: a.fieldMapHz, ...(a.rotationCentreMm ? { rotationCentreMm: a.rotationCentreMm } : {}),
    sliceTimesSec: a.sliceTiming === 'sidecar' ? 'sidecar' : null,
  });
  return model.poses || model.b0 || model.sliceTimesSec ? model : null;
}

/** The task events of a group: the run's own, or this repeat's random null design. */
function groupEvents(ctx: SweepContext, group: CellGroup): BoldEvent[] {
  if (group.events.kind === 'run') return ctx.events;
  return randomBlockEvents(group.eventsSeed, ctx.run.dims[3] * ctx.run.trSec, group.events);
}

/** Trial type the planted activation follows and the contrast tests. */
function conditionOf(events: readonly BoldEvent[], group: CellGroup, trialType: string | null): string {
  if (group.events.kind === 'random-blocks') return group.events.trialType;
  if (trialType !== null) return trialType;
  const types = [...new Set(events.map((e) => e.trialType))].sort();
  if (types.length !== 1) fail('SPEC_INVALID', `the events have ${types.length} trial types (${types.join(', ')}): set model.trialType to the one to plant and test`);
  return types[0];
}

/** What a study subject plants: the group's blobs at the subject's displaced centres, at the subject's amplitude. */
interface SubjectPlant {
  centresVoxel: Vec3[];
  amplitudePct: number;
}

/**
 * A group's planting in the raw run: a planted copy of the run, or with `seriesOnly` the run itself
 * and the planted voxels' series (nothing planted: the run and no series).
 */
function plantGroup(ctx: SweepContext, group: CellGroup, trialType: string, events: BoldEvent[], subject: SubjectPlant | undefined, seriesOnly: boolean): { volume: Volume; truth: PlantTruth; plantedSeries?: PlantedSeries } {
  const raw = sharedRunVolume(ctx);
  const nt = raw.dims[3];
  if (group.plant.count === 0) return { volume: raw, truth: emptyTruth(raw, group.plantSeed, nt), ...(seriesOnly ? { plantedSeries: { voxels: new Int32Array(0), values: new Float32Array(0) } } : {}) };
  const acquisition = sweepAcquisitionModel(ctx, raw);
  const { timeCourse, sliceTimeCourses } = plantTimeCourses(events, nt, raw.trSec, { condition: trialType, sliceTimesSec: acquisition?.sliceTimesSec ?? null });
  const size = group.plant.shape === 'gaussian' ? { fwhmMm: group.plant.sizeMm } : { radiusMm: group.plant.sizeMm / 2 };
  return plantActivations(raw, {
    count: group.plant.count, shape: group.plant.shape, ...size, amplitudePct: subject?.amplitudePct ?? group.plant.amplitudePct,
    ...(subject ? { centresVoxel: subject.centresVoxel } : {}),
    timeCourse, placementMask: ctx.placementMask, seed: group.plantSeed, separation: group.plant.separation,
    ...(group.plant.marginMm === null ? {} : { marginMm: group.plant.marginMm }),
    ...(acquisition ? { acquisition, sliceTimeCourses } : {}),
    seriesOnly,
  });
}

/**
 * Plant into the raw run and run the recipe steps shared by every setting.
 * @param ctx - sweep context (shared run, masks, events)
 * @param group - which planting
 * @param trialType - condition to plant
 * @param subject - a study subject's blob centres and amplitude (else drawn centres, the group's amplitude)
 * @returns the group stage
 */
async function computeGroupStage(ctx: SweepContext, group: CellGroup, trialType: string, subject?: SubjectPlant): Promise<GroupStage> {
  const events = groupEvents(ctx, group);
  const planted = plantGroup(ctx, group, trialType, events, subject, false);
  let volume = planted.volume;
  const truth = planted.truth;
  let context = initialContext(ctx, events);
  const notes: StepNote[] = [];
  const regressors: NuisanceRegressor[] = [];
  for (let i = 0; i < group.prefix.length; i++) {
    const r = await runRecipeStep(group.prefix[i], volume, context, estimateOf(ctx, group.prefixEstimates[i]));
    volume = r.volume;
    context = r.context;
    notes.push(r.note);
    if (r.regressors) regressors.push(...r.regressors);
  }
  return { volume, truth, context, notes, regressors };
}

/**
 * A group stage as a task keeps it between cells: its geometry, context, notes and planted truth,
 * and its voxels either as a whole run or as the unplanted base plus a patch.
 */
interface HeldStage extends Omit<GroupStage, 'volume'> {
  geometry: Omit<Volume, 'data'>;
  voxels: { whole: Float32Array } | { base: Float32Array; patch: StagePatch };
}

/** A stage may hold at most this fraction of a volume's voxels in its patch (blobs cover a few percent). */
const MAX_PATCH_FRACTION = 0.25;

/** Recipe prefixes (as JSON) whose output on the unplanted run is an array of its own, so no free base exists. */
const prefixesWithoutBase = new Set<string>();

/**
 * The shared steps applied to the unplanted run, when their output is a view of the shared run (steps
 * that only select volumes): a base to patch a group stage against at no memory cost. null otherwise.
 */
async function unplantedBase(ctx: SweepContext, group: CellGroup, context: StepContext): Promise<Float32Array | null> {
  const prefix = JSON.stringify(group.prefix);
  if (prefixesWithoutBase.has(prefix)) return null;
  let volume = sharedRunVolume(ctx);
  let c = context;
  for (let i = 0; i < group.prefix.length; i++) {
    const r = await runRecipeStep(group.prefix[i], volume, c, estimateOf(ctx, group.prefixEstimates[i]));
    volume = r.volume;
    c = r.context;
  }
  if (sharesMemory(volume.data, ctx.run.data)) return volume.data;
  prefixesWithoutBase.add(prefix);
  release(); // the base the steps computed
  return null;
}

/**
 * The group stage of a task: read from the disk cache into the work buffer, or computed (plant, then
 * the shared steps) and kept as base + patch when it can be, else written to the disk cache in disk
 * mode.
 */
async function obtainStage(task: SweepTask, trialType: string, subject?: SubjectPlant): Promise<{ stage: HeldStage; how: CellResult['groupStage'] }> {
  const ctx = task.context;
  const toHeld = (s: GroupStage, voxels: HeldStage['voxels']): HeldStage => {
    const { data: _data, ...geometry } = s.volume;
    return { geometry, voxels, truth: s.truth, context: s.context, notes: s.notes, regressors: s.regressors ?? [] };
  };
  if (ctx.stageMode === 'disk' && ctx.cacheDir) {
    const cached = readGroupStage(ctx.cacheDir, task.group.key, workBuffer);
    if (cached) return { stage: toHeld(cached, { whole: cached.volume.data }), how: 'cached' };
  }
  if (!isMainThread && task.group.plant.count > 0) {
    // planting makes a copy of the run: free the work buffer first (its contents are not needed),
    // so the copy takes its place rather than sitting beside it
    releaseWorkBuffer();
    release();
  }
  const stage = await computeGroupStage(ctx, task.group, trialType, subject);
  // nothing planted and only volumes selected: the stage is the shared run itself
  if (sharesMemory(stage.volume.data, ctx.run.data)) return { stage: toHeld(stage, { whole: stage.volume.data }), how: 'computed' };
  const base = await unplantedBase(ctx, task.group, initialContext(ctx, groupEvents(ctx, task.group)));
  const patch = base ? stagePatch(stage.volume.data, base, voxelsPerVolume(stage.volume), MAX_PATCH_FRACTION) : null;
  if (base && patch) {
    // not written to the disk cache: planting again costs less than writing and syncing a run
    // (about 0.1 s against 0.25 s here). The planted run (made for this stage alone) becomes the
    // work buffer; rebuilding the stage in it then writes the values it already holds.
    if (!isMainThread) adoptWorkBuffer(stage.volume.data);
    return { stage: toHeld(stage, { base, patch }), how: 'computed' };
  }
  if (ctx.stageMode === 'disk' && ctx.cacheDir) await writeGroupStage(ctx.cacheDir, task.group.key, stage);
  return { stage: toHeld(stage, { whole: stage.volume.data }), how: 'computed' };
}

/**
 * Whether a task keeps its stage for the next cell (stage modes other than 'none'): always when it
 * costs no run of its own (a patch, or the shared run itself); a whole run only in memory mode, and
 * never the work buffer (the next cell overwrites it).
 */
function keepBetweenCells(stage: HeldStage, ctx: SweepContext): boolean {
  if (!('whole' in stage.voxels)) return true;
  const whole = stage.voxels.whole;
  if (sharesMemory(whole, ctx.run.data)) return true;
  const work = currentWorkBuffer();
  return ctx.stageMode === 'memory' && !(work !== null && sharesMemory(whole, work));
}

/** The stage's run for a cell: a whole stage as it is, a patched one rebuilt in the work buffer. */
function stageVolume(stage: HeldStage): Volume {
  const v = stage.voxels;
  if ('whole' in v) return makeVolume({ ...stage.geometry, data: v.whole });
  const n = stage.geometry.dims[0] * stage.geometry.dims[1] * stage.geometry.dims[2];
  return makeVolume({ ...stage.geometry, data: applyStagePatch(v.base, v.patch, n, workBuffer(v.base.length)) });
}

/** Whether a step's input lives on after the step: in the work buffer, or in one of `others`. */
function keptElsewhere(input: Float32Array, others: Float32Array[]): boolean {
  const work = currentWorkBuffer();
  return (work !== null && sharesMemory(work, input)) || others.some((a) => sharesMemory(a, input));
}

/**
 * Run one step with the thread's work buffer offered as its output (when the buffer is the input
 * itself or shares no memory with it, as the step context requires).
 */
async function runStepIntoWork(step: RecipeStep, volume: Volume, context: StepContext, estimate?: unknown): Promise<{ volume: Volume; context: StepContext; note: StepNote; regressors: NuisanceRegressor[] }> {
  const outputBuffer = (length: number): Float32Array => {
    const work = workBuffer(length);
    return work === volume.data || !sharesMemory(work, volume.data) ? work : new Float32Array(length);
  };
  const r = await runRecipeStep(step, volume, { ...context, outputBuffer }, estimate);
  const { outputBuffer: _given, ...next } = r.context;
  return { volume: r.volume, context: next, note: r.note, regressors: r.regressors ?? [] };
}

const finite = (x: number): number | null => (Number.isFinite(x) ? x : null);

/** Whether the scored voxels hold both truth and non-truth voxels (an ROC curve needs both). */
function hasBothClasses(truth: Uint8Array, scored: Uint8Array): boolean {
  let pos = false, neg = false;
  for (let v = 0; v < scored.length && !(pos && neg); v++) if (scored[v]) { if (truth[v]) pos = true; else neg = true; }
  return pos && neg;
}

/**
 * Collect dropped run-sized arrays now (in a worker thread). V8 frees such external memory lazily,
 * so without this a worker would keep a dead planted run or the last cell's residuals while the
 * model allocates new ones. A full collection costs 10-20 ms, so it runs only when a run-sized
 * array was dropped: once per cell when the residuals had an array of their own, and once per
 * group (the work buffer, before planting).
 */
function release(): void {
  if (!isMainThread) collectGarbage();
}

/**
 * The design of a cell's model: the events' regressors, drift, one indicator per censored volume
 * (listed, or above the framewise-displacement limit), the motion regressors, the steps' regressors.
 * Censored volumes are indexed in the run as opened; steps may only have removed initial volumes.
 */
function cellDesign(events: readonly BoldEvent[], volume: Volume, ctx: SweepContext, model: CellPlan['model'], regressors: readonly NuisanceRegressor[] = [], sliceTimesSec: Float64Array | null = null): ReturnType<typeof buildDesign> {
  const nt = volume.dims[3];
  const offset = ctx.run.dims[3] - nt;
  // motion terms from the sweep's motion table: volumes censored by framewise displacement join the
  // listed ones (one indicator each), and the motion columns follow the censoring columns
  const motion = motionNuisance(ctx.acquisition.motionTable, nt, model);
  const nuisance: NuisanceRegressor[] = [...new Set([...model.censorVolumes, ...motion.censorVolumes])].sort((a, b) => a - b).map((c) => c - offset).filter((c) => c >= 0 && c < nt)
    .map((c) => ({ name: `censor_${c + offset}`, values: Float64Array.from({ length: nt }, (_, t) => (t === c ? 1 : 0)) }));
  nuisance.push(...motion.regressors);
  nuisance.push(...regressors.map((r) => stepRegressor(r, nt)));
  // slice times aligned to one time by a step: the task regressor is sampled then (else mid-volume)
  const sampleTimeSec = modelSampleTimeSec(sliceTimesSec, volume.trSec);
  return buildDesign([...events], {
    nt, trSec: volume.trSec, ...(sampleTimeSec === null ? {} : { sampleTimeSec }),
    drift: model.highpassCutoffSec ? { kind: 'dct', cutoffSec: model.highpassCutoffSec } : { kind: 'none' },
    nuisance,
  });
}

/**
 * The GLM fit of a cell: one design for every voxel, or, when a step asked the model to sample each
 * slice's regressors at its own time (`modelAtSliceTimes`, the slice-time step's method 'model')
 * and the slices were read at different times, one design per distinct slice time
 * (fitGlmBySliceTime: voxels grouped by slice, each group fitted with its design).
 */
function cellFit(events: readonly BoldEvent[], volume: Volume, ctx: SweepContext, model: CellPlan['model'], regressors: readonly NuisanceRegressor[], context: StepContext, glmOptions: GlmOptions): GlmFit {
  const times = context.sliceTimesSec ?? null;
  // on a target grid (after resampling) voxels no longer belong to one acquired slice
  const onRunGrid = (context.frame ?? { kind: 'raw' }).kind !== 'target';
  if (context.modelAtSliceTimes && onRunGrid && times && times.length === volume.dims[2] && modelSampleTimeSec(times, volume.trSec) === null) {
    const distinct = [...new Set(times)].sort((a, b) => a - b);
    const designs = distinct.map((t) => cellDesign(events, volume, ctx, model, regressors, Float64Array.of(t)));
    const ofSlice = Array.from(times, (t) => distinct.indexOf(t));
    return fitGlmBySliceTime(volume, designs, ofSlice, { ...glmOptions, ar1: model.ar1, ar1SmoothFwhmMm: model.ar1SmoothFwhmMm });
  }
  const design = cellDesign(events, volume, ctx, model, regressors, times);
  return model.ar1 ? fitGlmAr1(volume, design, { ...glmOptions, ar1SmoothFwhmMm: model.ar1SmoothFwhmMm }) : fitGlm(volume, design, glmOptions);
}

/**
 * A cell's preprocessed run on its way to the model: the run (let go once fitted), and, on the packed
 * path, the brain mask's voxels only (`packed`, see packVolumewise), `volume` then giving the grid and
 * the number of volumes with no data of its own.
 */
interface CellRun {
  volume: Volume | null;
  packed?: Float32Array | null;
}

/**
 * The first-level model of one preprocessed run: its frame's masks, the design, the GLM (residuals
 * written over the work buffer when the run is that buffer) and the contrast maps of the tested
 * condition. The preprocessed run is let go (holder.volume = null) once the fit has read it.
 */
function fitCellModel(holder: CellRun, context: StepContext, ctx: SweepContext, cell: CellPlan, trialType: string, regressors: readonly NuisanceRegressor[], keepResiduals: boolean): { fit: ReturnType<typeof fitGlm>; maps: ReturnType<typeof contrastMaps>; brain: Uint8Array; scoreMask: Uint8Array; frame: Frame; grid: { dims: number[]; spacingMm: number[] }; residualsInWork: boolean } {
  let volume = holder.volume!;
  const packed = holder.packed ?? null;
  // the cell's frame: on a target grid the masks and the truth are carried onto it
  const frame: Frame = context.frame ?? { kind: 'raw' };
  if (frame.kind === 'target') {
    const g = frame.grid;
    if (volume.dims[0] !== g.dims[0] || volume.dims[1] !== g.dims[1] || volume.dims[2] !== g.dims[2]) {
      fail('GRID_MISMATCH', `the recipe's output is declared on a target grid [${g.dims.join('x')}] but has [${volume.dims.slice(0, 3).join('x')}] voxels: the geometric step's output frame and its output disagree`);
    }
  }
  const { brain, score: scoreMask } = masksInFrame(ctx, frame);
  const events = context.events!;
  // when the preprocessed run is this thread's work buffer (rebuilt by the next cell anyway), the
  // residuals overwrite it: no run-sized array of the cell's own
  // a packed run (the brain mask's voxels only) takes its residuals in place the same way
  const work = currentWorkBuffer();
  const residualsInWork = keepResiduals && (packed !== null || (work !== null && sharesMemory(work, volume.data) && work.length === volume.data.length));
  const glmOptions: GlmOptions = packed
    ? { mask: brain, keepResiduals, packed, residualsOut: keepResiduals ? packed : undefined }
    : { mask: brain, keepResiduals, residualsOut: residualsInWork ? volume.data : undefined };
  const fit = cellFit(events, volume, ctx, cell.model, regressors, context, glmOptions);
  // the preprocessed run is not needed any more: let it go before the residuals are used
  // voxel sizes of a target grid come from its affine (the step's spacingMm should agree)
  const grid = { dims: [volume.dims[0], volume.dims[1], volume.dims[2]], spacingMm: frame.kind === 'target' ? affineSpacing(frame.grid.affine) : volume.spacingMm };
  holder.volume = null;
  holder.packed = null;
  volume = null as unknown as Volume;
  const maps = contrastMaps(fit, { [trialType]: 1 }, { name: trialType });
  return { fit, maps, brain, scoreMask, frame, grid, residualsInWork };
}

/**
 * A cell's scorecard metrics from its score row and threshold: the row's numbers, the family-wise
 * error (any false cluster), the false discovery proportion, the centre margin, the smoothness.
 */
function cellMetrics(score: ReturnType<typeof scoreDetection>, threshold: number, fwhmMm: readonly number[], dof: number): Record<string, number | null> {
  const [fx, fy, fz] = fwhmMm;
  const metrics: Record<string, number | null> = {};
  for (const [k, v] of Object.entries(score)) if (typeof v === 'number') metrics[k] = finite(v);
  Object.assign(metrics, {
    familyWiseError: score.falseClusters > 0 ? 1 : 0,
    falseDiscoveryProportion: score.survivorVoxels > 0 ? score.falsePositiveVoxels / score.survivorVoxels : 0,
    centreMargin: finite(score.centreStatisticMean - threshold),
    threshold: finite(threshold),
    smoothnessFwhmMm: finite(Math.cbrt(fx * fy * fz)), smoothnessXMm: finite(fx), smoothnessYMm: finite(fy), smoothnessZMm: finite(fz), dof,
  });
  return metrics;
}

/**
 * Model, threshold and score one preprocessed run.
 * @returns metrics, ROC samples
 */
function modelAndScore(holder: CellRun, context: StepContext, plantedTruth: PlantTruth, ctx: SweepContext, cell: CellPlan, trialType: string, regressors: readonly NuisanceRegressor[]): { metrics: Record<string, number | null>; tpr: number[]; residualsInWork: boolean; effectPct: Float32Array; frame: Frame; grid: { dims: number[]; spacingMm: number[] } } {
  const { fit, maps, brain, scoreMask, frame, grid, residualsInWork } = fitCellModel(holder, context, ctx, cell, trialType, regressors, true);
  const truth = truthInFrame(plantedTruth, frame);
  const packedResiduals = fit.packedResiduals ?? null;
  const smooth = packedResiduals
    ? estimateSmoothness(packedResiduals, [grid.dims[0], grid.dims[1], grid.dims[2], fit.design.nt], brain, grid.spacingMm, { dof: fit.dof, packed: true })
    : estimateSmoothness(fit.residuals!.data, fit.residuals!.dims, brain, grid.spacingMm, { dof: fit.dof });
  fit.residuals = null;
  fit.packedResiduals = null;
  const thr = applyThresholdRule(maps.t.data, brain, grid.dims, ctx.threshold, { kind: 't', dof: maps.dof }, smooth.fwhmMm, grid.spacingMm, ctx.nullMaxima?.[cell.settingIndex]);
  // one ROC curve for both the scorecard's area and the curve table (it sorts every scored voxel)
  const curve = hasBothClasses(truth.mask, scoreMask) ? rocCurve(maps.t.data, truth.mask, scoreMask) : undefined;
  const score = scoreDetection({ statistic: maps.t, survivors: thr.survivors, truth, brainMask: scoreMask, effectPct: maps.percentSignalChange, threshold: thr.threshold, thresholdMethod: thr.rule, rocCurve: curve });
  const tpr = score.truthVoxels > 0 && curve ? tprAtFpr(curve.fpr, curve.tpr, DEFAULT_FPR_GRID) : [];
  return { metrics: cellMetrics(score, thr.threshold, smooth.fwhmMm, maps.dof), tpr, residualsInWork, effectPct: maps.percentSignalChange.data, frame, grid };
}

/**
 * A step's regressor for a model of `nt` volumes: regressors are per output volume of their step,
 * and the only later steps that change the number of volumes drop initial ones, so a longer
 * regressor loses its first values.
 */
function stepRegressor(r: NuisanceRegressor, nt: number): NuisanceRegressor {
  const len = r.values.length;
  if (len < nt) fail('INVALID_ARGUMENT', `step regressor '${r.name}' has ${len} values, the preprocessed run has ${nt} volumes`);
  const values = new Float64Array(nt);
  for (let t = 0; t < nt; t++) values[t] = r.values[len - nt + t];
  return { name: r.name, values };
}

/**
 * Whether a task's cells can take the packed path (in a worker thread): the shared steps only select
 * volumes, every cell's own steps are volume-wise, and the model fits one design for the whole run.
 * Such a cell never needs a run-sized array: the unplanted run is shared, the planting is kept as its
 * voxels' series, each volume is rebuilt and filtered in a volume-sized scratch, and the model reads
 * the brain mask's voxels alone.
 */
function packable(task: SweepTask): boolean {
  if (isMainThread) return false;
  if (!task.group.prefix.every((s) => getStep(s.step).kind === 'select-volumes')) return false;
  return task.cells.every((c) => c.suffix.every((s) => getStep(s.step).volumewise === true));
}

/** Brain-mask indices per mask array (a thread meets one or two masks). */
const maskIndices = new WeakMap<Uint8Array, Int32Array>();

/** Ascending indices of a mask's nonzero voxels (kept per mask). */
function maskIndex(mask: Uint8Array): Int32Array {
  let idx = maskIndices.get(mask);
  if (!idx) {
    let count = 0;
    for (let v = 0; v < mask.length; v++) if (mask[v]) count++;
    idx = new Int32Array(count);
    for (let v = 0, j = 0; v < mask.length; v++) if (mask[v]) idx[j++] = v;
    maskIndices.set(mask, idx);
  }
  return idx;
}

/**
 * Steps that only select volumes, run on the shared run: their output, when it is a whole-volume
 * view of the shared run (its first volume and count), else null.
 */
async function selectedVolumes(ctx: SweepContext, steps: readonly RecipeStep[], estimates: readonly (string | null)[], context: StepContext): Promise<{ volume: Volume; first: number; context: StepContext; notes: StepNote[]; regressors: NuisanceRegressor[] } | null> {
  let volume = sharedRunVolume(ctx);
  let c = context;
  const notes: StepNote[] = [];
  const regressors: NuisanceRegressor[] = [];
  for (let i = 0; i < steps.length; i++) {
    const r = await runRecipeStep(steps[i], volume, c, estimateOf(ctx, estimates[i]));
    volume = r.volume;
    c = r.context;
    notes.push(r.note);
    if (r.regressors) regressors.push(...r.regressors);
  }
  const run = ctx.run.data;
  const n = ctx.run.dims[0] * ctx.run.dims[1] * ctx.run.dims[2];
  const d = volume.data;
  const sameGrid = volume.dims[0] === ctx.run.dims[0] && volume.dims[1] === ctx.run.dims[1] && volume.dims[2] === ctx.run.dims[2];
  const offset = d.byteOffset - run.byteOffset;
  if (!sameGrid || d.buffer !== run.buffer || offset < 0 || offset % (4 * n) !== 0 || d.length % n !== 0) return null;
  return { volume, first: offset / (4 * n), context: c, notes, regressors };
}

/**
 * A task's group stage as the packed path keeps it: the shared steps' selection of the unplanted run
 * (a view of the shared run) and the planted voxels' series over the selected volumes. By the
 * contract of 'select-volumes' steps, the same steps select the same volumes of the planted run.
 * null when the selection is not a view of the shared run.
 */
async function packedStage(task: SweepTask, trialType: string): Promise<HeldStage | null> {
  const ctx = task.context;
  const group = task.group;
  const events = groupEvents(ctx, group);
  const selected = await selectedVolumes(ctx, group.prefix, group.prefixEstimates, initialContext(ctx, events));
  if (!selected) return null;
  const { truth, plantedSeries } = plantGroup(ctx, group, trialType, events, undefined, true);
  const { voxels, values } = plantedSeries!;
  const m = voxels.length;
  const nt = selected.volume.dims[3];
  const own = values.subarray(selected.first * m, (selected.first + nt) * m);
  const patch: StagePatch = { voxels, bits: new Int32Array(own.buffer, own.byteOffset, own.length) };
  const { data: _data, ...geometry } = selected.volume;
  return { geometry, voxels: { base: selected.volume.data, patch }, truth, context: selected.context, notes: selected.notes, regressors: selected.regressors };
}

/** Volume t of a base run with a patch's series written over it, as {@link packVolumewise} reads it. */
function patchedVolumes(geometry: Omit<Volume, 'data'>, base: Float32Array, patch: StagePatch | null): VolumeSource {
  const n = geometry.dims[0] * geometry.dims[1] * geometry.dims[2];
  return {
    geometry,
    volumeAt: (t, into) => {
      into.set(base.subarray(t * n, (t + 1) * n));
      if (!patch) return;
      // 32-bit patterns, as applyStagePatch writes them
      const bits = new Int32Array(into.buffer, into.byteOffset, n);
      const m = patch.voxels.length;
      for (let j = 0, k = t * m; j < m; j++, k++) bits[patch.voxels[j]] = patch.bits[k];
    },
  };
}

/**
 * The cells of a packable task (see packable): the stage once (again per cell when stages are not
 * reused), then per cell its volume-wise steps volume by volume into the thread's work buffer, which
 * holds the brain mask's voxels only, the model on those voxels (residuals written over them) and the
 * scoring, as runSweepTask does. null when the stage cannot be kept so (then the general path runs).
 */
async function runPackedTask(task: SweepTask, trialType: string, onCell?: (done: number) => void): Promise<CellResult[] | null> {
  const ctx = task.context;
  // a run-sized work buffer from an earlier task is not needed here
  if (currentWorkBuffer() !== null) {
    releaseWorkBuffer();
    release();
  }
  let stage = await packedStage(task, trialType);
  if (!stage) return null;
  let how: CellResult['groupStage'] = 'computed';
  const out: CellResult[] = [];
  for (const cell of task.cells) {
    const t0 = performance.now();
    if (!stage) {
      stage = (await packedStage(task, trialType))!;
      how = 'computed';
    }
    const { base, patch } = stage.voxels as { base: Float32Array; patch: StagePatch };
    const { brain } = masksInFrame(ctx, stage.context.frame ?? { kind: 'raw' });
    const index = maskIndex(brain);
    const nt = stage.geometry.dims[3];
    const packed = workBuffer(index.length * nt);
    const estimates = cell.suffixEstimates.map((k) => estimateOf(ctx, k));
    const done = await packVolumewise(patchedVolumes(stage.geometry, base, patch), cell.suffix, estimates, stage.context, index, packed);
    // volume-wise steps stay on the grid: the model's brain mask is the one the voxels were kept for
    if (masksInFrame(ctx, done.context.frame ?? { kind: 'raw' }).brain !== brain) fail('INVALID_ARGUMENT', `the volume-wise steps of cell ${cell.key.slice(0, 12)} moved the run to another frame; a volume-wise step must keep its input's frame`);
    const geometryOnly: Volume = { ...stage.geometry, data: new Float32Array(0) };
    const holder: CellRun = { volume: geometryOnly, packed };
    const { metrics, tpr } = modelAndScore(holder, done.context, stage.truth, ctx, cell, trialType, [...stage.regressors]);
    const result: CellResult = { key: cell.key, metrics, tpr, notes: [...stage.notes, ...done.notes], seconds: (performance.now() - t0) / 1000, groupStage: how };
    if (ctx.cacheDir) await writeCachedCell(ctx.cacheDir, result);
    out.push(result);
    how = 'memory';
    if (ctx.stageMode === 'none') stage = null;
    if (ctx.progress) Atomics.add(ctx.progress, task.index, 1);
    onCell?.(out.length);
  }
  return out;
}

/**
 * Run one task: the group stage once (or from the cache), then every cell of the task. Each finished
 * cell is written to the cache before the next starts, so an interrupted sweep loses at most the
 * cells in progress.
 * @param task - group, cells and shared context
 * @param onCell - called after each cell (main-thread progress); workers count in `context.progress`
 * @returns one result per cell, in the task's order
 * @example const results = await runSweepTask(task)
 */
export async function runSweepTask(task: SweepTask, onCell?: (done: number) => void): Promise<CellResult[]> {
  if (task.group.study) return runStudyTask(task, onCell);
  const ctx = task.context;
  const trialType = conditionOf(groupEvents(ctx, task.group), task.group, task.cells[0]?.model.trialType ?? null);
  if (packable(task)) {
    const packedOut = await runPackedTask(task, trialType, onCell);
    if (packedOut) return packedOut;
  }
  const out: CellResult[] = [];
  const holding: { held: HeldStage | null } = { held: null };
  for (const cell of task.cells) {
    const t0 = performance.now();
    const { volume, context, notes, regressors, truth, how } = await preprocessCell(task, cell, trialType, holding);
    const holder = { volume };
    const { metrics, tpr, residualsInWork } = modelAndScore(holder, context, truth, ctx, cell, trialType, regressors);
    const result: CellResult = { key: cell.key, metrics, tpr, notes, seconds: (performance.now() - t0) / 1000, groupStage: how };
    if (ctx.cacheDir) await writeCachedCell(ctx.cacheDir, result);
    out.push(result);
    // free this cell's residuals, when they had an array of their own, before the next cell's model
    // allocates its own (bounded peak memory)
    if (!residualsInWork) collectGarbage();
    if (ctx.progress) Atomics.add(ctx.progress, task.index, 1);
    onCell?.(out.length);
  }
  return out;
}

/**
 * One cell's preprocessed run: the task's group stage (held from the previous cell, or computed or
 * read from the cache), then this setting's steps, written into the thread's work buffer.
 * @param task - the task (its context and group; for a study subject, the subject's own)
 * @param cell - the cell
 * @param trialType - the planted condition
 * @param holding - the stage kept between the task's cells (updated)
 * @param subject - a study subject's planting
 */
async function preprocessCell(task: SweepTask, cell: CellPlan, trialType: string, holding: { held: HeldStage | null }, subject?: SubjectPlant): Promise<{ volume: Volume; context: StepContext; notes: StepNote[]; regressors: NuisanceRegressor[]; truth: PlantTruth; how: CellResult['groupStage'] }> {
  const ctx = task.context;
  let how: CellResult['groupStage'] = 'memory';
  let stage: HeldStage | null = holding.held;
  if (!stage) ({ stage, how } = await obtainStage(task, trialType, subject));
  const held = ctx.stageMode !== 'none' && keepBetweenCells(stage, ctx) ? stage : null;
  holding.held = held;
  let volume: Volume = stageVolume(stage);
  let context = stage.context;
  const notes = [...stage.notes];
  const regressors = [...stage.regressors];
  const truth = stage.truth;
  stage = null;
  for (let i = 0; i < cell.suffix.length; i++) {
    const input: Float32Array = volume.data;
    const r = await runStepIntoWork(cell.suffix[i], volume, context, estimateOf(ctx, cell.suffixEstimates[i]));
    volume = r.volume;
    context = r.context;
    notes.push(r.note);
    regressors.push(...r.regressors);
    // the step's input, when nothing else keeps it (a whole stage computed for this cell alone)
    if (!keptElsewhere(input, [ctx.run.data, volume.data, ...(held && 'whole' in held.voxels ? [held.voxels.whole] : [])])) release();
  }
  return { volume, context, notes, regressors, truth, how };
}

/** Trial type of a study subject's random block design. */
const STUDY_TRIAL_TYPE = 'study-task';

/**
 * One task of a study: for each simulated subject (its run, its random block design, the group's
 * blobs displaced by its misregistration, its amplitude), plant, run the shared steps once, then for
 * each cell of the task its setting's steps and the first-level model, keeping the subject's effect
 * estimate (percent signal change) per cell. Then per cell the group level (one-sample t across
 * subjects, threshold rule of the spec, smoothness from the group's residuals), scored against the
 * group's blobs at their undisplaced positions. Cells are cached as a single-run sweep's are.
 * @param task - the cells of one study group and the shared context
 * @param onCell - called after each cell
 * @returns one result per cell, in the task's order
 */
async function runStudyTask(task: SweepTask, onCell?: (done: number) => void): Promise<CellResult[]> {
  const ctx = task.context;
  const group = task.group;
  const study = group.study!;
  const runs = [{ run: ctx.run, sidecar: ctx.sidecar }, ...(ctx.studyRuns ?? [])];
  const grid = { dims: ctx.run.dims.slice(0, 3), affine: Float64Array.from(ctx.run.affine) };
  const { groupCentresVoxel, subjects } = studySubjects(group, grid, ctx.placementMask, runs.length);
  const effects: Float32Array[][] = task.cells.map(() => []);
  const frames: Frame[] = [];
  const grids: Array<{ dims: number[]; spacingMm: number[] }> = [];
  const notesOf: StepNote[][] = [];
  const secondsOf = task.cells.map(() => 0);
  const firstLevel: Array<Record<string, number | null>> = [];
  for (const subject of subjects) {
    const own = runs[subject.runIndex];
    const subjectTask: SweepTask = {
      ...task,
      // the subject's run and design; its stage is held in memory for its cells only
      context: { ...ctx, run: own.run, sidecar: own.sidecar, stageMode: ctx.stageMode === 'none' ? 'none' : 'memory' },
      group: { ...group, events: { kind: 'random-blocks', ...study.design, trialType: STUDY_TRIAL_TYPE }, eventsSeed: subject.designSeed, key: stableHash({ group: group.key, subject: subject.index }) },
    };
    const holding: { held: HeldStage | null } = { held: null };
    for (let c = 0; c < task.cells.length; c++) {
      const t0 = performance.now();
      const cell = task.cells[c];
      const plantIt: SubjectPlant = { centresVoxel: subject.centresVoxel, amplitudePct: subject.amplitudePct };
      const { volume, context, notes, regressors, truth } = await preprocessCell(subjectTask, cell, STUDY_TRIAL_TYPE, holding, plantIt);
      const holder = { volume: volume as Volume | null };
      if (subject.index === 0) {
        // the first subject is also scored as a single run against its own planted blobs: the
        // single-run question's answer on the same runs, widths and plantings
        const one = modelAndScore(holder, context, truth, subjectTask.context, cell, STUDY_TRIAL_TYPE, regressors);
        effects[c].push(one.effectPct);
        frames[c] = one.frame; grids[c] = one.grid; notesOf[c] = notes;
        firstLevel[c] = Object.fromEntries(FIRST_LEVEL_METRICS.map((m) => [m, one.metrics[firstLevelSource(m)] ?? null]));
      } else {
        const { maps } = fitCellModel(holder, context, subjectTask.context, cell, STUDY_TRIAL_TYPE, regressors, false);
        effects[c].push(maps.percentSignalChange.data);
      }
      secondsOf[c] += (performance.now() - t0) / 1000;
    }
    holding.held = null;
    release();
  }
  const out: CellResult[] = [];
  for (let c = 0; c < task.cells.length; c++) {
    const t0 = performance.now();
    const cell = task.cells[c];
    const truth = truthInFrame(groupTruth(group, grid, ctx.run.spacingMm, groupCentresVoxel), frames[c]);
    const { brain, score: scoreMask } = masksInFrame(ctx, frames[c]);
    const g = groupLevelTest(effects[c], brain, grids[c].dims, grids[c].spacingMm, ctx.threshold);
    effects[c] = [];
    const curve = hasBothClasses(truth.mask, scoreMask) ? rocCurve(g.t, truth.mask, scoreMask) : undefined;
    const statistic = makeVolume({ dims: [grids[c].dims[0], grids[c].dims[1], grids[c].dims[2], 1], spacingMm: [grids[c].spacingMm[0], grids[c].spacingMm[1], grids[c].spacingMm[2]], trSec: 0, affine: truth.affine, data: g.t });
    const score = scoreDetection({ statistic, survivors: g.survivors, truth, brainMask: scoreMask, effectPct: g.meanEffect, threshold: g.threshold, thresholdMethod: g.rule, rocCurve: curve });
    const tpr = score.truthVoxels > 0 && curve ? tprAtFpr(curve.fpr, curve.tpr, DEFAULT_FPR_GRID) : [];
    const result: CellResult = { key: cell.key, metrics: { ...cellMetrics(score, g.threshold, g.fwhmMm, g.dof), ...firstLevel[c] }, tpr, notes: notesOf[c], seconds: secondsOf[c] + (performance.now() - t0) / 1000, groupStage: 'computed' };
    if (ctx.cacheDir) await writeCachedCell(ctx.cacheDir, result);
    out.push(result);
    if (ctx.progress) Atomics.add(ctx.progress, task.index, 1);
    onCell?.(out.length);
  }
  return out;
}

/** The group's truth: its blobs at their undisplaced centres, at the group amplitude, on the run's grid. */
function groupTruth(group: CellGroup, grid: { dims: number[]; affine: Float64Array }, spacingMm: readonly number[], centresVoxel: Vec3[]): PlantTruth {
  const p = group.plant;
  // a sphere's edge as planting gives it by default: the smallest voxel spacing
  const shape: PlantTruth['shape'] = p.shape === 'gaussian' ? { shape: 'gaussian', fwhmMm: p.sizeMm } : { shape: 'sphere', radiusMm: p.sizeMm / 2, edgeMm: Math.min(...spacingMm) };
  const { profile, mask, blobs } = blobTruth(grid.dims, grid.affine, centresVoxel, shape, 0.5);
  return {
    dims: [grid.dims[0], grid.dims[1], grid.dims[2]], affine: new Float64Array(grid.affine), shape, sizeMm: p.sizeMm, amplitudePct: p.amplitudePct,
    truthFraction: 0.5, seed: group.plantSeed, mask, profile, timeCourse: new Float64Array([1]),
    centresMm: blobs.map((b) => b.centreMm), centresVoxel: blobs.map((b) => b.centreVoxel), blobs,
  };
}

/**
 * Median tSNR in the brain mask of the run after a setting's whole recipe, with nothing planted:
 * mean / SD over time after removing a quadratic drift (the look module's voxelTimeStats).
 * @param task - the setting's steps and the shared context
 * @returns the median (null when undefined) and the seconds taken
 * @example const { tsnrMedian } = await runTsnrTask(task)
 */
export async function runTsnrTask(task: TsnrTask): Promise<TsnrResult> {
  const t0 = performance.now();
  const ctx = task.context;
  const packedMedian = await packedTsnrMedian(task);
  if (packedMedian !== undefined) return finishTsnrTask(task, packedMedian, t0);
  let volume: Volume | null = sharedRunVolume(ctx);
  let context = initialContext(ctx, ctx.events);
  for (let i = 0; i < task.steps.length; i++) {
    const input: Float32Array = volume!.data;
    const r = await runStepIntoWork(task.steps[i], volume!, context, estimateOf(ctx, task.estimates[i]));
    volume = r.volume;
    context = r.context;
    if (!keptElsewhere(input, [ctx.run.data, volume.data])) release();
  }
  const stats = voxelTimeStats(volume!, { detrendOrder: 2 });
  volume = null;
  const { brain } = masksInFrame(ctx, context.frame ?? { kind: 'raw' });
  const inMask: number[] = [];
  for (let v = 0; v < brain.length; v++) if (brain[v] && Number.isFinite(stats.tsnr[v])) inMask.push(stats.tsnr[v]);
  return finishTsnrTask(task, inMask.length ? medianOf(inMask) : null, t0);
}

/**
 * The median tSNR on the packed path (in a worker thread, when the setting's steps are some that
 * only select volumes followed by volume-wise ones): the selection stays a view of the shared run,
 * the volume-wise steps run volume by volume and only the brain mask's voxels are kept, so no
 * run-sized array is made. voxelTimeStats treats each voxel's series on its own, so the mask's
 * voxels laid side by side give the values they have on the grid. undefined when the path does not apply.
 */
async function packedTsnrMedian(task: TsnrTask): Promise<number | null | undefined> {
  if (isMainThread) return undefined;
  const ctx = task.context;
  const steps = task.steps;
  let k = 0;
  while (k < steps.length && getStep(steps[k].step).kind === 'select-volumes') k++;
  if (!steps.slice(k).every((s) => getStep(s.step).volumewise === true)) return undefined;
  const selected = await selectedVolumes(ctx, steps.slice(0, k), task.estimates.slice(0, k), initialContext(ctx, ctx.events));
  if (!selected) return undefined;
  if (currentWorkBuffer() !== null) {
    releaseWorkBuffer();
    release();
  }
  const { brain } = masksInFrame(ctx, selected.context.frame ?? { kind: 'raw' });
  const index = maskIndex(brain);
  const nt = selected.volume.dims[3];
  const packed = workBuffer(index.length * nt);
  const { data: _data, ...geometry } = selected.volume;
  const estimates = task.estimates.slice(k).map((e) => estimateOf(ctx, e));
  await packVolumewise(patchedVolumes(geometry, selected.volume.data, null), steps.slice(k), estimates, selected.context, index, packed);
  const side = makeVolume({ dims: [index.length, 1, 1, nt], spacingMm: [...geometry.spacingMm], trSec: geometry.trSec, affine: Float64Array.from(geometry.affine), data: packed });
  const stats = voxelTimeStats(side, { detrendOrder: 2 });
  const inMask: number[] = [];
  for (let j = 0; j < index.length; j++) if (Number.isFinite(stats.tsnr[j])) inMask.push(stats.tsnr[j]);
  return inMask.length ? medianOf(inMask) : null;
}

/** A tSNR task's result, cached, and the memory its sums and maps held let go. */
async function finishTsnrTask(task: TsnrTask, tsnrMedian: number | null, t0: number): Promise<TsnrResult> {
  const ctx = task.context;
  const result: TsnrResult = { key: task.key, tsnrMedian, seconds: (performance.now() - t0) / 1000 };
  if (ctx.cacheDir) await writeCachedTsnr(ctx.cacheDir, result);
  // the cells never sum over time: let the sums' block memory (about 4 MB) go, and collect it with this
  // task's maps now (left to V8, they stayed through the next tasks: 7 such memories at a demo sweep's peak)
  releaseVoxelSumsKernels();
  collectGarbage();
  return result;
}

/**
 * What one step estimates from the unplanted run for one setting: the steps before it run on the run
 * as it is (with their own estimates), then the step's `estimate`. Nothing planted ever reaches it,
 * so every planting of the setting is preprocessed with the same estimate.
 * @param task - the steps up to the estimating one and the shared context (with earlier estimates)
 * @returns the estimate, its hash and the seconds taken (written to the cache when there is one)
 * @example const { value, hash } = await runEstimateTask(task)
 */
export async function runEstimateTask(task: EstimateTask): Promise<EstimateResult> {
  const t0 = performance.now();
  const ctx = task.context;
  let volume: Volume = sharedRunVolume(ctx);
  let context = initialContext(ctx, ctx.events);
  const last = task.steps.length - 1;
  for (let i = 0; i < last; i++) {
    const r = await runRecipeStep(task.steps[i], volume, context, estimateOf(ctx, task.before[i]));
    volume = r.volume;
    context = r.context;
  }
  const step = task.steps[last];
  const def = getStep(step.step);
  if (!def.estimate) fail('INVALID_ARGUMENT', `step '${step.step}' estimates nothing`);
  const value = await def.estimate(volume, parseStepParams(step.step, step.params), context);
  const result: EstimateResult = { key: task.key, value, hash: stableHash({ estimate: value }), seconds: (performance.now() - t0) / 1000 };
  if (ctx.cacheDir) await writeCachedEstimate(ctx.cacheDir, result);
  return result;
}

/**
 * The null designs of one setting: its whole recipe on the unplanted run, then each of K random block
 * designs (nothing planted) fitted with the setting's model, giving the maximum t over the scored voxels
 * (the brain mask less any voxels excluded as known to respond). The
 * maxima calibrate 'fwe-calibrated'; the first design's residual smoothness gives the random-field (or
 * Bonferroni) threshold whose exceedances measure that rule's family-wise rate on this run's noise.
 * Task timing of the run itself is not used, so a real task response in the run does not count.
 * @param task - the setting's steps and model, the designs' seeds
 * @returns the maxima and the measured random-field rate
 * @example const { maxima } = await runNullTask(task)
 */
export async function runNullTask(task: NullTask): Promise<NullResult> {
  const t0 = performance.now();
  const ctx = task.context;
  const runSec = ctx.run.dims[3] * ctx.run.trSec;
  let volume: Volume | null = sharedRunVolume(ctx);
  let context = initialContext(ctx, ctx.events);
  const regressors: NuisanceRegressor[] = [];
  for (let i = 0; i < task.steps.length; i++) {
    const input: Float32Array = volume!.data;
    const r = await runStepIntoWork(task.steps[i], volume!, context, estimateOf(ctx, task.estimates[i]));
    volume = r.volume;
    context = r.context;
    regressors.push(...r.regressors);
    if (!keptElsewhere(input, [ctx.run.data, volume.data])) release();
  }
  const v = volume!;
  // designs are drawn on the run as opened; steps that dropped initial volumes moved time zero
  const shiftSec = (ctx.run.dims[3] - v.dims[3]) * ctx.run.trSec;
  const { brain, score: scored } = masksInFrame(ctx, context.frame ?? { kind: 'raw' });
  const maxima: number[] = [];
  let rftThreshold = NaN, smoothness = NaN, dof = NaN;
  for (let k = 0; k < task.designSeeds.length; k++) {
    const drawn = randomBlockEvents(task.designSeeds[k], runSec, task.design);
    const events = shiftSec > 0 ? shiftEvents(drawn, shiftSec).events : drawn;
    const glmOptions = { mask: brain, keepResiduals: k === 0 };
    const fit = cellFit(events, v, ctx, task.model, regressors, context, glmOptions);
    const maps = contrastMaps(fit, { [task.design.trialType]: 1 }, { name: task.design.trialType });
    // the maximum over the scored voxels: voxels left out as known to respond to the task would make
    // every design that resembles the task look like a false alarm
    let max = -Infinity;
    const t = maps.t.data;
    for (let i = 0; i < scored.length; i++) if (scored[i] && t[i] > max) max = t[i];
    maxima.push(max);
    if (k === 0) {
      const smooth = estimateSmoothness(fit.residuals!.data, fit.residuals!.dims, brain, v.spacingMm, { dof: fit.dof });
      fit.residuals = null;
      dof = maps.dof;
      const [fx, fy, fz] = smooth.fwhmMm;
      smoothness = Math.cbrt(fx * fy * fz);
      rftThreshold = thresholdRftBonferroni(t, brain, [v.dims[0], v.dims[1], v.dims[2]], { alpha: ctx.threshold.alpha, stat: { kind: 't', dof: maps.dof }, fwhmMm: smooth.fwhmMm, spacingMm: v.spacingMm }).threshold;
    }
  }
  volume = null;
  return {
    settingIndex: task.settingIndex, maxima, rftBonferroniThreshold: rftThreshold,
    rftBonferroniExceed: maxima.filter((m) => m >= rftThreshold).length, smoothnessFwhmMm: smoothness, dof,
    seconds: (performance.now() - t0) / 1000,
  };
}
