import type { EdgeSides } from './edge-sides.js';
import { signatureFromAxes, type MotionEdgeSignature } from './motion-edge-signature.js';

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
  return signatureFromAxes(axes, sides);
}
