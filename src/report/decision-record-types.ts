import type { StepNote } from '../steps/step-types.js';
import type { RecipeStep, SweepSpec } from '../sweep/spec.js';
import type { Setting } from '../sweep/settings-grid.js';
import type { FileFacts, MaskSource } from '../sweep/mask-source.js';

export type { FileFacts, MaskSource };

/** Mean, SE and 95 % t-interval of one metric across repeats. */
export interface MetricSummary {
  n: number;
  mean: number | null;
  se: number | null;
  low: number | null;
  high: number | null;
}

/** The machine-readable account of a choice: enough to check it and to re-run it. */
export interface DecisionRecord {
  format: 'boldsweep-decision-record';
  version: 1;
  /** When the record was written (ISO 8601). */
  createdAt: string;
  software: { boldsweep: string; node: string; platform: string; dependencies: Record<string, string> };
  inputs: {
    image: FileFacts | null;
    sidecar: FileFacts | null;
    events: FileFacts | null;
    /** SHA-256 of the voxels and geometry as read (independent of file compression). */
    runHash: string;
    /** SHA-256 of the masks and events used. */
    contextHash: string;
  };
  /** How the masks were made; `exclude` holds voxels left out of planting and scoring (known activation). */
  masks: { brain: MaskSource; placement: MaskSource; exclude: MaskSource | null };
  run: { dims: [number, number, number, number]; spacingMm: [number, number, number]; trSec: number; trSource: string; summary: string };
  /** BIDS sidecar fields the sweep used, with their values. */
  sidecarFieldsUsed: Record<string, unknown>;
  /** The recipe with the chosen setting filled in. */
  recipe: RecipeStep[];
  /** Notes of every step of the chosen recipe (first repeat). */
  stepNotes: StepNote[];
  sweepSpec: SweepSpec;
  seed: number;
  scorecard: {
    sweepKey: string;
    file: string;
    sha256: string;
    rows: number;
    summary: Array<{ setting: Setting; plantSizeMm: number; plantAmplitudePct: number; repeats: number; metrics: Record<string, MetricSummary> }>;
  };
  choice: {
    /**
     * How far the choice can be trusted: 'chosen'; 'no-detection' (the best mean at the metric's
     * floor); 'saturated' (several settings at its ceiling; `setting` then comes from `fallback.to`);
     * 'tied' (every setting within one standard error of the best); 'nothing-planted' (a null sweep: it
     * measures false alarms only). Only 'chosen' reads "Use ...".
     * Absent in records written before the status existed (read as 'chosen').
     */
    status?: 'chosen' | 'no-detection' | 'saturated' | 'tied' | 'nothing-planted';
    /** What to change in the sweep when the status is not 'chosen'. */
    advice?: string;
    /** When the requested metric saturated: the metric the choice fell back to, and why. */
    fallback?: { from: string; to: string; reason: string } | null;
    setting: Setting;
    plantSizeMm: number;
    plantAmplitudePct: number;
    ruleId: string;
    rule: string;
    /** The metric the choice was made on (the fallback's when saturated). */
    metric: string;
    prefer: 'smallest' | 'largest';
    cutoff: number;
    chosen: { setting: Setting; mean: number; se: number; low: number; high: number };
    best: { setting: Setting; mean: number; se: number };
    perPlant: Array<{ plantSizeMm: number; plantAmplitudePct: number; status?: string; metric?: string; setting: Setting; mean: number; bestSetting: Setting; bestMean: number }>;
    summary: string;
  };
  caveats: string[];
}
