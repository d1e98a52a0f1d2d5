import type { StoredTransform, TransformSpace } from './stored-transform.js';
import { TRANSFORM_FORMAT_VERSION, type TransformJson } from './transform-schema.js';

const ABOUT = 'boldsweep transform: a point p (world mm, RAS+) of the "from" space is the point matrix x p of the "to" space; matrices are row-major 4x4; voxelToWorld maps a grid\'s 0-based voxel indices to its world mm.';

const toRows = (a: ArrayLike<number>) => [0, 1, 2, 3].map((r) => [a[4 * r], a[4 * r + 1], a[4 * r + 2], a[4 * r + 3]]) as TransformJson['matrix'];
const spaceJson = (s: TransformSpace) => ({ name: s.name, dims: [...s.grid.dims] as [number, number, number], voxelToWorld: toRows(s.grid.affine) });

/**
 * boldsweep's own plain-JSON transform format (version 1): `boldsweepTransform` (the version),
 * `about` (what the numbers mean), `from` and `to` (each `name`, `dims`, `voxelToWorld` as 4 rows of
 * 4) and `matrix` (from-world -> to-world, 4 rows of 4). Numbers are written in full (JSON's
 * shortest round-trip form), so reading gives back the same bits.
 * @param t - the transform
 * @returns the JSON object
 * @example JSON.stringify(transformToJson(t), null, 1)
 */
export function transformToJson(t: StoredTransform): TransformJson {
  return { boldsweepTransform: TRANSFORM_FORMAT_VERSION, about: ABOUT, from: spaceJson(t.from), to: spaceJson(t.to), matrix: toRows(t.matrix) };
}

