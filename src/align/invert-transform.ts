import { invertAffine } from '../core/affine.js';
import type { StoredTransform } from './stored-transform.js';

/**
 * The transform that points the other way: `to` -> `from`, with the inverse matrix.
 * @param t - a stored transform
 * @returns its inverse (new object)
 * @example const structuralFromMean = invertTransform(meanFromStructural)
 */
export function invertTransform(t: StoredTransform): StoredTransform {
  return { from: { name: t.to.name, grid: { dims: [...t.to.grid.dims], affine: new Float64Array(t.to.grid.affine) } }, to: { name: t.from.name, grid: { dims: [...t.from.grid.dims], affine: new Float64Array(t.from.grid.affine) } }, matrix: invertAffine(t.matrix) };
}
