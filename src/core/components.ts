import { fail } from './fail.js';

/** Which neighbours touch: faces (6), faces and edges (18), or faces, edges and corners (26). */
export type Connectivity = 6 | 18 | 26;

/** Result of {@link labelComponents}. */
export interface Components {
  /** Per voxel: 0 outside the mask, else the component number 1..count. */
  labels: Int32Array;
  /** sizes[c - 1] is the voxel count of component c. */
  sizes: number[];
  count: number;
}

/**
 * Connected components of a binary 3D mask by breadth-first flood fill (one pass, explicit queue,
 * no recursion so large components cannot overflow the stack). Components are numbered in the order
 * their first voxel appears in NIfTI order, so labels are deterministic.
 * @param mask - nonzero = in, length nx*ny*nz
 * @param dims - [nx, ny, nz]
 * @param connectivity - 6, 18 or 26 (default 26)
 * @returns labels and sizes
 * @example const { labels, sizes } = labelComponents(survivors, [64, 64, 36], 26)
 */
export function labelComponents(mask: ArrayLike<number>, dims: readonly [number, number, number] | readonly number[], connectivity: Connectivity = 26): Components {
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  if (mask.length !== n) fail('INVALID_ARGUMENT', `mask length ${mask.length} does not match ${nx}x${ny}x${nz}`);
  const offsets: Array<[number, number, number]> = [];
  for (let dz = -1; dz <= 1; dz++) for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) {
    const manhattan = Math.abs(dx) + Math.abs(dy) + Math.abs(dz);
    if (manhattan === 0) continue;
    if (connectivity === 6 && manhattan > 1) continue;
    if (connectivity === 18 && manhattan > 2) continue;
    offsets.push([dx, dy, dz]);
  }
  const labels = new Int32Array(n);
  const queue = new Int32Array(n);
  const sizes: number[] = [];
  const nxy = nx * ny;
  for (let start = 0; start < n; start++) {
    if (!mask[start] || labels[start]) continue;
    const label = sizes.length + 1;
    let head = 0, tail = 0;
    queue[tail++] = start;
    labels[start] = label;
    while (head < tail) {
      const v = queue[head++];
      const z = Math.floor(v / nxy), y = Math.floor((v - z * nxy) / nx), x = v - z * nxy - y * nx;
      for (const [dx, dy, dz] of offsets) {
        const xx = x + dx, yy = y + dy, zz = z + dz;
        if (xx < 0 || yy < 0 || zz < 0 || xx >= nx || yy >= ny || zz >= nz) continue;
        const w = xx + nx * (yy + ny * zz);
        if (mask[w] && !labels[w]) { labels[w] = label; queue[tail++] = w; }
      }
    }
    sizes.push(tail);
  }
  return { labels, sizes, count: sizes.length };
}
