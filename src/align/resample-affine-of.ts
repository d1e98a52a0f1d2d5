import { invertAffine, type Affine } from '../core/affine.js';
import type { StoredTransform } from './stored-transform.js';

/**
 * The affine that resampling needs to carry an image of `t.from` onto the grid of `t.to`: target
 * world -> source world, the inverse of the stored matrix (resampleRun's `transform` / `perVolume`).
 * @param t - a stored transform
 * @returns to-world -> from-world, row-major 4x4
 * @example await resampleRun(mean, { kernel: 'cubic', grid: t.to.grid, transform: resampleAffineOf(t) })
 */
export function resampleAffineOf(t: StoredTransform): Affine {
  return invertAffine(t.matrix);
}
