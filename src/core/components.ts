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
  const ox: number[] = [], oy: number[] = [], oz: number[] = [];
  for (let dz = -1; dz <= 1; dz++) for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) {
    const manhattan = Math.abs(dx) + Math.abs(dy) + Math.abs(dz);
    if (manhattan === 0) continue;
    if (connectivity === 6 && manhattan > 1) continue;
    if (connectivity === 18 && manhattan > 2) continue;
    ox.push(dx); oy.push(dy); oz.push(dz);
  }
  const nxy = nx * ny;
  const dxs = Int32Array.from(ox), dys = Int32Array.from(oy), dzs = Int32Array.from(oz);
  const step = Int32Array.from(ox, (dx, i) => dx + nx * oy[i] + nxy * oz[i]);
  const labels = new Int32Array(n);
  const queue = new Int32Array(n);
  const sizes: number[] = [];
  for (let start = 0; start < n; start++) {
    if (!mask[start] || labels[start]) continue;
    sizes.push(floodLabel(mask, labels, queue, start, sizes.length + 1, nx, ny, nz, dxs, dys, dzs, step));
  }
  return { labels, sizes, count: sizes.length };
}

/**
 * Breadth-first flood of one component from `start`, writing `label`; returns its size. (Its own
 * function: V8 optimises it once for all components and calls instead of compiling the caller mid-loop.)
 */
function floodLabel(mask: ArrayLike<number>, labels: Int32Array, queue: Int32Array, start: number, label: number, nx: number, ny: number, nz: number, dxs: Int32Array, dys: Int32Array, dzs: Int32Array, step: Int32Array): number {
  const nxy = nx * ny;
  const k = step.length;
  let head = 0, tail = 0;
  queue[tail++] = start;
  labels[start] = label;
  while (head < tail) {
    const v = queue[head++];
    const z = (v / nxy) | 0, y = ((v - z * nxy) / nx) | 0, x = v - z * nxy - y * nx;
    if (x > 0 && y > 0 && z > 0 && x < nx - 1 && y < ny - 1 && z < nz - 1) {
      // away from the grid's faces every neighbour exists: no bounds checks
      for (let i = 0; i < k; i++) {
        const w = v + step[i];
        if (mask[w] && !labels[w]) { labels[w] = label; queue[tail++] = w; }
      }
    } else {
      for (let i = 0; i < k; i++) {
        const xx = x + dxs[i], yy = y + dys[i], zz = z + dzs[i];
        if (xx < 0 || yy < 0 || zz < 0 || xx >= nx || yy >= ny || zz >= nz) continue;
        const w = v + step[i];
        if (mask[w] && !labels[w]) { labels[w] = label; queue[tail++] = w; }
      }
    }
  }
  return tail;
}
