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
  // faces[v]: which grid faces voxel v lies on (bits 1, 2: i = 0, nx - 1; 4, 8: j; 16, 32: k), so
  // neither the seeds nor the flood divide to find a voxel's position
  const faces = new Uint8Array(n);
  let tail = 0;
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) tail = rowFacesAndSeeds(mask, out, faces, queue, tail, nx, ny, nz, j, k);
  flood(mask, out, faces, queue, tail, nx, ny * nx);
  return out;
}

/**
 * Face bits of row (j, k), and its background voxels on the border queued (a 2D grid, nz = 1, has no z
 * border to escape through); returns the new queue length.
 */
function rowFacesAndSeeds(mask: ArrayLike<number>, out: Uint8Array, faces: Uint8Array, queue: Int32Array, tail: number, nx: number, ny: number, nz: number, j: number, k: number): number {
  const rowBits = (j === 0 ? 4 : 0) | (j === ny - 1 ? 8 : 0) | (k === 0 ? 16 : 0) | (k === nz - 1 ? 32 : 0);
  const rowBorder = j === 0 || j === ny - 1 || (nz > 1 && (k === 0 || k === nz - 1));
  const base = nx * (j + ny * k);
  for (let i = 0; i < nx; i++) {
    const v = base + i;
    faces[v] = rowBits | (i === 0 ? 1 : 0) | (i === nx - 1 ? 2 : 0);
    if (mask[v]) continue;
    if (rowBorder || i === 0 || i === nx - 1) { out[v] = 0; queue[tail++] = v; }
  }
  return tail;
}

/** Breadth-first flood of the background (mask 0, out 1) through face neighbours from the queued voxels. */
function flood(mask: ArrayLike<number>, out: Uint8Array, faces: Uint8Array, queue: Int32Array, tail: number, nx: number, nxy: number): number {
  for (let head = 0; head < tail; head++) {
    const v = queue[head];
    const f = faces[v];
    if (!(f & 1) && out[v - 1] && !mask[v - 1]) { out[v - 1] = 0; queue[tail++] = v - 1; }
    if (!(f & 2) && out[v + 1] && !mask[v + 1]) { out[v + 1] = 0; queue[tail++] = v + 1; }
    if (!(f & 4) && out[v - nx] && !mask[v - nx]) { out[v - nx] = 0; queue[tail++] = v - nx; }
    if (!(f & 8) && out[v + nx] && !mask[v + nx]) { out[v + nx] = 0; queue[tail++] = v + nx; }
    if (!(f & 16) && out[v - nxy] && !mask[v - nxy]) { out[v - nxy] = 0; queue[tail++] = v - nxy; }
    if (!(f & 32) && out[v + nxy] && !mask[v + nxy]) { out[v + nxy] = 0; queue[tail++] = v + nxy; }
  }
  return tail;
}
