import { dilateMask, erodeMask } from './binary-morphology.js';

/**
 * Label voxels by depth inside a mask, for grouping voxel-raster rows: ring 1 is the mask's outer
 * surface (removed by one erosion), ring 2 the next layer, and so on; the last ring holds everything
 * deeper. Voxels outside the mask but within `rimWidth` dilations get -1 (an outside rim, where
 * head motion shows first); all others 0.
 * @param mask - nonzero = in
 * @param dims - [nx, ny, nz]
 * @param rings - number of inside groups (default 3)
 * @param rimWidth - width of the outside rim in voxels (default 2; 0 for none)
 * @returns Int8Array of labels -1, 0, 1..rings
 * @example const rings = maskRings(brain.mask, dims, 3)
 */
export function maskRings(mask: ArrayLike<number>, dims: readonly [number, number, number] | readonly number[], rings = 3, rimWidth = 2): Int8Array {
  const n = mask.length;
  const out = new Int8Array(n);
  let current: Uint8Array = Uint8Array.from(mask as ArrayLike<number>, (x) => (x ? 1 : 0));
  for (let r = 1; r <= rings; r++) {
    const inner = r === rings ? new Uint8Array(n) : erodeMask(current, dims);
    for (let v = 0; v < n; v++) if (current[v] && !inner[v]) out[v] = r;
    current = inner;
  }
  let grown: Uint8Array = Uint8Array.from(mask as ArrayLike<number>, (x) => (x ? 1 : 0));
  for (let w = 0; w < rimWidth; w++) grown = dilateMask(grown, dims);
  for (let v = 0; v < n; v++) if (grown[v] && !mask[v]) out[v] = -1;
  return out;
}
