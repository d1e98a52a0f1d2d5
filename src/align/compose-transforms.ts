import { composeAffine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { sameGrid } from './same-grid.js';
import type { StoredTransform } from './stored-transform.js';

/**
 * One transform for a chain (first -> second -> ... -> last): from the first's `from` space to the
 * last's `to` space, matrix = M_last ... M_2 M_1. Each link must start in the space (same grid)
 * the previous one ends in, so a chain cannot silently skip or reverse a stage.
 * @param chain - transforms in the order they apply (e.g. volume -> run mean, run mean -> structural, structural -> template)
 * @returns the composed transform
 * @throws BoldsweepError INVALID_ARGUMENT for an empty chain; TRANSFORM_CHAIN_BROKEN when a link does not start where the previous ended
 * @example const rawToTemplate = composeTransforms([meanFromVolume, structuralFromMean, templateFromStructural])
 */
export function composeTransforms(chain: readonly StoredTransform[]): StoredTransform {
  if (chain.length === 0) fail('INVALID_ARGUMENT', 'composeTransforms needs at least one transform');
  let matrix = new Float64Array(chain[0].matrix);
  for (let i = 1; i < chain.length; i++) {
    const prev = chain[i - 1], next = chain[i];
    if (!sameGrid(prev.to.grid, next.from.grid)) {
      fail('TRANSFORM_CHAIN_BROKEN', `link ${i + 1} ('${next.from.name}' -> '${next.to.name}') starts on a grid of ${next.from.grid.dims.join('x')} voxels that is not the grid link ${i} ends on ('${prev.to.name}', ${prev.to.grid.dims.join('x')})`);
    }
    matrix = composeAffine(next.matrix, matrix);
  }
  const first = chain[0], last = chain[chain.length - 1];
  return { from: { name: first.from.name, grid: { dims: [...first.from.grid.dims], affine: new Float64Array(first.from.grid.affine) } }, to: { name: last.to.name, grid: { dims: [...last.to.grid.dims], affine: new Float64Array(last.to.grid.affine) } }, matrix };
}
