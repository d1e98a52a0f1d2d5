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
      for (let x = 0; x < nx; x++) {
        const v = x + nx * y + nxy * z;
        const c = mask[v] ? 1 : 0;
        if (erode) {
          if (!c) { res[v] = 0; continue; }
          const keep = x > 0 && x < nx - 1 && y > 0 && y < ny - 1 && z > 0 && z < nz - 1
            ? mask[v - 1] && mask[v + 1] && mask[v - nx] && mask[v + nx] && mask[v - nxy] && mask[v + nxy]
            : (x > 0 && mask[v - 1]) && (x < nx - 1 && mask[v + 1]) && (y > 0 && mask[v - nx]) && (y < ny - 1 && mask[v + nx])
              && (nz === 1 || ((z > 0 && mask[v - nxy]) && (z < nz - 1 && mask[v + nxy])));
          res[v] = keep ? 1 : 0;
        } else {
          if (c) { res[v] = 1; continue; }
          const grow = (x > 0 && mask[v - 1]) || (x < nx - 1 && mask[v + 1]) || (y > 0 && mask[v - nx]) || (y < ny - 1 && mask[v + nx])
            || (z > 0 && mask[v - nxy]) || (z < nz - 1 && mask[v + nxy]);
          res[v] = grow ? 1 : 0;
        }
      }
    }
  }
  return res;
}
