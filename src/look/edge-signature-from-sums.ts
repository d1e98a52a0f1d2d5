import type { EdgeSides } from './edge-sides.js';
import type { MotionEdgeSignature } from './motion-edge-signature.js';

/**
 * The motion edge signature from the per-volume sums of the edge voxels' % changes on each side (what
 * maskSeriesPass accumulates): the same numbers motionEdgeSignature computes from the run, because the
 * sums are added in the same order.
 * @param sideSums - at [6 t + s]: side s (2a facing + along axis a, 2a + 1 facing -) of volume t
 * @param sides - the edge voxels and their sides (every side non-empty)
 * @param nt - volumes
 * @returns the signature
 * @example const sig = edgeSignatureFromSums(pass.sideSums, edgeSides(mask, dims), nt)
 */
export function edgeSignatureFromSums(sideSums: Float64Array, sides: EdgeSides, nt: number): MotionEdgeSignature {
  const { plus, minus } = sides;
  const axes: [Float64Array, Float64Array, Float64Array] = [new Float64Array(nt), new Float64Array(nt), new Float64Array(nt)];
  for (let t = 1; t < nt; t++) {
    for (let a = 0; a < 3; a++) axes[a][t] = sideSums[6 * t + 2 * a] / plus[a].length - sideSums[6 * t + 2 * a + 1] / minus[a].length;
  }
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
