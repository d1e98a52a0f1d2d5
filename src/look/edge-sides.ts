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
  const strides = [1, nx, nx * ny];
  const edge: number[] = [];
  const sides: number[] = [];
  const plus: number[][] = [[], [], []];
  const minus: number[][] = [[], [], []];
  for (let k = 0, v = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, v++) {
    if (!mask[v]) continue;
    const at = [i, j, k];
    const e = edge.length;
    let code = 0;
    for (let a = 0; a < 3; a++) {
      const size = dims[a], s = strides[a];
      const openPlus = at[a] === size - 1 || !mask[v + s];
      const openMinus = at[a] === 0 || !mask[v - s];
      if (openPlus === openMinus) continue; // closed on both sides, or open on both (thin)
      (openPlus ? plus : minus)[a].push(e);
      code |= 1 << (2 * a + (openPlus ? 0 : 1));
    }
    if (code) { edge.push(v); sides.push(code); }
  }
  const typed = (l: number[][]) => [Int32Array.from(l[0]), Int32Array.from(l[1]), Int32Array.from(l[2])] as [Int32Array, Int32Array, Int32Array];
  return { edge: Int32Array.from(edge), plus: typed(plus), minus: typed(minus), sides: Uint8Array.from(sides) };
}
