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
}

/** A step's output: a new volume (the input is never modified) and its note. */
export interface StepResult {
  volume: Volume;
  note: StepNote;
  /** Updated context when the step changes it (e.g. dropping volumes shifts event onsets). */
  context?: StepContext;
}

/** A preprocessing step: pure with respect to its inputs. */
export type StepFunction<P> = (volume: Volume, params: P, context: StepContext) => StepResult | Promise<StepResult>;
