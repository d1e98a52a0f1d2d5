import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { edgeSides, type EdgeSides } from './edge-sides.js';

/** The per-volume motion edge signature of a run: see {@link motionEdgeSignature}. */
export interface MotionEdgeSignature {
  /**
   * Per voxel axis (i, j, k of the run's grid): one value per volume, in % of the edge voxels' signal
   * (see motionEdgeSignature); 0 at the first volume (no volume before it).
   */
  axes: [Float64Array, Float64Array, Float64Array];
  /** Root mean square of each axis's values over volumes 1..nt-1 (%): one number to compare before and after correction. */
  rmsPct: [number, number, number];
  /** Edge voxels on the + and - side of each axis (the two means are taken over these). */
  voxels: { plus: [number, number, number]; minus: [number, number, number] };
}

/**
 * The motion edge signature: for each voxel axis, the mean signed change from the volume before in the
 * mask's edge voxels facing + along that axis, minus the same on the edge facing -. Head motion moves
 * the brain's intensity in at one edge and out at the opposite one, so the two changes have opposite
 * signs and the difference is large; a global change (scanner drift, a global signal) moves both edges
 * the same way and cancels. Definitions:
 * - edge voxels: the mask's outer layer (ring 1 of `maskRings`: the voxels one erosion with the
 *   6-neighbour cross removes, i.e. with a face neighbour outside the mask or the grid);
 * - an edge voxel faces +i when its +i neighbour is outside the mask (or the grid), -i likewise; a
 *   voxel open on both sides of an axis (a one-voxel-thin part) counts on neither side of it;
 * - each voxel's change is in % of its mean over the two volumes compared, (x_t - x_{t-1}) /
 *   ((x_t + x_{t-1}) / 2), so a global scaling from one volume to the next gives exactly the same %
 *   everywhere and a signature of 0 (up to rounding), whatever the edges' brightness. The denominator
 *   is kept at least a tenth of the voxel's mean over the run, so a voxel that drops out does not
 *   dominate.
 * Sign: a move of the head towards +i makes the i signature positive (brighter tissue enters the +i
 * edge, darker background the -i edge). Axes are the run's voxel axes, not world axes.
 * Cost: two reads of the edge voxels of every volume, one cache line each: on a 64 x 64 x 36 grid about
 * as slow as a plain pass over the whole run. The look takes the same numbers from its mask-series
 * pass instead (maskSeriesPass, edgeSignatureFromSums), where the edge voxels are already in cache.
 * @param run - 4D run (not modified)
 * @param mask - brain mask on the run's grid (nonzero = in)
 * @returns the signature per axis and volume, its RMS, and the voxel counts
 * @throws BoldsweepError NOT_4D for one volume; GRID_MISMATCH for a mask of another size;
 *   INVALID_ARGUMENT when the mask has no edge on both sides of some axis
 * @example const sig = motionEdgeSignature(run.volume, look.mask.mask); sig.axes[0][40] // % at volume 40, axis i
 */
export function motionEdgeSignature(run: Volume, mask: ArrayLike<number>): MotionEdgeSignature {
  const [nx, ny, nz, nt] = run.dims;
  const n = voxelsPerVolume(run);
  if (nt < 2) fail('NOT_4D', `the edge signature compares volumes: the run has ${nt}`);
  if (mask.length !== n) fail('GRID_MISMATCH', `the mask has ${mask.length} voxels, the run ${n} per volume`);
  const { edge, plus, minus } = edgeSides(mask, [nx, ny, nz]);
  for (let a = 0; a < 3; a++) if (plus[a].length === 0 || minus[a].length === 0) fail('INVALID_ARGUMENT', `the mask has no edge facing ${plus[a].length ? '-' : '+'}${'ijk'[a]}: give a brain mask that lies inside the field of view`);
  // each edge voxel's mean over the run
  const m = edge.length;
  const data = run.data;
  const mean = new Float64Array(m);
  for (let t = 0; t < nt; t++) {
    const base = t * n;
    for (let e = 0; e < m; e++) mean[e] += data[base + edge[e]];
  }
  const floor = new Float64Array(m);
  for (let e = 0; e < m; e++) floor[e] = Math.abs(mean[e] / nt) / 10;
  const change = new Float64Array(m);
  const axes: [Float64Array, Float64Array, Float64Array] = [new Float64Array(nt), new Float64Array(nt), new Float64Array(nt)];
  let before = new Float64Array(m), now = new Float64Array(m);
  for (let e = 0; e < m; e++) before[e] = data[edge[e]];
  for (let t = 1; t < nt; t++) {
    const base = t * n;
    for (let e = 0; e < m; e++) {
      const a = before[e], b = data[base + edge[e]];
      now[e] = b;
      const level = Math.max(Math.abs(a + b) / 2, floor[e]);
      change[e] = level > 0 ? (100 * (b - a)) / level : 0;
    }
    for (let a = 0; a < 3; a++) axes[a][t] = meanAt(change, plus[a]) - meanAt(change, minus[a]);
    [before, now] = [now, before];
  }
  return signatureFromAxes(axes, { plus, minus });
}

/**
 * A signature from its per-axis values: their RMS over volumes 1..nt-1 and the sides' voxel counts.
 * @param axes - per axis, one value per volume (0 at the first)
 * @param sides - the edge voxels facing + and - along each axis
 * @returns the signature
 * @example signatureFromAxes(axes, edgeSides(mask, dims))
 */
export function signatureFromAxes(axes: MotionEdgeSignature['axes'], sides: Pick<EdgeSides, 'plus' | 'minus'>): MotionEdgeSignature {
  const { plus, minus } = sides;
  const nt = axes[0].length;
  const rms = (x: Float64Array) => {
    let s = 0;
    for (let t = 1; t < nt; t++) s += x[t] * x[t];
    return Math.sqrt(s / (nt - 1));
  };
  return {
    axes, rmsPct: [rms(axes[0]), rms(axes[1]), rms(axes[2])],
    voxels: { plus: [plus[0].length, plus[1].length, plus[2].length], minus: [minus[0].length, minus[1].length, minus[2].length] },
  };
}

function meanAt(x: Float64Array, idx: Int32Array): number {
  let s = 0;
  for (let i = 0; i < idx.length; i++) s += x[idx[i]];
  return s / idx.length;
}
