import { applyAffine, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { createRng } from '../core/random.js';
import { assertSameGrid, makeVolume, voxelsPerVolume, type Volume } from '../core/volume.js';
import { placeCentres } from './plant-placement.js';
import { blobProfile, blobSizeMm, checkBlobShape, type BlobShapeSpec } from './plant-profile.js';

/** Options of {@link plantActivations}. Sizes in mm, amplitude in percent of the voxel's baseline. */
export interface PlantOptions {
  /** Number of planted activations (integer >= 1). */
  count: number;
  /** Blob shape. __Default value:__ `'gaussian'`. */
  shape?: 'gaussian' | 'sphere';
  /** FWHM in mm of a Gaussian blob (required when shape is 'gaussian'). */
  fwhmMm?: number;
  /** Radius in mm of a sphere, where its weight is one half (required when shape is 'sphere'). */
  radiusMm?: number;
  /** Width in mm of a sphere's raised-cosine edge (0 = hard edge). __Default value:__ the smallest voxel spacing. */
  edgeMm?: number;
  /** Signal change at the blob centre at the time-course peak, in percent of the voxel's temporal mean. */
  amplitudePct: number;
  /**
   * Time course, one value per volume, usually the task regressor (events convolved with the HRF).
   * It is rescaled to a maximum of 1, so `amplitudePct` is the percent signal change at the peak.
   */
  timeCourse: ArrayLike<number>;
  /** Where centres may go (e.g. grey matter): a 3D volume on the run's grid or a per-voxel array; nonzero = allowed. */
  placementMask: Volume | ArrayLike<number>;
  /** Seed of the random placement; same inputs and seed give byte-identical outputs. */
  seed: number;
  /** Smallest centre-to-centre distance as a multiple of the blob size (FWHM, or sphere diameter). __Default value:__ 2. */
  separation?: number;
  /** Centres stay at least this far (mm) inside the placement mask's edge. __Default value:__ half the blob size. */
  marginMm?: number;
  /** A voxel belongs to a blob's truth when the blob's weight there is at least this. __Default value:__ 0.5 (half maximum). */
  truthFraction?: number;
  /** Random draws allowed before giving up with PLANTING_DOES_NOT_FIT. __Default value:__ 1000. */
  maxAttempts?: number;
}

/** One planted activation. */
export interface PlantedBlob {
  /** Centre in voxel indices [i, j, k] (centres sit on voxel centres). */
  centreVoxel: Vec3;
  /** Centre in world mm (RAS+). */
  centreMm: Vec3;
  /** Voxels (NIfTI order) where this blob's weight >= truthFraction. */
  truthVoxels: Int32Array;
}

/** The ground truth kept with a planted run, in the run's (scanner) space. */
export interface PlantTruth {
  /** Grid of the run: [nx, ny, nz]. */
  dims: [number, number, number];
  /** Voxel -> world affine of the run. */
  affine: Affine;
  /** Shape and sizes of every blob. */
  shape: BlobShapeSpec;
  /** Blob size in mm: FWHM of a Gaussian, diameter of a sphere. */
  sizeMm: number;
  /** Peak percent signal change at each blob centre. */
  amplitudePct: number;
  /** Weight at or above which a voxel counts as truth. */
  truthFraction: number;
  /** Seed the centres were drawn with. */
  seed: number;
  /** 1 where some blob's weight >= truthFraction, else 0; length nx*ny*nz. */
  mask: Uint8Array;
  /** Spatial weight (sum over blobs, 1 at each centre), length nx*ny*nz. */
  profile: Float32Array;
  /** Time course actually planted, maximum 1, one value per volume. */
  timeCourse: Float64Array;
  /** Blob centres in world mm. */
  centresMm: Vec3[];
  /** Blob centres in voxel indices. */
  centresVoxel: Vec3[];
  /** Per-blob details, same order as the centres. */
  blobs: PlantedBlob[];
}

/**
 * Plant known activations into a raw run. Each voxel v at volume t receives
 * `amplitudePct/100 * baseline[v] * profile[v] * timeCourse[t]`, where baseline is the voxel's
 * temporal mean in the input, profile the summed blob weights and timeCourse the given regressor
 * scaled to a maximum of 1. Centres are drawn at random (seeded) inside the placement mask, away
 * from its edge and from each other.
 * @param volume - the raw 4D run (not modified)
 * @param options - blob shape, size, count, amplitude, time course, mask, seed
 * @returns the new run and its ground truth
 * @throws BoldsweepError INVALID_ARGUMENT for bad sizes or time course, NOT_4D for a 3D image,
 *   GRID_MISMATCH for a mask on another grid, PLANTING_DOES_NOT_FIT when the blobs do not fit
 * @example
 * const { volume, truth } = plantActivations(run.volume, { count: 6, fwhmMm: 6, amplitudePct: 1,
 *   timeCourse: regressor, placementMask: greyMatter, seed: 7 })
 */
export function plantActivations(volume: Volume, options: PlantOptions): { volume: Volume; truth: PlantTruth } {
  const [nx, ny, nz, nt] = volume.dims;
  const n = voxelsPerVolume(volume);
  if (nt < 2) fail('NOT_4D', `planting needs a run with several volumes, got ${nt}`);
  const spec = shapeFromOptions(options, volume.spacingMm);
  const sizeMm = blobSizeMm(spec);
  const count = options.count;
  if (!Number.isInteger(count) || count < 1) fail('INVALID_ARGUMENT', `count must be an integer >= 1, got ${count}`);
  if (!Number.isFinite(options.amplitudePct)) fail('INVALID_ARGUMENT', `amplitudePct must be a finite number, got ${options.amplitudePct}`);
  const separation = options.separation ?? 2;
  if (!(separation >= 0) || !Number.isFinite(separation)) fail('INVALID_ARGUMENT', `separation must be >= 0, got ${separation}`);
  const marginMm = options.marginMm ?? sizeMm / 2;
  if (!(marginMm >= 0) || !Number.isFinite(marginMm)) fail('INVALID_ARGUMENT', `marginMm must be >= 0 mm, got ${marginMm}`);
  const truthFraction = options.truthFraction ?? 0.5;
  if (!(truthFraction > 0 && truthFraction <= 1)) fail('INVALID_ARGUMENT', `truthFraction must be in (0, 1], got ${truthFraction}`);
  const maxAttempts = options.maxAttempts ?? 1000;
  if (!Number.isInteger(maxAttempts) || maxAttempts < 1) fail('INVALID_ARGUMENT', `maxAttempts must be an integer >= 1, got ${maxAttempts}`);
  if (!Number.isInteger(options.seed) || options.seed < 0 || options.seed >= 2 ** 32) fail('INVALID_ARGUMENT', `seed must be an integer in [0, 2^32), got ${options.seed}`);
  const timeCourse = peakOneTimeCourse(options.timeCourse, nt);
  const mask = placementMaskArray(options.placementMask, volume);

  // 1. centres
  const rng = createRng(options.seed);
  const centresVoxel = placeCentres(mask, volume.dims, volume.affine, { count, minDistanceMm: separation * sizeMm, marginMm, maxAttempts }, rng);

  // 2. spatial profile and truth
  const profile = new Float32Array(n);
  const truthMask = new Uint8Array(n);
  const blobs: PlantedBlob[] = centresVoxel.map((c) => {
    const p = blobProfile([nx, ny, nz], volume.affine, c, spec);
    const truthVoxels: number[] = [];
    for (let m = 0; m < p.index.length; m++) {
      profile[p.index[m]] += p.weight[m];
      if (p.weight[m] >= truthFraction) { truthVoxels.push(p.index[m]); truthMask[p.index[m]] = 1; }
    }
    return { centreVoxel: c, centreMm: applyAffine(volume.affine, c), truthVoxels: Int32Array.from(truthVoxels) };
  });

  // 3. add amplitude * baseline * profile * time course (baseline = temporal mean of the input)
  const data = new Float32Array(volume.data);
  const scale = options.amplitudePct / 100;
  for (let v = 0; v < n; v++) {
    if (profile[v] === 0) continue;
    let sum = 0;
    for (let t = 0; t < nt; t++) sum += volume.data[v + n * t];
    const peak = scale * (sum / nt) * profile[v];
    for (let t = 0; t < nt; t++) data[v + n * t] += peak * timeCourse[t];
  }

  const out = makeVolume({ dims: [nx, ny, nz, nt], spacingMm: [...volume.spacingMm], trSec: volume.trSec, affine: new Float64Array(volume.affine), data });
  const truth: PlantTruth = {
    dims: [nx, ny, nz], affine: new Float64Array(volume.affine), shape: spec, sizeMm,
    amplitudePct: options.amplitudePct, truthFraction, seed: options.seed,
    mask: truthMask, profile, timeCourse,
    centresMm: blobs.map((b) => b.centreMm), centresVoxel: blobs.map((b) => b.centreVoxel), blobs,
  };
  return { volume: out, truth };
}

function shapeFromOptions(o: PlantOptions, spacingMm: readonly number[]): BlobShapeSpec {
  const shape = o.shape ?? 'gaussian';
  if (shape === 'gaussian') {
    if (o.fwhmMm === undefined) fail('INVALID_ARGUMENT', 'fwhmMm is required for gaussian blobs');
    return checkBlobShape({ shape, fwhmMm: o.fwhmMm });
  }
  if (shape === 'sphere') {
    if (o.radiusMm === undefined) fail('INVALID_ARGUMENT', 'radiusMm is required for sphere blobs');
    return checkBlobShape({ shape, radiusMm: o.radiusMm, edgeMm: o.edgeMm ?? Math.min(...spacingMm) });
  }
  return fail('INVALID_ARGUMENT', `shape must be 'gaussian' or 'sphere', got '${String(shape)}'`);
}

function peakOneTimeCourse(tc: ArrayLike<number>, nt: number): Float64Array {
  if (!tc || tc.length !== nt) fail('INVALID_ARGUMENT', `timeCourse must have one value per volume (${nt}), got ${tc ? tc.length : 'none'}`);
  let max = -Infinity;
  for (let t = 0; t < nt; t++) {
    if (!Number.isFinite(tc[t])) fail('INVALID_ARGUMENT', `timeCourse[${t}] is not finite (${tc[t]})`);
    if (tc[t] > max) max = tc[t];
  }
  if (!(max > 0)) fail('INVALID_ARGUMENT', `timeCourse must have a positive maximum to scale to 1, got ${max}`);
  const out = new Float64Array(nt);
  for (let t = 0; t < nt; t++) out[t] = tc[t] / max;
  return out;
}

function placementMaskArray(mask: Volume | ArrayLike<number>, volume: Volume): ArrayLike<number> {
  const n = voxelsPerVolume(volume);
  if (isVolume(mask)) {
    assertSameGrid(mask, volume, ['placement mask', 'run']);
    if (mask.dims[3] !== 1) fail('INVALID_ARGUMENT', `placement mask must be a 3D image, got ${mask.dims[3]} volumes`);
    return mask.data;
  }
  if (!mask || mask.length !== n) fail('GRID_MISMATCH', `placement mask has ${mask ? mask.length : 0} voxels, the run grid has ${n}`);
  return mask;
}

function isVolume(x: unknown): x is Volume {
  return typeof x === 'object' && x !== null && 'dims' in x && 'data' in x && 'affine' in x;
}
