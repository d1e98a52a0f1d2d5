import type { Affine } from './affine.js';

/** A 3D voxel grid placed in world space (RAS+ mm): the run's grid, or a target grid. */
export interface Grid {
  /** Voxels along i, j, k. */
  dims: [number, number, number];
  /** Voxel index -> world mm, row-major 4x4. */
  affine: Affine;
}

/**
 * Where a run's voxels live, as a sweep tracks it through a recipe:
 * - `raw`: the run's own grid as acquired; the head may be in a different pose in each volume, and
 *   the B0 field displaces the signal along the phase-encode axis;
 * - `reference`: the run's own grid with every volume brought back to the head's reference pose
 *   (after motion correction, or unwarping, that resamples onto the same grid);
 * - `target`: another grid (voxel size and/or affine) in the reference frame's world space.
 * The planted truth lives in the reference frame on the run's grid; scoring carries it into a
 * cell's output frame (see DEVELOPERS.md, "Frames").
 */
export type Frame =
  | { kind: 'raw' }
  | { kind: 'reference' }
  | { kind: 'target'; grid: Grid };
