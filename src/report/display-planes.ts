import type { Affine } from '../core/affine.js';
import { fail } from '../core/fail.js';

/** Which voxel axis runs closest to each world axis (x: left->right, y: posterior->anterior, z: inferior->superior). */
export interface DisplayAxes {
  /** axisOf[w] = voxel axis (0 i, 1 j, 2 k) nearest world axis w. */
  axisOf: [number, number, number];
  /** positive[w]: whether increasing that voxel index increases world coordinate w. */
  positive: [boolean, boolean, boolean];
}

/** A 2D section through a 3D map, oriented for display. */
export interface PlaneImage {
  plane: PlaneName;
  /** width * height values, row 0 at the top. */
  values: Float32Array;
  width: number;
  height: number;
  /** Millimetres per column and per row. */
  pixelMm: [number, number];
  /** Letters for the four edges (subject's Left/Right, Anterior/Posterior, Superior/Inferior). */
  edges: { left: string; right: string; top: string; bottom: string };
  /** Voxel index of the section along its normal axis. */
  index: number;
  /** Column and row where the chosen point falls, for a marker. */
  pointColumn: number;
  pointRow: number;
}

/** Section names: axial (normal S), coronal (normal A), sagittal (normal R). */
export type PlaneName = 'axial' | 'coronal' | 'sagittal';

/**
 * Match voxel axes to world axes from the affine: the permutation whose columns point most along
 * x, y, z (largest summed |direction cosine|). The world (RAS+) orientation decides which screen
 * side is the subject's left, whatever order the voxels are stored in; oblique grids are shown in
 * the nearest axis order without resampling.
 * @param affine - voxel -> world
 * @returns the axis for each world direction and its sign
 * @example displayAxes(run.volume.affine)
 */
export function displayAxes(affine: Affine): DisplayAxes {
  const cos = (w: number, i: number) => {
    const len = Math.hypot(affine[i], affine[4 + i], affine[8 + i]) || 1;
    return affine[4 * w + i] / len;
  };
  const perms: Array<[number, number, number]> = [[0, 1, 2], [0, 2, 1], [1, 0, 2], [1, 2, 0], [2, 0, 1], [2, 1, 0]];
  let best = perms[0], bestScore = -1;
  for (const p of perms) {
    const score = Math.abs(cos(0, p[0])) + Math.abs(cos(1, p[1])) + Math.abs(cos(2, p[2]));
    if (score > bestScore + 1e-12) { bestScore = score; best = p; }
  }
  return { axisOf: best, positive: [cos(0, best[0]) >= 0, cos(1, best[1]) >= 0, cos(2, best[2]) >= 0] };
}

/**
 * Cut a section through a 3D map for display: the subject's left on the screen's left, anterior
 * (axial) or superior (coronal, sagittal) at the top, anterior on the right in sagittal sections.
 * @param values - the map, NIfTI order, length nx*ny*nz
 * @param dims - [nx, ny, nz]
 * @param spacingMm - voxel size along i, j, k
 * @param affine - voxel -> world, for orientation
 * @param plane - 'axial', 'coronal' or 'sagittal'
 * @param point - voxel (i, j, k) the section passes through
 * @returns the section with its edge letters
 * @example extractPlane(look.maps.tsnr.data, [64,64,36], [3,3,3.5], affine, 'axial', [32, 32, 18])
 */
export function extractPlane(values: ArrayLike<number>, dims: readonly number[], spacingMm: readonly number[], affine: Affine, plane: PlaneName, point: readonly [number, number, number]): PlaneImage {
  const [nx, ny, nz] = dims;
  if (values.length < nx * ny * nz) fail('INVALID_ARGUMENT', `map length ${values.length} is shorter than ${nx}x${ny}x${nz}`);
  const axes = displayAxes(affine);
  // world axes: horizontal, vertical, normal
  const [hw, vw, nw] = plane === 'axial' ? [0, 1, 2] : plane === 'coronal' ? [0, 2, 1] : [1, 2, 0];
  const ha = axes.axisOf[hw], va = axes.axisOf[vw], na = axes.axisOf[nw];
  const size = [nx, ny, nz];
  const width = size[ha], height = size[va];
  const index = Math.max(0, Math.min(size[na] - 1, Math.round(point[na])));
  const out = new Float32Array(width * height);
  const stride = [1, nx, nx * ny];
  for (let r = 0; r < height; r++) {
    const vi = axes.positive[vw] ? height - 1 - r : r; // world coordinate increases upwards
    for (let c = 0; c < width; c++) {
      const hi = axes.positive[hw] ? c : width - 1 - c; // world coordinate increases to the right
      out[r * width + c] = values[hi * stride[ha] + vi * stride[va] + index * stride[na]];
    }
  }
  const pc = Math.round(point[ha]), pr = Math.round(point[va]);
  const letters = [['L', 'R'], ['P', 'A'], ['I', 'S']];
  return {
    plane, values: out, width, height, pixelMm: [spacingMm[ha], spacingMm[va]], index,
    edges: { left: letters[hw][0], right: letters[hw][1], top: letters[vw][1], bottom: letters[vw][0] },
    pointColumn: axes.positive[hw] ? pc : width - 1 - pc,
    pointRow: axes.positive[vw] ? height - 1 - pr : pr,
  };
}
