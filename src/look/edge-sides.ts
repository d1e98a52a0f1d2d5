/** The mask's edge voxels and the sides they face, from {@link edgeSides}. */
export interface EdgeSides {
  /** Edge voxels (indices into the volume, ascending): those facing + or - along at least one axis. */
  edge: Int32Array;
  /** Per axis i, j, k: positions in `edge` of the voxels facing + (ascending). */
  plus: [Int32Array, Int32Array, Int32Array];
  /** Per axis: positions in `edge` of the voxels facing - (ascending). */
  minus: [Int32Array, Int32Array, Int32Array];
  /** Per edge voxel: bit 2a set when it faces + along axis a, bit 2a + 1 when it faces - (a = 0, 1, 2). */
  sides: Uint8Array;
}

/**
 * The mask voxels that face + or - along some axis (a face neighbour outside the mask or the grid: the
 * voxels one erosion with the 6-neighbour cross removes, ring 1 of maskRings, found here in one pass
 * without the erosion), and per axis the positions (in `edge`) of those facing + and of those facing -.
 * A voxel open on both sides of an axis (a one-voxel-thin part) counts on neither side of it.
 * @param mask - nonzero = in, NIfTI order
 * @param dims - [nx, ny, nz]
 * @returns the edge voxels, their positions per side, and a side code per edge voxel
 * @example const { edge, plus, minus } = edgeSides(look.mask.mask, [64, 64, 36])
 */
export function edgeSides(mask: ArrayLike<number>, dims: readonly [number, number, number] | readonly number[]): EdgeSides {
  const [nx, ny, nz] = dims;
  const codes = new Uint8Array(nx * ny * nz);
  let edges = 0;
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) edges += rowSides(mask, codes, nx, ny, nz, j, k);
  const edge = new Int32Array(edges);
  const sides = new Uint8Array(edges);
  const sizes = new Int32Array(6);
  for (let v = 0, e = 0; e < edges; v++) {
    const c = codes[v];
    if (c === 0) continue;
    edge[e] = v;
    sides[e++] = c;
    for (let s = 0; s < 6; s++) if (c & (1 << s)) sizes[s]++;
  }
  const lists = Array.from(sizes, (size) => new Int32Array(size));
  const filled = new Int32Array(6);
  for (let e = 0; e < edges; e++) for (let s = 0; s < 6; s++) if (sides[e] & (1 << s)) lists[s][filled[s]++] = e;
  return { edge, plus: [lists[0], lists[2], lists[4]], minus: [lists[1], lists[3], lists[5]], sides };
}

/** Side codes (see EdgeSides.sides) of row (j, k) into codes; returns how many of its voxels face some side. */
function rowSides(mask: ArrayLike<number>, codes: Uint8Array, nx: number, ny: number, nz: number, j: number, k: number): number {
  const nxy = nx * ny;
  const base = nx * (j + ny * k);
  let count = 0;
  for (let i = 0; i < nx; i++) {
    const v = base + i;
    if (!mask[v]) continue;
    let code = 0;
    // per axis: open on + and on - (a neighbour outside the mask or the grid); one side only counts
    let p = i === nx - 1 || !mask[v + 1], m = i === 0 || !mask[v - 1];
    if (p !== m) code |= p ? 1 : 2;
    p = j === ny - 1 || !mask[v + nx]; m = j === 0 || !mask[v - nx];
    if (p !== m) code |= p ? 4 : 8;
    p = k === nz - 1 || !mask[v + nxy]; m = k === 0 || !mask[v - nxy];
    if (p !== m) code |= p ? 16 : 32;
    codes[v] = code;
    if (code) count++;
  }
  return count;
}
