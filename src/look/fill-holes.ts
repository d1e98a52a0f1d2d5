import { labelComponents } from '../core/components.js';

/**
 * Fill holes in a 3D mask: background components (6-connected) that do not touch the grid's
 * border are enclosed by the mask and become part of it.
 * @param mask - nonzero = in, NIfTI order
 * @param dims - [nx, ny, nz]
 * @returns a new 0/1 mask with holes filled
 * @example const solid = fillHoles(mask, [64, 64, 36])
 */
export function fillHoles(mask: ArrayLike<number>, dims: readonly [number, number, number] | readonly number[]): Uint8Array {
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  const background = new Uint8Array(n);
  for (let i = 0; i < n; i++) background[i] = mask[i] ? 0 : 1;
  // 6-connectivity for the background pairs with the 26-connectivity that a mask's surface has
  const { labels, count } = labelComponents(background, [nx, ny, nz], 6);
  const touchesBorder = new Uint8Array(count + 1);
  const nxy = nx * ny;
  for (let v = 0; v < n; v++) {
    const l = labels[v];
    if (!l || touchesBorder[l]) continue;
    const z = Math.floor(v / nxy), y = Math.floor((v - z * nxy) / nx), x = v - z * nxy - y * nx;
    // a 2D grid (nz = 1) has no z border to escape through: judge it in-plane only
    if (x === 0 || y === 0 || x === nx - 1 || y === ny - 1 || (nz > 1 && (z === 0 || z === nz - 1))) touchesBorder[l] = 1;
  }
  const out = new Uint8Array(n);
  for (let v = 0; v < n; v++) out[v] = mask[v] || (labels[v] && !touchesBorder[labels[v]]) ? 1 : 0;
  return out;
}
