import type { Vec3 } from '../core/affine.js';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import type { PhaseEncodePair } from '../acquire/phase-encode-pair.js';
import type { StepNote } from '../steps/step-types.js';
import type { BoldEvent, Sidecar } from '../io/run-types.js';
import type { CellGroup, CellPlan } from './plan.js';
import type { RecipeStep, SweepSpec } from './spec.js';

/** The run as shared with workers: geometry plus voxel data on a SharedArrayBuffer (never copied). */
export interface SharedRun {
  dims: [number, number, number, number];
  spacingMm: [number, number, number];
  trSec: number;
  affine: number[];
  /** Voxel data; a view on a SharedArrayBuffer when workers are used. */
  data: Float32Array;
}

/** What every task of a sweep shares. */
/**
 * What a sweep knows of the run's acquisition beyond its sidecar, for planting that follows it
 * (src/acquire): head poses from a motion table, a B0 field map, and whether slices are timed.
 */
export interface SweepAcquisition {
  /** One row per volume of the run as opened, or null: the head stays in its reference position. */
  motionTable: MotionRow[] | null;
  /** World point the motion table's rotations turn about; null: the grid's centre. */
  rotationCentreMm: Vec3 | null;
  /** B0 field map, Hz, on the run's grid in the reference position (shared memory with workers), or null. */
  fieldMapHz: Float32Array | null;
  /** Plant each slice at its own acquisition time (the sidecar's SliceTiming). */
  sliceTiming: 'sidecar' | 'none';
  /** Reversed phase-encode pair for the unwarp step (not used by planting). __Default value:__ none */
  phaseEncodePair?: PhaseEncodePair | null;
}

export interface SweepContext {
  run: SharedRun;
  /** How planting follows the acquisition. */
  acquisition: SweepAcquisition;
  /** Brain mask (1 = in), one byte per voxel: scoring and statistics are inside it. */
  brainMask: Uint8Array;
  /** Where planted blobs may be centred (1 = allowed). */
  placementMask: Uint8Array;
  /** Voxels scored (the brain mask without voxels known to respond to the task already). */
  scoreMask: Uint8Array;
  events: BoldEvent[];
  sidecar: Sidecar | null;
  threshold: SweepSpec['threshold'];
  /** Folder of the stage cache, or null to keep nothing on disk. */
  cacheDir: string | null;
  /**
   * How a task reuses its group stage (the planted run after the shared steps) across its cells:
   * 'disk' writes it to the cache and reads it back for each cell (other tasks and resumed sweeps
   * reuse it too; one run less in memory); 'memory' holds it between cells; 'none' recomputes it
   * for every cell (the no-cache baseline of the benchmark).
   */
  stageMode: 'disk' | 'memory' | 'none';
  /** Per-task progress counters (cells done), shared with the main thread; index = task index. */
  progress: Int32Array | null;
  /** Modules a worker thread imports before its first task, so the user steps of the recipe exist there. */
  stepModules: string[];
  /** What the recipe's steps estimated from the unplanted run: estimate key -> value (see plan.ts). */
  estimates: Record<string, unknown>;
  /** settingIndex -> maximum t of each null design at that setting (for 'fwe-calibrated'); null when none were fitted. */
  nullMaxima?: Record<number, number[]> | null;
  /**
   * A study's runs after the sweep's own (same grid): subject s plants into run s mod R of
   * [run, ...studyRuns]. Absent or empty: every subject uses the sweep's run.
   */
  studyRuns?: Array<{ run: SharedRun; sidecar: Sidecar | null }>;
}

/** One task: some cells of one group (usually all of them). */
export interface SweepTask {
  kind: 'cells';
  index: number;
  group: CellGroup;
  cells: CellPlan[];
  context: SweepContext;
}

/** What one cell produced. */
export interface CellResult {
  /** Cache key of the cell. */
  key: string;
  /** Metric column -> value (NaN written as null). */
  metrics: Record<string, number | null>;
  /** True-positive rate at each false-positive rate of DEFAULT_FPR_GRID (empty when nothing was planted). */
  tpr: number[];
  /** Notes of every step the cell ran (shared steps first). */
  notes: StepNote[];
  /** Seconds the cell took (its share of the group stage included). */
  seconds: number;
  /** Whether the group stage was computed, read from the stage cache or reused in memory. */
  groupStage: 'computed' | 'cached' | 'memory';
}

/**
 * The tSNR of one setting: the recipe with that setting on the run as it is (nothing planted), then
 * the median over the brain mask of mean / SD over time. A property of the setting, shared by its repeats.
 */
export interface TsnrTask {
  kind: 'tsnr';
  index: number;
  /** Cache key (run, masks, steps). */
  key: string;
  /** The whole recipe with the setting filled in. */
  steps: RecipeStep[];
  /** Per step: key of its estimate (in `context.estimates`), or null. */
  estimates: Array<string | null>;
  context: SweepContext;
}

/** What a tSNR task produced. */
export interface TsnrResult {
  key: string;
  tsnrMedian: number | null;
  seconds: number;
}

/**
 * What one step estimates from the unplanted run (say motion parameters) for one setting of the
 * steps up to it: the steps before it run on the run as it is, then the step's `estimate`.
 */
export interface EstimateTask {
  kind: 'estimate';
  index: number;
  /** Cache key (run, masks, steps up to and including the estimating one, their versions). */
  key: string;
  /** The recipe up to and including the estimating step, with the setting filled in. */
  steps: RecipeStep[];
  /** Per step before the last: key of its own estimate (in `context.estimates`), or null. */
  before: Array<string | null>;
  context: SweepContext;
}

/** What an estimate task produced. */
export interface EstimateResult {
  key: string;
  /** The estimate, as the step returned it (structured-cloneable). */
  value: unknown;
  /** Hash of the value: it enters the cache keys of every stage that used it. */
  hash: string;
  seconds: number;
}

/**
 * The null designs of one setting: the whole recipe with that setting on the unplanted run, then K
 * random block designs fitted to it, each giving the maximum t in the brain mask.
 */
export interface NullTask {
  kind: 'null';
  index: number;
  settingIndex: number;
  /** The whole recipe with the setting filled in. */
  steps: RecipeStep[];
  /** Per step: key of its estimate (in `context.estimates`), or null. */
  estimates: Array<string | null>;
  /** Model options with the setting's model values. */
  model: SweepSpec['model'];
  /** Seeds of the K designs (the same for every setting, so settings are compared on the same designs). */
  designSeeds: number[];
  /** Block and rest durations of the designs. */
  design: { onSec: number; offMinSec: number; offMaxSec: number; trialType: string };
  context: SweepContext;
}

/** What a null task produced. */
export interface NullResult {
  settingIndex: number;
  /** Maximum t over the scored voxels of each design, in design order. */
  maxima: number[];
  /** Threshold of the lesser of random-field and Bonferroni at alpha, from the first design's residual smoothness. */
  rftBonferroniThreshold: number;
  /** Designs whose maximum reached that threshold. */
  rftBonferroniExceed: number;
  /** Smoothness (geometric mean FWHM, mm) of the first design's residuals. */
  smoothnessFwhmMm: number;
  dof: number;
  seconds: number;
}

/** Anything a sweep worker runs. */
export type SweepJob = SweepTask | TsnrTask | EstimateTask | NullTask;
