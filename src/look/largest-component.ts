import { labelComponents, type Connectivity } from '../core/components.js';

/**
 * Keep only the largest connected component of a mask (the first in NIfTI order on a tie).
 * @param mask - nonzero = in
 * @param dims - [nx, ny, nz]
 * @param connectivity - 6, 18 or 26 (default 6: a brain is one solid piece, and 6 keeps eyes or
 *   scalp that touch it only at an edge or corner apart)
 * @returns a new 0/1 mask (all zero when the input is empty)
 * @example const brain = largestComponent(opened, dims)
 */
export function largestComponent(mask: ArrayLike<number>, dims: readonly [number, number, number] | readonly number[], connectivity: Connectivity = 6): Uint8Array {
  const { labels, sizes } = labelComponents(mask, dims, connectivity);
  const out = new Uint8Array(mask.length);
  if (sizes.length === 0) return out;
  let best = 0;
  for (let c = 1; c < sizes.length; c++) if (sizes[c] > sizes[best]) best = c;
  const keep = best + 1;
  for (let v = 0; v < out.length; v++) out[v] = labels[v] === keep ? 1 : 0;
  return out;
}
