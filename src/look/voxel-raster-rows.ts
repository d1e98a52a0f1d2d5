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
  /** Consecutive row groups, outermost first. */
  groups: Array<{ label: string; start: number; count: number }>;
}

/**
 * Pick voxel time courses for a voxel raster, grouped by depth in the mask (an outside rim, then
 * rings from the mask surface inwards: where motion and drift show differently), each group sampled
 * evenly in NIfTI order and given rows in proportion to its size. Each row is z-scored with the mean
 * and SD of its own volumes from `firstVolume` on, so dropped volumes show how far they stand out.
 * @param run - the run
 * @param mask - brain mask (nonzero = in)
 * @param options - maxRows (default 600), rings (default 3), rimWidth (default 2), firstVolume (default 0)
 * @returns the z-scored rows and their groups
 * @throws BoldsweepError NOT_4D for a 3D image
 * @example const raster = voxelRasterRows(run.volume, look.mask.mask, { firstVolume: look.recommendation.dropInitialVolumes })
 */
export function voxelRasterRows(run: Volume, mask: ArrayLike<number>, options: { maxRows?: number; rings?: number; rimWidth?: number; firstVolume?: number } = {}): VoxelRasterRows {
  const nt = run.dims[3];
  if (nt < 2) fail('NOT_4D', `a voxel raster needs a 4D run, got ${nt} volume`);
  const n = voxelsPerVolume(run);
  const rings = options.rings ?? 3;
  const first = options.firstVolume ?? 0;
  const maxRows = options.maxRows ?? 600;
  const labels = maskRings(mask, run.dims.slice(0, 3), rings, options.rimWidth ?? 2);
  const order = [-1, ...Array.from({ length: rings }, (_, i) => i + 1)];
  const members = new Map<number, number[]>(order.map((l) => [l, []]));
  for (let v = 0; v < n; v++) {
    const l = labels[v];
    if (l === 0) continue;
    // voxels with non-finite values cannot be z-scored
    if (!Number.isFinite(run.data[v])) continue;
    members.get(l)!.push(v);
  }
  const total = order.reduce((s, l) => s + members.get(l)!.length, 0);
  const picked: number[] = [];
  const groups: VoxelRasterRows['groups'] = [];
  for (const l of order) {
    const list = members.get(l)!;
    if (list.length === 0) continue;
    const want = Math.max(1, Math.round((maxRows * list.length) / Math.max(1, total)));
    const take = Math.min(list.length, want);
    const start = picked.length;
    for (let r = 0; r < take; r++) picked.push(list[Math.floor(((r + 0.5) * list.length) / take)]);
    groups.push({ label: l === -1 ? 'outside rim' : l === 1 ? 'mask edge' : l === rings ? 'mask core' : `ring ${l}`, start, count: take });
  }
  const rows = picked.length;
  const values = new Float32Array(rows * nt);
  for (let r = 0; r < rows; r++) {
    const v = picked[r];
    let s = 0, ss = 0;
    for (let t = first; t < nt; t++) s += run.data[t * n + v];
    const m = s / (nt - first);
    for (let t = first; t < nt; t++) { const d = run.data[t * n + v] - m; ss += d * d; }
    const sd = Math.sqrt(ss / Math.max(1, nt - first - 1));
    for (let t = 0; t < nt; t++) values[r * nt + t] = sd > 0 ? (run.data[t * n + v] - m) / sd : 0;
  }
  return { values, rows, nt, voxels: Int32Array.from(picked), groups };
}
