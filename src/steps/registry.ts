import { z } from 'zod';
import { fail } from '../core/fail.js';
import type { Volume } from '../core/volume.js';
import { registerBuiltinSteps } from './builtin-steps.js';
import type { Frame } from '../core/grid-frame.js';
import type { ParameterLabel, StepContext, StepFunction, StepKind, StepResult } from './step-types.js';

/**
 * A preprocessing step as the recipe and sweep engines see it: a parameter schema (zod; unknown
 * keys rejected, defaults filled in), what kind of step it is and where its output lives, its
 * version, what it estimates once from the unplanted run, the function, and the words for its
 * parameters. Everything the sweep, the recommendation and the report need to know about a step
 * lives here, in one place.
 */
export interface StepDefinition<P = Record<string, unknown>, E = unknown> {
  /** Validates raw parameters (from a recipe or sweep spec) and fills defaults. */
  schema: z.ZodType<P, z.ZodTypeDef, unknown>;
  /**
   * Version of the step's numerics, a positive integer. It enters every cache key that involves
   * the step: bump it whenever the step's output for the same input and parameters changes.
   */
  version: number;
  /** What the step does to a run (see {@link StepKind}). */
  kind: StepKind;
  /**
   * Frame of the output for an input in `input` (geometric steps that move the run to the reference
   * frame or onto another grid). __Default value:__ the input's frame
   */
  outputFrame?: (params: P, input: Frame, context: StepContext) => Frame;
  /**
   * What the step estimates from the unplanted run (e.g. motion parameters), once per setting. The
   * sweep caches it (keyed by run, prefix of the recipe, step, version and parameters), hashes it, and
   * hands it to `apply` for every planting, so a planted activation never changes what is estimated.
   * Its value must survive structured cloning (plain data and typed arrays).
   * __Default value:__ none (the step estimates nothing)
   */
  estimate?: (volume: Volume, params: P, context: StepContext) => E | Promise<E>;
  /** The step itself. */
  apply: StepFunction<P, E>;
  /** Short label for one setting, e.g. "smooth 6 mm". */
  describe: (params: P) => string;
  /** Plain name and unit of each parameter a sweep may vary, e.g. `{ fwhmMm: { name: 'smoothing FWHM', unit: 'mm' } }`. */
  labels: Record<string, ParameterLabel>;
  /**
   * How simple a setting is: lower is simpler. The one-standard-error rule takes the simplest of the
   * settings that are as good as the best. __Default value:__ the settings' order in the sweep
   */
  simplicity?: (params: P) => number;
}

const steps = new Map<string, StepDefinition<unknown>>();

/**
 * Add a step under a name (lower-case words joined by '-'), so recipes and sweeps can use it.
 * @param name - step name, e.g. 'smooth'
 * @param definition - schema, apply, describe
 * @param options - replace: allow overwriting an existing name (default false)
 * @returns nothing
 * @throws BoldsweepError INVALID_ARGUMENT for a malformed or already used name
 * @example registerStep('clip', { schema: z.object({ max: z.number() }).strict(), apply: clipStep, describe: (p) => `clip ${p.max}` })
 */
export function registerStep<P>(name: string, definition: StepDefinition<P>, options: { replace?: boolean } = {}): void {
  if (!/^[a-z][a-z0-9]*(-[a-z0-9]+)*$/.test(name)) fail('INVALID_ARGUMENT', `step name must be lower-case words joined by '-', got '${name}'`);
  if (steps.has(name) && !options.replace) fail('INVALID_ARGUMENT', `a step named '${name}' is already registered (pass { replace: true } to overwrite it)`);
  steps.set(name, definition as unknown as StepDefinition<unknown>);
}

/**
 * Names of all registered steps, sorted.
 * @returns step names
 * @example listSteps() // ['detrend', 'drop-initial-volumes', 'grand-mean-scale', ...]
 */
export function listSteps(): string[] {
  return [...steps.keys()].sort();
}

/**
 * Look up a registered step.
 * @param name - step name
 * @returns its definition
 * @throws BoldsweepError UNKNOWN_STEP listing the registered names
 * @example const def = getStep('smooth')
 */
export function getStep(name: string): StepDefinition<unknown> {
  const def = steps.get(name);
  if (!def) fail('UNKNOWN_STEP', `no step named '${name}'; registered steps: ${listSteps().join(', ')}`, { details: { step: name, known: listSteps() } });
  return def;
}

/** Parameter names a schema accepts, when it is an object schema. */
function schemaKeys(schema: z.ZodTypeAny): string[] {
  let s: z.ZodTypeAny = schema;
  while (s instanceof z.ZodEffects) s = s.innerType();
  return s instanceof z.ZodObject ? Object.keys(s.shape as Record<string, unknown>) : [];
}

/**
 * Validate raw parameters for a step and fill its defaults.
 * @param name - step name
 * @param raw - parameters as written in a recipe or sweep spec
 * @returns the parameters the step will use
 * @throws BoldsweepError UNKNOWN_STEP; UNKNOWN_PARAMETER for a name the step does not take; INVALID_ARGUMENT for a bad value
 * @example parseStepParams('smooth', { fwhmMm: 6 }) // { fwhmMm: 6, mode: 'reflect', withinMask: false }
 */
export function parseStepParams(name: string, raw: unknown): unknown {
  const def = getStep(name);
  const parsed = def.schema.safeParse(raw ?? {});
  if (parsed.success) return parsed.data;
  const keys = schemaKeys(def.schema as z.ZodTypeAny);
  for (const issue of parsed.error.issues) {
    if (issue.code === 'unrecognized_keys') {
      fail('UNKNOWN_PARAMETER', `step '${name}' has no parameter ${issue.keys.map((k) => `'${k}'`).join(', ')}; its parameters are ${keys.join(', ') || '(none)'}`, { details: { step: name, unknown: issue.keys, known: keys } });
    }
  }
  const text = parsed.error.issues.map((i) => `${i.path.join('.') || '(parameters)'}: ${i.message}`).join('; ');
  fail('INVALID_ARGUMENT', `step '${name}': ${text}`, { details: { step: name, issues: parsed.error.issues } });
}

/**
 * Validate parameters and run a registered step.
 * @param name - step name
 * @param volume - the run (not modified)
 * @param raw - raw parameters
 * @param context - sidecar, events, mask
 * @returns the step's result (new volume, note, possibly a new context)
 * @throws BoldsweepError UNKNOWN_STEP, UNKNOWN_PARAMETER, INVALID_ARGUMENT, or the step's own errors
 * @example const { volume, note } = await applyStep('smooth', run.volume, { fwhmMm: 6 }, context)
 */
export async function applyStep(name: string, volume: Volume, raw: unknown, context: StepContext): Promise<StepResult> {
  const params = parseStepParams(name, raw);
  return getStep(name).apply(volume, params, context);
}

/**
 * Label for a step setting from the step's own describe().
 * @param name - step name
 * @param raw - raw parameters
 * @returns e.g. "smooth 6 mm"
 * @example describeStep('highpass', { cutoffSec: 100 }) // "highpass 100 s"
 */
export function describeStep(name: string, raw: unknown): string {
  return getStep(name).describe(parseStepParams(name, raw));
}

registerBuiltinSteps((name, definition) => registerStep(name, definition));
