import { writeFileAtomic } from '../io/atomic-write.js';
import type { StoredTransform } from './stored-transform.js';
import { transformToJson } from './transform-to-json.js';

/**
 * Write a transform in boldsweep's JSON format (atomically: the whole file or nothing).
 * @param path - output file, conventionally `<from>_to_<to>.transform.json`
 * @param t - the transform
 * @returns nothing
 * @throws BoldsweepError WRITE_FAILED
 * @example await writeTransformFile('out/structural_to_template.transform.json', t)
 */
export async function writeTransformFile(path: string, t: StoredTransform): Promise<void> {
  await writeFileAtomic(path, `${JSON.stringify(transformToJson(t), null, 1)}\n`);
}

