import { readFileSync } from 'node:fs';
import YAML from 'yaml';
import { fail } from '../core/fail.js';
import { isBoldsweepError } from '../core/errors.js';
import { BoldsweepError } from '../core/errors.js';
import { parseSweepSpec } from './parse-sweep-spec.js';
import type { SweepSpec } from './spec.js';

/**
 * Read and validate a sweep spec file: JSON (.json) or YAML (.yaml, .yml; JSON is valid YAML too).
 * @param path - the spec file
 * @returns the validated spec with defaults filled in
 * @throws BoldsweepError FILE_NOT_FOUND; SPEC_INVALID for unparsable text or bad fields (with the file
 *   named); UNKNOWN_STEP; UNKNOWN_PARAMETER
 * @example const spec = readSweepSpec('smoothing.yaml')
 */
export function readSweepSpec(path: string): SweepSpec {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    fail('FILE_NOT_FOUND', `cannot read the sweep spec ${path} (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`, { file: path, cause: e });
  }
  let raw: unknown;
  try {
    raw = /\.json$/i.test(path) ? JSON.parse(text) : YAML.parse(text);
  } catch (e) {
    fail('SPEC_INVALID', `the sweep spec is not valid ${/\.json$/i.test(path) ? 'JSON' : 'YAML'}: ${(e as Error).message}`, { file: path, cause: e });
  }
  try {
    return parseSweepSpec(raw);
  } catch (e) {
    if (isBoldsweepError(e)) throw new BoldsweepError(e.code, e.message, { file: path, details: { ...e.details }, cause: e });
    throw e;
  }
}
