import type { Vec3 } from '../core/affine.js';
import type { Volume } from '../core/volume.js';
import type { BoldEvent, Sidecar } from '../io/run-types.js';
import type { PhantomSpec } from './phantom-spec.js';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import type { PhantomTissue } from './tissue-properties.js';

/** A spike as placed: where and how much was added. */
export interface PhantomSpike {
  /** Volume, 0-based. */
  volume: number;
  /** Voxel indices i, j, k, 0-based. */
  voxel: [number, number, number];
  /** Value added, signal units. */
  amplitude: number;
}

/** Steady-state facts of one tissue. */
export interface TissueSteadyState {
  /** q = exp(-TR/T1) cos(flip). */
  q: number;
  /** Signal of the first volume over steady state, minus 1, percent. */
  firstVolumeExcessPercent: number;
  /** First volume (1-based) within 1 % of steady state. */
  firstSteadyVolume: number;
}

/** Everything known about how a phantom run was made, for scoring methods against. */
export interface PhantomTruth {
  /**
   * Majority tissue of each voxel (0 air, 1 extracerebral, 2 CSF, 3 grey matter, 4 white matter,
   * 5 sinus air), with the head at its volume-0 position and without geometric distortion.
   */
  tissueLabels: Volume;
  /** Names of the labels in {@link PhantomTruth.tissueLabels}, index = label. */
  labelNames: string[];
  /** Partial-volume fraction of each tissue per voxel, same frame as the labels. */
  tissueFractions: Record<PhantomTissue, Float32Array>;
  /**
   * Expected signal change of each voxel on the plateau of a sustained block, percent of its
   * steady-state signal (0 where nothing responds); same frame as the labels.
   */
  activationPercent: Volume;
  /** Field offset, Hz, same frame as the labels (zeros when the spec has no b0). */
  fieldMapHz: Volume;
  /** Head position per volume relative to volume 0. */
  motionTable: MotionRow[];
  /** World point the motion-table rotations turn about, mm. */
  rotationCentreMm: Vec3;
  spikes: PhantomSpike[];
  dropouts: Array<{ volume: number; slice: number; keptFraction: number }>;
  /** The near-zero-baseline edge voxels and the volumes at which each falls to zero (when the spec has them). */
  lowBaselineVoxels?: Array<{ voxel: [number, number, number]; volumes: number[] }>;
  /** Fraction of each voxel in the eyes and optic nerves, head frame (when the spec has eyes). */
  eyeFraction?: Volume;
  /**
   * Steady state by the 1 % rule: `firstSteadyVolume` (1-based) is the first volume within 1 % of
   * steady state in every tissue present, so `nonSteadyVolumeCount` = firstSteadyVolume - 1 volumes
   * are brighter than steady state by more than 1 %.
   */
  steadyState: { tolerancePercent: number; firstSteadyVolume: number; nonSteadyVolumeCount: number; perTissue: Record<PhantomTissue, TissueSteadyState> };
  /** Noise-free steady-state signal of each pure tissue, signal units. */
  tissueSignal: Record<PhantomTissue, number>;
  /** Total readout time used for the geometric shift, seconds. */
  totalReadoutTimeSec: number;
  /** The complete spec the run was made from (defaults filled in). */
  spec: PhantomSpec;
}

/** A simulated run with its metadata and ground truth. */
export interface PhantomRun {
  /** The 4D run, float32 signal units. */
  volume: Volume;
  /** BIDS sidecar fields of the simulated acquisition. */
  sidecar: Sidecar;
  /** The task's events. */
  events: BoldEvent[];
  truth: PhantomTruth;
}
