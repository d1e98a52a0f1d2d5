import { fail } from '../core/fail.js';
import { checkMatrix, checkSpace, type StoredTransform, type TransformSpace } from './stored-transform.js';
import { transformFileSchema, type TransformJson } from './transform-schema.js';

/**
 * Read boldsweep's transform format back (checks every field).
 * @param value - parsed JSON
 * @param file - the file it came from, for messages. __Default value:__ none
 * @returns the transform
 * @throws BoldsweepError TRANSFORM_FILE_INVALID naming the first wrong field
 * @example transformFromJson(JSON.parse(text))
 */
export function transformFromJson(value: unknown, file?: string): StoredTransform {
  const parsed = transformFileSchema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    fail('TRANSFORM_FILE_INVALID', `${file ?? 'transform'}: ${issue.path.join('.') || '(top level)'}: ${issue.message}`, file ? { file } : {});
  }
  const j = parsed.data;
  const flat = (r: TransformJson['matrix']) => Float64Array.from(r.flat());
  try {
    const from: TransformSpace = { name: j.from.name, grid: { dims: j.from.dims, affine: flat(j.from.voxelToWorld) } };
    const to: TransformSpace = { name: j.to.name, grid: { dims: j.to.dims, affine: flat(j.to.voxelToWorld) } };
    checkSpace(from, 'from');
    checkSpace(to, 'to');
    return { from, to, matrix: checkMatrix(flat(j.matrix), 'matrix') };
  } catch (e) {
    return fail('TRANSFORM_FILE_INVALID', `${file ?? 'transform'}: ${(e as Error).message.split('. ')[0]}`, file ? { file, cause: e } : { cause: e });
  }
}
