import { z } from 'zod';
import { isAbsolute } from 'node:path';
import { pathToFileURL } from 'node:url';
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
   * Volume by volume: each output volume depends only on the same input volume (and the parameters,
   * context and estimate), so the step applied to a run gives, volume for volume, the bytes it gives
   * applied to each volume alone as a one-volume run, with the same note and output context and no
   * regressors; the output stays on the input's grid. A sweep worker then runs the step one volume
   * at a time and keeps only the brain mask's voxels of its output (a few volumes of scratch instead
   * of a run-sized array). Only for kind 'spatial-filter' (a grand-mean scaling, say, is not one: it
   * divides every volume by a mean over all of them). __Default value:__ false
   */
  volumewise?: boolean;
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
/** Module (file URL) that registers each user step, for worker threads to import. */
const modules = new Map<string, string>();
/** Names of the steps boldsweep ships with (every worker thread registers them itself). */
const builtins = new Set<string>();

const STEP_KINDS: readonly StepKind[] = ['select-volumes', 'temporal', 'spatial-filter', 'geometric'];

/** Options of {@link registerStep}. */
export interface RegisterStepOptions {
  /** Allow overwriting an existing name. __Default value:__ false */
  replace?: boolean;
  /**
   * URL (or absolute path) of the module that registers this step when imported, usually the
   * caller's `import.meta.url`. A sweep's worker threads import it before their first task, so the
   * step exists there too. The module must register the step under the same name with the same
   * definition when imported (in any thread). __Default value:__ none: the step then works in this
   * thread only (a sweep with worker threads refuses it with STEP_MODULE_MISSING)
   */
  module?: string;
}

/** Check the parts of a definition a schema cannot check (the sweep relies on them). */
function checkDefinition(name: string, d: StepDefinition<unknown>): void {
  const bad = (what: string): never => fail('INVALID_ARGUMENT', `step '${name}': ${what}`);
  if (!d || typeof d !== 'object') bad('the definition must be an object');
  if (!d.schema || typeof (d.schema as { safeParse?: unknown }).safeParse !== 'function') bad('schema must be a zod schema');
  if (!Number.isInteger(d.version) || d.version < 1) bad(`version must be a positive integer (bump it whenever the step's numerics change), got ${String(d.version)}`);
  if (!STEP_KINDS.includes(d.kind)) bad(`kind must be one of ${STEP_KINDS.join(', ')}, got ${String(d.kind)}`);
  if (d.volumewise !== undefined && typeof d.volumewise !== 'boolean') bad('volumewise must be true or false when given');
  if (d.volumewise && d.kind !== 'spatial-filter') bad(`volumewise is only for kind 'spatial-filter' (each volume changed on its own grid), got kind '${d.kind}'`);
  if (typeof d.apply !== 'function') bad('apply must be a function');
  if (typeof d.describe !== 'function') bad('describe must be a function');
  if (d.estimate !== undefined && typeof d.estimate !== 'function') bad('estimate must be a function when given');
  if (d.outputFrame !== undefined && typeof d.outputFrame !== 'function') bad('outputFrame must be a function when given');
  if (d.simplicity !== undefined && typeof d.simplicity !== 'function') bad('simplicity must be a function when given');
  if (!d.labels || typeof d.labels !== 'object') bad('labels must be an object: parameter -> { name, unit }');
  const keys = schemaKeys(d.schema as z.ZodTypeAny);
  for (const [param, label] of Object.entries(d.labels)) {
    if (keys.length > 0 && !keys.includes(param)) bad(`labels names '${param}', which is not a parameter (parameters: ${keys.join(', ')})`);
    if (!label || typeof label.name !== 'string' || label.name.trim() === '' || typeof label.unit !== 'string') bad(`labels.${param} must be { name: non-empty text, unit: text ('' for none) }`);
  }
}

/** A module reference as a file URL (an absolute path is converted). */
function moduleUrl(name: string, module: string): string {
  if (isAbsolute(module)) return pathToFileURL(module).href;
  try {
    return new URL(module).href;
  } catch {
    return fail('INVALID_ARGUMENT', `step '${name}': module must be a URL (e.g. import.meta.url) or an absolute path, got '${module}'`);
  }
}

/**
 * Add a step under a name (lower-case words joined by '-'), so recipes and sweeps can use it.
 * @param name - step name, e.g. 'smooth'
 * @param definition - schema, version, kind, apply, describe, labels (see {@link StepDefinition})
 * @param options - replace: allow overwriting an existing name; module: the module that registers
 *   the step (its `import.meta.url`), so a sweep's worker threads can register it too
 * @returns nothing
 * @throws BoldsweepError INVALID_ARGUMENT for a malformed or already used name, or a malformed definition
 *   (version not a positive integer, unknown kind, labels for parameters the schema lacks)
 * @example registerStep('clip', { schema: z.object({ max: z.number() }).strict(), version: 1, kind: 'spatial-filter', apply: clipStep, describe: (p) => `clip ${p.max}`, labels: { max: { name: 'clip ceiling', unit: '' } } }, { module: import.meta.url })
 */
export function registerStep<P, E = unknown>(name: string, definition: StepDefinition<P, E>, options: RegisterStepOptions = {}): void {
  if (!/^[a-z][a-z0-9]*(-[a-z0-9]+)*$/.test(name)) fail('INVALID_ARGUMENT', `step name must be lower-case words joined by '-', got '${name}'`);
  if (steps.has(name) && !options.replace) fail('INVALID_ARGUMENT', `a step named '${name}' is already registered (pass { replace: true } to overwrite it)`);
  if (name === 'model') fail('INVALID_ARGUMENT', "'model' names the model options in a sweep; choose another step name");
  checkDefinition(name, definition as unknown as StepDefinition<unknown>);
  const module = options.module === undefined ? null : moduleUrl(name, options.module);
  steps.set(name, definition as unknown as StepDefinition<unknown>);
  builtins.delete(name);
  if (module) modules.set(name, module); else modules.delete(name);
}

/**
 * The modules worker threads must import so that the named steps exist there: none for built-in
 * steps, the registering module of each user step.
 * @param names - step names (e.g. those of a sweep's recipe)
 * @returns module URLs, sorted, without repeats
 * @throws BoldsweepError UNKNOWN_STEP; STEP_MODULE_MISSING for a user step registered without `module`
 * @example stepModules(['smooth', 'my-step']) // ['file:///home/me/my-step.mjs']
 */
export function stepModules(names: readonly string[]): string[] {
  const out = new Set<string>();
  for (const name of names) {
    getStep(name);
    if (builtins.has(name)) continue;
    const m = modules.get(name);
    if (!m) fail('STEP_MODULE_MISSING', `step '${name}' was registered without a module, so worker threads cannot load it`, { details: { step: name } });
    out.add(m);
  }
  return [...out].sort();
}

/**
 * Version of a registered step's numerics (part of every cache key that involves the step).
 * @param name - step name
 * @returns a positive integer
 * @throws BoldsweepError UNKNOWN_STEP
 * @example stepVersion('smooth') // 1
 */
export function stepVersion(name: string): number {
  return getStep(name).version;
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
 * @param estimate - what the step's `estimate` computed from the unplanted run for these parameters
 *   (steps without `estimate` ignore it)
 * @returns the step's result (new volume, note, possibly a new context)
 * @throws BoldsweepError UNKNOWN_STEP, UNKNOWN_PARAMETER, INVALID_ARGUMENT, or the step's own errors
 * @example const { volume, note } = await applyStep('smooth', run.volume, { fwhmMm: 6 }, context)
 */
export async function applyStep(name: string, volume: Volume, raw: unknown, context: StepContext, estimate?: unknown): Promise<StepResult> {
  const params = parseStepParams(name, raw);
  return getStep(name).apply(volume, params, context, estimate);
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

registerBuiltinSteps((name, definition) => {
  registerStep(name, definition);
  builtins.add(name);
});
