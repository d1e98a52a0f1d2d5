/**
 * Fill holes in a 3D mask: background regions (6-connected) that do not reach the grid's border are
 * enclosed by the mask and become part of it. Found by flooding the background from every border
 * voxel (one breadth-first pass); what the flood does not reach is a hole.
 * @param mask - nonzero = in, NIfTI order
 * @param dims - [nx, ny, nz]
 * @returns a new 0/1 mask with holes filled
 * @example const solid = fillHoles(mask, [64, 64, 36])
 */
export function fillHoles(mask: ArrayLike<number>, dims: readonly [number, number, number] | readonly number[]): Uint8Array {
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  // out: 1 = in the mask or not (yet) reached from the border; 0 = background reached from the border
  const out = new Uint8Array(n).fill(1);
  const queue = new Int32Array(n);
  const tail = borderSeeds(mask, out, queue, nx, ny, nz);
  flood(mask, out, queue, tail, nx, ny, nz);
  return out;
}

/** Queues the background voxels on the border (a 2D grid, nz = 1, has no z border to escape through); returns how many. */
function borderSeeds(mask: ArrayLike<number>, out: Uint8Array, queue: Int32Array, nx: number, ny: number, nz: number): number {
  const nxy = nx * ny;
  let tail = 0;
  for (let v = 0; v < out.length; v++) {
    if (mask[v]) continue;
    const z = (v / nxy) | 0, y = ((v - z * nxy) / nx) | 0, x = v - z * nxy - y * nx;
    if (x === 0 || y === 0 || x === nx - 1 || y === ny - 1 || (nz > 1 && (z === 0 || z === nz - 1))) { out[v] = 0; queue[tail++] = v; }
  }
  return tail;
}

/** Breadth-first flood of the background (mask 0, out 1) through face neighbours from the queued voxels. */
function flood(mask: ArrayLike<number>, out: Uint8Array, queue: Int32Array, tail: number, nx: number, ny: number, nz: number): number {
  const nxy = nx * ny;
  for (let head = 0; head < tail; head++) {
    const v = queue[head];
    const z = (v / nxy) | 0, y = ((v - z * nxy) / nx) | 0, x = v - z * nxy - y * nx;
    if (x > 0 && out[v - 1] && !mask[v - 1]) { out[v - 1] = 0; queue[tail++] = v - 1; }
    if (x < nx - 1 && out[v + 1] && !mask[v + 1]) { out[v + 1] = 0; queue[tail++] = v + 1; }
    if (y > 0 && out[v - nx] && !mask[v - nx]) { out[v - nx] = 0; queue[tail++] = v - nx; }
    if (y < ny - 1 && out[v + nx] && !mask[v + nx]) { out[v + nx] = 0; queue[tail++] = v + nx; }
    if (z > 0 && out[v - nxy] && !mask[v - nxy]) { out[v - nxy] = 0; queue[tail++] = v - nxy; }
    if (z < nz - 1 && out[v + nxy] && !mask[v + nxy]) { out[v + nxy] = 0; queue[tail++] = v + nxy; }
  }
  return tail;
}
