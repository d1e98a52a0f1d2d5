import { readFile } from 'node:fs/promises';
import { fail } from '../core/fail.js';
import type { StoredTransform } from './stored-transform.js';
import { transformFromJson } from './transform-from-json.js';

/**
 * Read a transform written by {@link writeTransformFile}.
 * @param path - the file
 * @returns the transform
 * @throws BoldsweepError FILE_NOT_FOUND, READ_FAILED, TRANSFORM_FILE_INVALID (not JSON, or a wrong field)
 * @example const t = await readTransformFile('out/structural_to_template.transform.json')
 */
export async function readTransformFile(path: string): Promise<StoredTransform> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (cause) {
    const code = (cause as NodeJS.ErrnoException).code === 'ENOENT' ? 'FILE_NOT_FOUND' : 'READ_FAILED';
    return fail(code, `cannot read transform file ${path}`, { file: path, cause });
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (cause) {
    return fail('TRANSFORM_FILE_INVALID', `${path} is not JSON (${(cause as Error).message})`, { file: path, cause });
  }
  return transformFromJson(value, path);
}
