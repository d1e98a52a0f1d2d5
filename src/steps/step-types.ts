import type { Volume } from '../core/volume.js';
import type { BoldEvent, Sidecar } from '../io/run-types.js';

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
}

/** A preprocessing step: pure with respect to its inputs. */
export type StepFunction<P> = (volume: Volume, params: P, context: StepContext) => StepResult | Promise<StepResult>;
