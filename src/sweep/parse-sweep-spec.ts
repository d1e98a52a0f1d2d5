import { z } from 'zod';
import { BoldsweepError, isBoldsweepError } from '../core/errors.js';
import { fail } from '../core/fail.js';
import { getStep, parseStepParams } from '../steps/registry.js';
import { parseSweepSpecShape, sweepSpecSchema, type SweepSpec, type SweepSpecInput } from './spec.js';

const MODEL_OPTIONS = ['ar1', 'ar1SmoothFwhmMm', 'highpassCutoffSec', 'trialType', 'censorVolumes', 'motionRegressors', 'censorFdMm', 'censorFdBefore', 'censorFdAfter'] as const;

/** Rethrow a step's parameter error as SPEC_INVALID naming the spec field (unknown names keep their codes). */
function asSpecError(e: unknown, field: string): never {
  if (isBoldsweepError(e, 'INVALID_ARGUMENT')) fail('SPEC_INVALID', `${field}: ${e.message.replace(/\. Check the value passed.*$/, '')}`, { details: { fields: [field] }, cause: e });
  throw e;
}

/**
 * Validate a sweep spec completely and fill in defaults: its shape, every recipe step's name and
 * parameters (through the step registry), and every varied key and value.
 * @param input - the spec as an object (from TypeScript, JSON or YAML)
 * @returns the spec with each step's parameters completed by its defaults
 * @throws BoldsweepError SPEC_INVALID (listing the fields), UNKNOWN_STEP (listing the registered steps),
 *   UNKNOWN_PARAMETER (listing the step's parameters)
 * @example const spec = parseSweepSpec({ recipe: [{ step: 'smooth', params: { fwhmMm: 0 } }], vary: { 'smooth.fwhmMm': [0, 4, 8] }, ... })
 */
export function parseSweepSpec(input: SweepSpecInput | SweepSpec | unknown): SweepSpec {
  const shaped = parseSweepSpecShape(input);
  // 1. recipe steps: names and parameters
  const recipe = shaped.recipe.map((s, i) => {
    getStep(s.step);
    try {
      return { step: s.step, params: parseStepParams(s.step, s.params) as Record<string, unknown> };
    } catch (e) {
      return asSpecError(e, `recipe.${i}.params`);
    }
  });
  // 2. varied keys: a step of the recipe (or a model option) and values its schema accepts
  for (const [key, values] of Object.entries(shaped.vary)) {
    const dot = key.indexOf('.');
    const head = key.slice(0, dot);
    const param = key.slice(dot + 1);
    if (head === 'study') continue; // checked with the study section (spec.ts)
    if (head === 'model') {
      if (!(MODEL_OPTIONS as readonly string[]).includes(param)) fail('UNKNOWN_PARAMETER', `vary key "${key}": the model has no option '${param}'; its options are ${MODEL_OPTIONS.join(', ')}`, { details: { known: [...MODEL_OPTIONS] } });
      const modelSchema = (sweepSpecSchema.shape.model as unknown as z.ZodDefault<z.ZodObject<z.ZodRawShape>>).removeDefault();
      for (const v of values) {
        const r = modelSchema.safeParse({ ...shaped.model, [param]: v });
        if (!r.success) fail('SPEC_INVALID', `vary.${key}: value ${JSON.stringify(v)} is not allowed (${r.error.issues.map((i) => i.message).join('; ')})`, { details: { fields: [`vary.${key}`] } });
      }
      continue;
    }
    getStep(head);
    const at = recipe.map((s, i) => (s.step === head ? i : -1)).filter((i) => i >= 0);
    if (at.length === 0) fail('SPEC_INVALID', `vary key "${key}" names step '${head}', which is not in the recipe (${recipe.map((s) => s.step).join(', ')}); add it to the recipe with its fixed parameters`, { details: { fields: [`vary.${key}`] } });
    if (at.length > 1) fail('SPEC_INVALID', `vary key "${key}" is ambiguous: step '${head}' appears ${at.length} times in the recipe`, { details: { fields: [`vary.${key}`] } });
    for (const v of values) {
      try {
        parseStepParams(head, { ...recipe[at[0]].params, [param]: v });
      } catch (e) {
        asSpecError(e, `vary.${key}`);
      }
    }
  }
  return { ...shaped, recipe };
}

/** True when `e` is one of the errors a bad spec raises. */
export function isSpecError(e: unknown): e is BoldsweepError {
  return isBoldsweepError(e, 'SPEC_INVALID') || isBoldsweepError(e, 'UNKNOWN_STEP') || isBoldsweepError(e, 'UNKNOWN_PARAMETER');
}
