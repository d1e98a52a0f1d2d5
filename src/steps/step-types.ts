import type { Frame, Grid } from '../core/grid-frame.js';
import type { Volume } from '../core/volume.js';
import type { BoldEvent, Sidecar } from '../io/run-types.js';
import type { NuisanceRegressor } from '../model/design.js';
import type { PhaseEncodePair } from '../acquire/phase-encode-pair.js';

/**
 * What a step does to a run, as the sweep and the report need to know it:
 * - `select-volumes`: keeps some volumes as they are (no voxel value changes), chosen from its
 *   parameters and context, not from the voxel values (a sweep applies the choice made on the
 *   unplanted run to a planting);
 * - `temporal`: changes each voxel's time series (filters, slice-timing shifts, scaling over time);
 * - `spatial-filter`: changes each volume in place on its grid (smoothing, masking, intensity scaling);
 * - `geometric`: moves signal in space (resampling, motion correction, unwarping, alignment); its
 *   output may live in another frame (see {@link Frame}).
 */
export type StepKind = 'select-volumes' | 'temporal' | 'spatial-filter' | 'geometric';

/**
 * What one preprocessing step did: its parameters, a one-line summary, numbers worth keeping, and
 * a sentence for the methods text. Notes feed the decision record and the methods paragraph.
 */
export interface StepNote {
  /** Registered step name, e.g. "smooth". */
  step: string;
  /** Parameters as applied (after defaults were filled in). */
  params: Record<string, unknown>;
  /** One line for people, e.g. "Gaussian smoothing, FWHM 6 mm, inside the brain mask". */
  summary: string;
  /** Numbers and flags worth recording (all JSON-serialisable). */
  diagnostics: Record<string, number | string | boolean | number[]>;
  /** A sentence for the methods paragraph, with units. */
  methodsText: string;
  /** Published sources of the method, as "Authors (year) Venue". */
  citations: string[];
}

/** What a step sees besides the image: the run's metadata and an optional brain mask. */
export interface StepContext {
  sidecar: Sidecar | null;
  events: BoldEvent[] | null;
  /** Brain mask on the run's grid (1 = in), when known. */
  mask: Uint8Array | null;
  /**
   * Gives an array of the length asked for that a step whose output has its input's size may write
   * that output into instead of allocating one (a sweep reuses one such array per thread for every
   * cell: src/sweep/work-buffer.ts). The array is either the input's own data (the caller then gives
   * up the input, and the step must read each part of it before writing over it) or shares no memory
   * with it. Steps that cannot use it ignore it; it is not passed on to later steps.
   * __Default value:__ none (the step allocates its output).
   */
  outputBuffer?: ((length: number) => Float32Array) | null;
  /**
   * Frame of the input run (raw grid, reference frame, or a target grid).
   * __Default value:__ `{ kind: 'raw' }`
   */
  frame?: Frame;
  /**
   * Grid of the input run (its first three dims and its affine), when the caller knows it: a
   * geometric step's outputFrame needs it to name its target grid before it runs.
   * __Default value:__ none (outputFrame then falls back on the input frame's grid, if any)
   */
  grid?: Grid;
  /**
   * Acquisition time of each slice within a volume (s from the volume's start), along the slice
   * axis, when known (sidecar SliceTiming, or handed on by an earlier step). __Default value:__ null
   */
  sliceTimesSec?: Float64Array | null;
  /**
   * B0 field map, Hz, on the run's grid (head in its reference position), when the caller has one
   * (a sweep's `fieldMapHz`): the `unwarp` step's method field-map reads it. __Default value:__ none
   */
  fieldMapHz?: Float32Array | null;
  /**
   * Images of the head with opposite phase-encode directions, on the run's grid, when the caller has
   * them (a sweep's `phaseEncodePair`): the `unwarp` step's method reversed-pe reads them.
   * __Default value:__ none
   */
  phaseEncodePair?: PhaseEncodePair | null;
  /**
   * True when the model is to sample the task regressors of each slice at that slice's own time in
   * `sliceTimesSec` (one design per slice time; the `slice-time` step's method 'model', which leaves
   * the data unshifted). __Default value:__ false (one design for every voxel)
   */
  modelAtSliceTimes?: boolean;
}

/**
 * A step's output: a new volume and its note. The input is never modified (unless the caller hands
 * its data over as the context's `outputBuffer`); the output's data may share the input's memory
 * (a step that only selects volumes returns a view), so treat it as read-only as well.
 */
export interface StepResult {
  volume: Volume;
  note: StepNote;
  /** Updated context when the step changes it (e.g. dropping volumes shifts event onsets). */
  context?: StepContext;
  /**
   * Regressors the step hands the model (e.g. motion table columns), one value per output volume.
   * The sweep adds them to the design as nuisance columns. __Default value:__ none
   */
  regressors?: NuisanceRegressor[];
  /**
   * Frame of the output when it differs from the input's (a geometric step). __Default value:__ the
   * input's frame
   */
  frame?: Frame;
}

/**
 * A preprocessing step: pure with respect to its inputs. `estimate` is what the step's definition
 * estimated once from the unplanted run for these parameters (see StepDefinition.estimate), or
 * undefined for steps that estimate nothing.
 */
export type StepFunction<P, E = unknown> = (volume: Volume, params: P, context: StepContext, estimate?: E) => StepResult | Promise<StepResult>;

/** Plain name and unit of a step parameter, for sweep axes, tables, charts and the methods text. */
export interface ParameterLabel {
  /** e.g. 'smoothing FWHM'. */
  name: string;
  /** e.g. 'mm', 's', '%', 'deg', or '' for none. */
  unit: string;
}
