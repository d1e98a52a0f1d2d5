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
  ballPass(input, eroded, dims, offsets, true, input);
  const erodedCount = count(eroded);
  if (erodedCount === 0) return { mask: input, eroded: 0, largestComponent: 0, dilated: count(input), reachVoxels: reach };
  const largest = largestComponent(eroded, dims, 6);
  const dilated = new Uint8Array(n);
  ballPass(largest, dilated, dims, offsets, false, input); // only into voxels of the input mask
  return { mask: dilated, eroded: erodedCount, largestComponent: count(largest), dilated: count(dilated), reachVoxels: reach };
}

/**
 * Erosion (every offset in, outside the grid = out) or dilation (any offset in) with a list of
 * offsets, evaluated only where `where` is set (erosion: the mask itself; dilation: the mask the
 * result is restricted to). Voxels at least the ball's reach from every grid face use linear offsets.
 */
function ballPass(src: Uint8Array, out: Uint8Array, dims: readonly number[], offsets: Array<[number, number, number]>, erode: boolean, where: Uint8Array): void {
  const nx = dims[0], ny = dims[1], nz = dims[2];
  let ra = 0, rb = 0, rc = 0;
  for (const o of offsets) { ra = Math.max(ra, Math.abs(o[0])); rb = Math.max(rb, Math.abs(o[1])); rc = Math.max(rc, Math.abs(o[2])); }
  const linear = Int32Array.from(offsets, ([a, b, c]) => a + nx * (b + ny * c));
  const oa = Int32Array.from(offsets, (o) => o[0]), ob = Int32Array.from(offsets, (o) => o[1]), oc = Int32Array.from(offsets, (o) => o[2]);
  passLoop(src, out, where, nx, ny, nz, ra, rb, rc, linear, oa, ob, oc, erode ? 1 : 0);
}

/** The loop of ballPass on plain numbers and typed arrays (one function V8 optimises once). */
function passLoop(src: Uint8Array, out: Uint8Array, where: Uint8Array, nx: number, ny: number, nz: number, ra: number, rb: number, rc: number, linear: Int32Array, oa: Int32Array, ob: Int32Array, oc: Int32Array, erode: number): void {
  const m = linear.length;
  let v = 0;
  for (let k = 0; k < nz; k++) {
    const kIn = k >= rc && k < nz - rc;
    for (let j = 0; j < ny; j++) {
      const jkIn = kIn && j >= rb && j < ny - rb;
      for (let i = 0; i < nx; i++, v++) {
        if (where[v] === 0) continue;
        // erosion: 1 unless some offset is out; dilation: 0 unless some offset is in
        let hit = erode;
        if (jkIn && i >= ra && i < nx - ra) {
          for (let o = 0; o < m; o++) {
            if ((src[v + linear[o]] !== 0 ? 1 : 0) !== erode) { hit = 1 - erode; break; }
          }
        } else {
          for (let o = 0; o < m; o++) {
            const x = i + oa[o], y = j + ob[o], z = k + oc[o];
            const s = x >= 0 && x < nx && y >= 0 && y < ny && z >= 0 && z < nz && src[x + nx * (y + ny * z)] !== 0 ? 1 : 0;
            if (s !== erode) { hit = 1 - erode; break; }
          }
        }
        out[v] = hit;
      }
    }
  }
}

function count(m: Uint8Array): number {
  let c = 0;
  for (let i = 0; i < m.length; i++) c += m[i];
  return c;
}
