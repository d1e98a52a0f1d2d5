/**
 * Binary erosion and dilation of a 3D mask with the 6-neighbour cross (the voxel and its face
 * neighbours: the smallest 3D structuring element). Outside the grid counts as background for
 * erosion and contributes nothing to dilation. Pure: the input is not modified.
 */

type Dims3 = readonly [number, number, number] | readonly number[];

/**
 * Erode a mask: a voxel stays in only when it and all six face neighbours are in.
 * @param mask - nonzero = in, NIfTI order
 * @param dims - [nx, ny, nz]
 * @param out - optional output (must not be `mask`)
 * @returns the eroded mask (0/1)
 * @example const core = erodeMask(mask, [64, 64, 36])
 */
export function erodeMask(mask: ArrayLike<number>, dims: Dims3, out?: Uint8Array): Uint8Array {
  return morph(mask, dims, true, out);
}

/**
 * Dilate a mask: a voxel is in when it or any of its six face neighbours is in.
 * @param mask - nonzero = in, NIfTI order
 * @param dims - [nx, ny, nz]
 * @param out - optional output (must not be `mask`)
 * @returns the dilated mask (0/1)
 * @example const grown = dilateMask(mask, [64, 64, 36])
 */
export function dilateMask(mask: ArrayLike<number>, dims: Dims3, out?: Uint8Array): Uint8Array {
  return morph(mask, dims, false, out);
}

/**
 * Opening (erode then dilate): removes specks and thin bridges smaller than the cross.
 * @param mask - nonzero = in
 * @param dims - [nx, ny, nz]
 * @returns the opened mask
 * @example openMask(rawMask, dims)
 */
export function openMask(mask: ArrayLike<number>, dims: Dims3): Uint8Array {
  return dilateMask(erodeMask(mask, dims), dims);
}

/**
 * Closing (dilate then erode): closes one-voxel gaps and notches.
 * @param mask - nonzero = in
 * @param dims - [nx, ny, nz]
 * @returns the closed mask
 * @example closeMask(rawMask, dims)
 */
export function closeMask(mask: ArrayLike<number>, dims: Dims3): Uint8Array {
  return erodeMask(dilateMask(mask, dims), dims);
}

function morph(mask: ArrayLike<number>, dims: Dims3, erode: boolean, out?: Uint8Array): Uint8Array {
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  const res = out ?? new Uint8Array(n);
  const nxy = nx * ny;
  for (let z = 0; z < nz; z++) {
    for (let y = 0; y < ny; y++) {
      // which neighbour rows exist is decided once per row
      const row = nx * y + nxy * z;
      const ym = y > 0, yp = y < ny - 1, zm = z > 0, zp = z < nz - 1;
      if (erode) erodeRow(mask, res, row, nx, nxy, ym, yp, nz === 1 ? 2 : zm && zp ? 1 : 0);
      else dilateRow(mask, res, row, nx, nxy, ym, yp, zm, zp);
    }
  }
  return res;
}

/** One row of erosion; z: 1 both z neighbours exist, 0 one is missing (voxel out), 2 a 2D grid (z ignored). */
function erodeRow(m: ArrayLike<number>, res: Uint8Array, row: number, nx: number, nxy: number, ym: boolean, yp: boolean, z: number): void {
  if (!ym || !yp || z === 0) { for (let x = 0; x < nx; x++) res[row + x] = 0; return; }
  const useZ = z === 1;
  res[row] = 0;
  for (let x = 1; x < nx - 1; x++) {
    const v = row + x;
    res[v] = m[v] && m[v - 1] && m[v + 1] && m[v - nx] && m[v + nx] && (!useZ || (m[v - nxy] && m[v + nxy])) ? 1 : 0;
  }
  if (nx > 1) res[row + nx - 1] = 0;
}

/** One row of dilation. */
function dilateRow(m: ArrayLike<number>, res: Uint8Array, row: number, nx: number, nxy: number, ym: boolean, yp: boolean, zm: boolean, zp: boolean): void {
  for (let x = 0; x < nx; x++) {
    const v = row + x;
    res[v] = m[v] || (x > 0 && m[v - 1]) || (x < nx - 1 && m[v + 1]) || (ym && m[v - nx]) || (yp && m[v + nx])
      || (zm && m[v - nxy]) || (zp && m[v + nxy]) ? 1 : 0;
  }
}
