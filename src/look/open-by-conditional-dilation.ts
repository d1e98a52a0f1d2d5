import { largestComponent } from './largest-component.js';

/** Result of {@link openByConditionalDilation}. */
export interface ConditionalOpening {
  /** 0/1 mask after the last step. */
  mask: Uint8Array;
  /** Voxels after erosion, after keeping the largest component, and after the conditional dilation. */
  eroded: number;
  largestComponent: number;
  dilated: number;
  /** Ball offsets used along i, j, k (voxels): 0 along an axis too short to erode across. */
  reachVoxels: [number, number, number];
}

/**
 * Cut an object free of what thin bridges join it to (eyes and optic nerves, scalp): erode the mask
 * with a ball of `radiusMm`, keep the largest 6-connected component, and dilate it again with the same
 * ball but only into voxels of the original mask (conditional dilation). Parts joined to the main
 * object only through bridges thinner than the ball's diameter fall away; the main object gets its
 * outline back. The brain-extraction scheme of Lemieux L, Hagemann G, Krakow K & Woermann FG (1999)
 * Magn Reson Med 42:127-135 (threshold, erosion, largest component, conditional dilation) [memory].
 * The ball is taken in millimetres (anisotropic voxels keep a round ball); outside the grid counts
 * as background for the erosion (as scipy.ndimage.binary_erosion with border_value 0). An axis with
 * fewer than 2 x reach + 3 voxels (a thin slab, one slice) is not eroded across.
 * @param mask - nonzero = in, NIfTI order (not modified)
 * @param dims - [nx, ny, nz]
 * @param spacingMm - voxel size along i, j, k
 * @param radiusMm - ball radius, mm
 * @returns the mask and its counts; when erosion leaves nothing, the input mask (binarised) unchanged
 * @example openByConditionalDilation(raw, [64, 64, 36], [3, 3, 3.5], 8).mask
 */
export function openByConditionalDilation(mask: ArrayLike<number>, dims: readonly number[], spacingMm: readonly number[], radiusMm: number): ConditionalOpening {
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  const reach = [0, 1, 2].map((a) => (dims[a] >= 2 * Math.floor(radiusMm / spacingMm[a]) + 3 ? Math.floor(radiusMm / spacingMm[a]) : 0)) as [number, number, number];
  const offsets: Array<[number, number, number]> = [];
  for (let c = -reach[2]; c <= reach[2]; c++) for (let b = -reach[1]; b <= reach[1]; b++) for (let a = -reach[0]; a <= reach[0]; a++) {
    if ((a * spacingMm[0]) ** 2 + (b * spacingMm[1]) ** 2 + (c * spacingMm[2]) ** 2 <= radiusMm * radiusMm + 1e-9) offsets.push([a, b, c]);
  }
  const input = new Uint8Array(n);
  for (let v = 0; v < n; v++) input[v] = mask[v] ? 1 : 0;
  const eroded = new Uint8Array(n);
  ballPass(input, eroded, dims, offsets, true);
  const erodedCount = count(eroded);
  if (erodedCount === 0) return { mask: input, eroded: 0, largestComponent: 0, dilated: count(input), reachVoxels: reach };
  const largest = largestComponent(eroded, dims, 6);
  const dilated = new Uint8Array(n);
  ballPass(largest, dilated, dims, offsets, false);
  for (let v = 0; v < n; v++) dilated[v] &= input[v];
  return { mask: dilated, eroded: erodedCount, largestComponent: count(largest), dilated: count(dilated), reachVoxels: reach };
}

/** Erosion (every offset in, outside the grid = out) or dilation (any offset in) with a list of offsets. */
function ballPass(src: Uint8Array, out: Uint8Array, dims: readonly number[], offsets: Array<[number, number, number]>, erode: boolean): void {
  const [nx, ny, nz] = dims;
  for (let k = 0, v = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, v++) {
    if (erode && !src[v]) continue;
    let hit = erode ? 1 : 0;
    for (const [a, b, c] of offsets) {
      const x = i + a, y = j + b, z = k + c;
      const inGrid = x >= 0 && x < nx && y >= 0 && y < ny && z >= 0 && z < nz;
      const s = inGrid ? src[x + nx * (y + ny * z)] : 0;
      if (erode && !s) { hit = 0; break; }
      if (!erode && s) { hit = 1; break; }
    }
    out[v] = hit;
  }
}

function count(m: Uint8Array): number {
  let c = 0;
  for (let i = 0; i < m.length; i++) c += m[i];
  return c;
}
