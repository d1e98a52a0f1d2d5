import { applyAffine, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { PHANTOM_TISSUES, TISSUE_LABEL, type PhantomTissue } from './tissue-properties.js';

/** An ellipsoid in world mm. */
export interface Ellipsoid {
  centreMm: Vec3;
  semiAxesMm: Vec3;
}

/**
 * Shape of the phantom head, world mm (RAS+: x to the right, y to the front, z up). The defaults fit
 * a 154 x 182 x 119 mm field of view centred on the origin.
 */
export interface HeadGeometry {
  /** Outer surface of the head (scalp). __Default value:__ centre (0, -2, -4), semi-axes (66, 82, 60) */
  head: Ellipsoid;
  /** Outer surface of the brain (pial envelope at the gyral crowns). __Default value:__ centre (0, -4, -2), semi-axes (56, 70, 48) */
  brain: Ellipsoid;
  /** CSF between the brain envelope and the skull, mm. __Default value:__ 2 */
  csfLayerMm: number;
  /** Cortical grey-matter thickness, measured along the normal of the folded sheet, mm. __Default value:__ 3 */
  cortexThicknessMm: number;
  /** Depth of the deepest sulci below the gyral crowns, mm. __Default value:__ 12 */
  sulcusDepthMm: number;
  /** Half-width (Gaussian sigma) of the dip of the cortical sheet at a sulcus, mm. __Default value:__ 2.5 */
  sulcusHalfWidthMm: number;
  /** Wavelength of the fold pattern; neighbouring sulci lie about half of it apart, mm. __Default value:__ 40 */
  foldWavelengthMm: number;
  /** Half-width of the CSF gap between the hemispheres, mm. __Default value:__ 1.5 */
  fissureHalfWidthMm: number;
  /** World z below which the hemispheres are joined (no fissure), mm. __Default value:__ 8 */
  fissureFloorZMm: number;
  /** Lateral ventricles (CSF), one per hemisphere. */
  ventricles: Ellipsoid[];
  /** Deep grey-matter nuclei. */
  deepGrey: Ellipsoid[];
  /** Air-filled sinus (a sphere, so its field map has a closed form). __Default value:__ centre (0, 50, -44), radius 7 */
  sinus: { centreMm: Vec3; radiusMm: number };
}

/** The default head; see {@link HeadGeometry} for each field. */
export const DEFAULT_HEAD_GEOMETRY: Readonly<HeadGeometry> = Object.freeze({
  head: { centreMm: [0, -2, -4], semiAxesMm: [66, 82, 60] },
  brain: { centreMm: [0, -4, -2], semiAxesMm: [56, 70, 48] },
  csfLayerMm: 2,
  cortexThicknessMm: 3,
  sulcusDepthMm: 12,
  sulcusHalfWidthMm: 2.5,
  foldWavelengthMm: 40,
  fissureHalfWidthMm: 1.5,
  fissureFloorZMm: 8,
  ventricles: [
    { centreMm: [-9, -6, 10], semiAxesMm: [5, 24, 7] },
    { centreMm: [9, -6, 10], semiAxesMm: [5, 24, 7] },
  ],
  deepGrey: [
    { centreMm: [-11, -14, -2], semiAxesMm: [7, 11, 8] },
    { centreMm: [11, -14, -2], semiAxesMm: [7, 11, 8] },
    { centreMm: [-22, 4, 0], semiAxesMm: [5, 13, 9] },
    { centreMm: [22, 4, 0], semiAxesMm: [5, 13, 9] },
  ],
  sinus: { centreMm: [0, 50, -44], radiusMm: 7 },
} satisfies HeadGeometry);

/** Tissue composition of every voxel of a grid. */
export interface HeadAnatomy {
  /** Fraction of each voxel made of each tissue, one array per entry of {@link PHANTOM_TISSUES} (air is the rest). */
  fractions: Record<PhantomTissue, Float32Array>;
  /** The tissue with the largest fraction (labels of {@link TISSUE_LABEL}; 0 = air). */
  labels: Uint8Array;
}

// Fixed directions of the folding waves: a spiral on the sphere, so the pattern has no preferred axis
const FOLD_WAVES: ReadonlyArray<{ dir: Vec3; phase: number }> = Array.from({ length: 7 }, (_, m) => {
  const z = 1 - (2 * (m + 0.5)) / 7;
  const r = Math.sqrt(1 - z * z);
  const lon = m * Math.PI * (3 - Math.sqrt(5));
  return { dir: [r * Math.cos(lon), r * Math.sin(lon), z] as Vec3, phase: 1.3 * m * m + 0.7 };
});

/** Normalised radius of p in an ellipsoid (1 on the surface). */
function ellipsoidRadius(e: Ellipsoid, x: number, y: number, z: number): number {
  const dx = (x - e.centreMm[0]) / e.semiAxesMm[0];
  const dy = (y - e.centreMm[1]) / e.semiAxesMm[1];
  const dz = (z - e.centreMm[2]) / e.semiAxesMm[2];
  return Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/**
 * A point classifier for one geometry: returns the label (see {@link TISSUE_LABEL}) at a world point.
 * The cortex is a sheet of constant thickness whose mid-surface lies at depth
 * m = T/2 + D h(s) below the brain envelope, where s is a sum of plane waves evaluated on the
 * envelope (a fold pattern) and h rises from 0 on the gyral crowns to 1 at the sulcal fundi; CSF
 * fills the grooves above the sheet and white matter lies below it. Distances to the sheet are
 * taken along its normal (depth offset divided by the gradient length), so steep sulcal banks keep
 * the same thickness as the crowns.
 * @param g - head geometry
 * @returns classifier (x, y, z) -> label
 * @example const labelAt = headClassifier(DEFAULT_HEAD_GEOMETRY); labelAt(0, 0, 0)
 */
export function headClassifier(g: HeadGeometry): (x: number, y: number, z: number) => number {
  const b = g.brain;
  const k = (2 * Math.PI) / g.foldWavelengthMm;
  const halfT = g.cortexThicknessMm / 2;
  const sheetOffset = (x: number, y: number, z: number): number => {
    // depth below the envelope along the ray from the centre, and the envelope point on that ray
    const r = ellipsoidRadius(b, x, y, z);
    const dx = x - b.centreMm[0], dy = y - b.centreMm[1], dz = z - b.centreMm[2];
    const dist = Math.sqrt(dx * dx + dy * dy + dz * dz);
    if (r < 1e-9) return Math.min(...b.semiAxesMm);
    const depth = dist * (1 / r - 1);
    const bx = b.centreMm[0] + dx / r, by = b.centreMm[1] + dy / r, bz = b.centreMm[2] + dz / r;
    // fold pattern s and its gradient along the envelope (the normal component removed)
    let s = 0, gx = 0, gy = 0, gz = 0;
    for (const w of FOLD_WAVES) {
      const arg = k * (w.dir[0] * bx + w.dir[1] * by + w.dir[2] * bz) + w.phase;
      s += Math.cos(arg);
      const d = -k * Math.sin(arg);
      gx += d * w.dir[0]; gy += d * w.dir[1]; gz += d * w.dir[2];
    }
    let nx = dx / (r * b.semiAxesMm[0] ** 2), ny = dy / (r * b.semiAxesMm[1] ** 2), nz = dz / (r * b.semiAxesMm[2] ** 2);
    const nl = Math.hypot(nx, ny, nz);
    nx /= nl; ny /= nl; nz /= nl;
    const gn = gx * nx + gy * ny + gz * nz;
    const gt = Math.hypot(gx - gn * nx, gy - gn * ny, gz - gn * nz);
    // sulci run along the zero lines of the pattern (a meandering network, like real sulci); the
    // distance to the nearest zero line is about |s| / |grad s|, and the mid-surface dips by up to
    // D in a groove of fixed width around each line
    const lineDistMm = Math.abs(s) / Math.max(gt, 1e-9);
    const h = Math.exp(-0.5 * (lineDistMm / g.sulcusHalfWidthMm) ** 2);
    return depth - (halfT + g.sulcusDepthMm * h);
  };
  const inside = (e: Ellipsoid, x: number, y: number, z: number) => ellipsoidRadius(e, x, y, z) <= 1;
  return (x, y, z) => {
    if (ellipsoidRadius(g.head, x, y, z) > 1) return TISSUE_LABEL.air;
    const sx = x - g.sinus.centreMm[0], sy = y - g.sinus.centreMm[1], sz = z - g.sinus.centreMm[2];
    if (sx * sx + sy * sy + sz * sz <= g.sinus.radiusMm ** 2) return TISSUE_LABEL['sinus-air'];
    const r = ellipsoidRadius(b, x, y, z);
    if (r > 1) {
      const dx = x - b.centreMm[0], dy = y - b.centreMm[1], dz = z - b.centreMm[2];
      const outside = Math.sqrt(dx * dx + dy * dy + dz * dz) * (1 - 1 / r);
      return outside <= g.csfLayerMm ? TISSUE_LABEL.csf : TISSUE_LABEL.extracerebral;
    }
    for (const v of g.ventricles) if (inside(v, x, y, z)) return TISSUE_LABEL.csf;
    const mid = Math.abs(x - b.centreMm[0]);
    if (z > g.fissureFloorZMm) {
      if (mid <= g.fissureHalfWidthMm) return TISSUE_LABEL.csf;
      if (mid <= g.fissureHalfWidthMm + g.cortexThicknessMm) return TISSUE_LABEL['grey-matter'];
    }
    for (const v of g.deepGrey) if (inside(v, x, y, z)) return TISSUE_LABEL['grey-matter'];
    const f = sheetOffset(x, y, z);
    if (Math.abs(f) <= halfT) return TISSUE_LABEL['grey-matter'];
    // steep banks: the normal distance |f| / |grad f| can be within the sheet although |f| is not
    if (Math.abs(f) < 8 * halfT) {
      const e = 0.25;
      const gx = (sheetOffset(x + e, y, z) - sheetOffset(x - e, y, z)) / (2 * e);
      const gy = (sheetOffset(x, y + e, z) - sheetOffset(x, y - e, z)) / (2 * e);
      const gz = (sheetOffset(x, y, z + e) - sheetOffset(x, y, z - e)) / (2 * e);
      const normal = f / Math.max(Math.hypot(gx, gy, gz), 1e-6);
      if (Math.abs(normal) <= halfT) return TISSUE_LABEL['grey-matter'];
      return normal < 0 ? TISSUE_LABEL.csf : TISSUE_LABEL['white-matter'];
    }
    return f < 0 ? TISSUE_LABEL.csf : TISSUE_LABEL['white-matter'];
  };
}

/**
 * Partial-volume tissue fractions and a label map of the phantom head on a voxel grid, by
 * classifying `supersample`^3 evenly spaced points inside each voxel.
 * @param dims - [nx, ny, nz]
 * @param affine - voxel -> world mm
 * @param geometry - head shape
 * @param supersample - points per voxel edge. __Default value:__ 3
 * @returns fractions per tissue and the majority label
 * @example const anat = headAnatomy([44, 52, 34], affine, DEFAULT_HEAD_GEOMETRY)
 */
export function headAnatomy(dims: readonly [number, number, number], affine: Affine, geometry: HeadGeometry, supersample = 3): HeadAnatomy {
  if (!Number.isInteger(supersample) || supersample < 1 || supersample > 8) fail('INVALID_ARGUMENT', `supersample must be an integer in 1..8, got ${supersample}`);
  const [nx, ny, nz] = dims;
  const n = nx * ny * nz;
  const counts = PHANTOM_TISSUES.map(() => new Float32Array(n));
  const labels = new Uint8Array(n);
  const labelAt = headClassifier(geometry);
  const tally = new Float64Array(PHANTOM_TISSUES.length + 1);
  const offsets = Array.from({ length: supersample }, (_, s) => (s + 0.5) / supersample - 0.5);
  const per = 1 / supersample ** 3;
  let p = 0;
  for (let k = 0; k < nz; k++) {
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++, p++) {
        tally.fill(0);
        for (const ok of offsets) for (const oj of offsets) for (const oi of offsets) {
          const w = applyAffine(affine, [i + oi, j + oj, k + ok]);
          tally[labelAt(w[0], w[1], w[2])] += per;
        }
        let best = 0;
        for (let t = 1; t < tally.length; t++) {
          counts[t - 1][p] = tally[t];
          if (tally[t] > tally[best]) best = t;
        }
        labels[p] = best;
      }
    }
  }
  const fractions = Object.fromEntries(PHANTOM_TISSUES.map((t, idx) => [t, counts[idx]])) as Record<PhantomTissue, Float32Array>;
  return { fractions, labels };
}
