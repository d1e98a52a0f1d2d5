import type { Grid } from '../core/grid-frame.js';

/**
 * What alignment estimated, as plain data (it goes through the sweep's estimate cache as JSON):
 * the grids of the run, the structural image and the template, and the world-to-world maps
 * between them (row-major 4x4 as 16 numbers; a point p of the first space is M p in the second).
 */
export interface AlignmentEstimate {
  /** The run's grid (its reference frame's world). */
  runGrid: Grid;
  /** The structural image's grid (structural world). */
  structuralGrid: Grid;
  /** The template's grid (template world). */
  templateGrid: Grid;
  /** Run reference-frame world -> structural world (rigid: run mean to structural). */
  structuralFromReference: number[];
  /** Structural world -> template world (affine). */
  templateFromStructural: number[];
  /**
   * Per volume: reference-frame world -> that volume's world (its head pose; the affine resampling
   * takes to undo the motion), or null when motion is not corrected within this step.
   */
  volumeFromReference: number[][] | null;
  /** Final registration costs and what was used, for the step note. */
  diagnostics: Record<string, number | string>;
}

/** A grid as plain data (dims and 16 affine numbers) for JSON and structured cloning. */
export function plainGrid(g: Grid): Grid {
  return { dims: [g.dims[0], g.dims[1], g.dims[2]], affine: Float64Array.from(g.affine) };
}
