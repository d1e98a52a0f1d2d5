import { composeAffine, diagonalAffine, invertAffine, type Affine, type Vec3 } from '../core/affine.js';
import type { Grid } from '../core/grid-frame.js';
import { rigidMotionAffine } from '../acquire/rigid-motion-affine.js';
import type { PhantomSpec } from './phantom-spec.js';

/** Grids of the phantom's structural image and template, and the true world-to-world maps between them and the run. */
export interface PhantomAnatomyGrids {
  /** The run's grid (voxel -> world mm). */
  run: Grid;
  /** The structural image's grid, or null when the spec has none. */
  structural: Grid | null;
  /** The template's grid (voxel -> template world mm), or null when the spec has none. */
  template: Grid | null;
  /** Run reference-frame world mm -> structural world mm (the head's pose in the structural scan), or null. */
  structuralFromReference: Affine | null;
  /** Run reference-frame world mm -> template world mm, or null. */
  templateFromReference: Affine | null;
  /** Structural world mm -> template world mm (templateFromReference after the inverse pose), or null when either is absent. */
  templateFromStructural: Affine | null;
}

/** The grid of a phantom image centred on the world origin (as the run's). */
function centredGrid(dims: readonly [number, number, number], spacingMm: readonly [number, number, number]): Grid {
  const origin = [0, 1, 2].map((a) => (-(dims[a] - 1) / 2) * spacingMm[a]) as Vec3;
  return { dims: [dims[0], dims[1], dims[2]], affine: diagonalAffine([spacingMm[0], spacingMm[1], spacingMm[2]], origin) };
}

/**
 * The phantom's grids and the true transforms between the run's reference frame, the structural
 * image and the template, from the spec alone (so the truth file can state them and tests can
 * check an alignment against them). Every map is world mm -> world mm, row-major 4x4.
 * @param spec - a resolved phantom spec
 * @returns the grids and transforms (null for the parts the spec leaves out)
 * @example const { templateFromStructural } = phantomAnatomyGrids(demoPhantomSpec())
 */
export function phantomAnatomyGrids(spec: PhantomSpec): PhantomAnatomyGrids {
  const run = centredGrid(spec.dims, spec.spacingMm);
  let structural: Grid | null = null, structuralFromReference: Affine | null = null;
  if (spec.structural) {
    const s = spec.structural;
    structural = centredGrid(s.dims, s.spacingMm);
    const [sx, sy, sz] = s.pose.shiftMm, [rx, ry, rz] = s.pose.rotationDeg;
    structuralFromReference = rigidMotionAffine({ shiftXMm: sx, shiftYMm: sy, shiftZMm: sz, rotXDeg: rx, rotYDeg: ry, rotZDeg: rz }, [0, 0, 0]);
  }
  let template: Grid | null = null, templateFromReference: Affine | null = null;
  if (spec.template) {
    const t = spec.template;
    const h = t.spacingMm;
    template = { dims: [...t.dims], affine: diagonalAffine([h, h, h], [-t.originVoxel[0] * h, -t.originVoxel[1] * h, -t.originVoxel[2] * h]) };
    const r = t.fromReferenceRows;
    templateFromReference = Float64Array.from([...r[0], ...r[1], ...r[2], 0, 0, 0, 1]);
  }
  const templateFromStructural = templateFromReference && structuralFromReference ? composeAffine(templateFromReference, invertAffine(structuralFromReference)) : null;
  return { run, structural, template, structuralFromReference, templateFromReference, templateFromStructural };
}
