import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { maskRings } from './mask-rings.js';

/** Rows of a voxel raster, from {@link voxelRasterRows}. */
export interface VoxelRasterRows {
  /** rows x nt values, row-major: row r, volume t at [r * nt + t]; each row z-scored. */
  values: Float32Array;
  rows: number;
  nt: number;
  /** Voxel index of each row. */
  voxels: Int32Array;
  /**
   * Depth of each row's voxel below the mask surface, mm, ascending (rows are in this order):
   * negative outside the mask (distance to the nearest mask voxel), positive inside (distance to the
   * nearest voxel outside it), between voxel centres.
   */
  depthMm: Float32Array;
}

/**
 * Pick voxel time courses for a voxel raster, ordered by depth below the mask surface on a continuous
 * millimetre scale: a band outside the mask (`rimWidth` voxels) at the top, where head motion shows
 * first, down to the deepest voxels. Voxels are sampled evenly in NIfTI order from the mask and the
 * band, and each sampled voxel's depth is the exact Euclidean distance (in mm, using the voxel size)
 * to the nearest voxel on the other side of the mask surface. Each row is z-scored with the mean and
 * SD of its own volumes from `firstVolume` on, so dropped volumes show how far they stand out.
 * @param run - the run
 * @param mask - brain mask (nonzero = in)
 * @param options - maxRows (default 600), rimWidth (default 2 voxels), firstVolume (default 0)
 * @returns the z-scored rows with their depths
 * @throws BoldsweepError NOT_4D for a 3D image
 * @example const raster = voxelRasterRows(run.volume, look.mask.mask, { firstVolume: look.recommendation.dropInitialVolumes })
 */
export function voxelRasterRows(run: Volume, mask: ArrayLike<number>, options: { maxRows?: number; rimWidth?: number; firstVolume?: number } = {}): VoxelRasterRows {
  const nt = run.dims[3];
  if (nt < 2) fail('NOT_4D', `a voxel raster needs a 4D run, got ${nt} volume`);
  const [nx, ny, nz] = run.dims;
  const n = voxelsPerVolume(run);
  const first = options.firstVolume ?? 0;
  const maxRows = options.maxRows ?? 600;
  // ring 1 = inner surface of the mask, -1 = the outside band: the two sides of the surface
  const labels = maskRings(mask, [nx, ny, nz], 2, options.rimWidth ?? 2);
  const pool: number[] = [];
  const insideEdge: number[] = [], outsideEdge: number[] = [];
  for (let v = 0; v < n; v++) {
    const l = labels[v];
    if (l === 0) continue;
    if (l === 1) insideEdge.push(v);
    if (!Number.isFinite(run.data[v])) continue; // cannot be z-scored
    pool.push(v);
  }
  for (let v = 0; v < n; v++) if (!mask[v] && touchesMask(v, mask, nx, ny, nz)) outsideEdge.push(v);
  const take = Math.min(pool.length, maxRows);
  const picked = Array.from({ length: take }, (_, r) => pool[Math.floor(((r + 0.5) * pool.length) / take)]);
  const sp = run.spacingMm;
  const coords = (list: number[]) => {
    const c = new Float64Array(3 * list.length);
    list.forEach((v, i) => { const k = Math.floor(v / (nx * ny)), j = Math.floor(v / nx) % ny; c[3 * i] = (v % nx) * sp[0]; c[3 * i + 1] = j * sp[1]; c[3 * i + 2] = k * sp[2]; });
    return c;
  };
  const inC = coords(insideEdge), outC = coords(outsideEdge);
  const depth = picked.map((v) => {
    const k = Math.floor(v / (nx * ny)), j = Math.floor(v / nx) % ny;
    const x = (v % nx) * sp[0], y = j * sp[1], z = k * sp[2];
    const other = mask[v] ? outC : inC;
    const d = nearest(other, x, y, z);
    return mask[v] ? (Number.isFinite(d) ? d : 0) : -(Number.isFinite(d) ? d : 0);
  });
  const order = picked.map((_, i) => i).sort((a, b) => depth[a] - depth[b] || picked[a] - picked[b]);
  const rows = order.length;
  const values = new Float32Array(rows * nt);
  const voxels = new Int32Array(rows);
  const depthMm = new Float32Array(rows);
  for (let r = 0; r < rows; r++) {
    const v = picked[order[r]];
    voxels[r] = v; depthMm[r] = depth[order[r]];
    let s = 0, ss = 0;
    for (let t = first; t < nt; t++) s += run.data[t * n + v];
    const m = s / (nt - first);
    for (let t = first; t < nt; t++) { const d = run.data[t * n + v] - m; ss += d * d; }
    const sd = Math.sqrt(ss / Math.max(1, nt - first - 1));
    for (let t = 0; t < nt; t++) values[r * nt + t] = sd > 0 ? (run.data[t * n + v] - m) / sd : 0;
  }
  return { values, rows, nt, voxels, depthMm };
}

/** Whether a voxel outside the mask has a face neighbour inside it. */
function touchesMask(v: number, mask: ArrayLike<number>, nx: number, ny: number, nz: number): boolean {
  const i = v % nx, j = Math.floor(v / nx) % ny, k = Math.floor(v / (nx * ny));
  return (i > 0 && !!mask[v - 1]) || (i < nx - 1 && !!mask[v + 1]) || (j > 0 && !!mask[v - nx]) || (j < ny - 1 && !!mask[v + nx])
    || (k > 0 && !!mask[v - nx * ny]) || (k < nz - 1 && !!mask[v + nx * ny]);
}

/** Distance from (x, y, z) to the nearest of the points (x, y, z triples), mm; Infinity for none. */
function nearest(points: Float64Array, x: number, y: number, z: number): number {
  let best = Infinity;
  for (let i = 0; i < points.length; i += 3) {
    const dx = points[i] - x, dy = points[i + 1] - y, dz = points[i + 2] - z;
    const d = dx * dx + dy * dy + dz * dz;
    if (d < best) best = d;
  }
  return Math.sqrt(best);
}
