import type { AcquisitionModel } from '../acquire/acquisition-model.js';
import { distortLines } from '../acquire/distort-lines.js';
import { headFieldShiftVoxels } from '../acquire/head-field-shift-voxels.js';
import { applyAffine, composeAffine, invertAffine, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { createRng } from '../core/random.js';
import { assertSameGrid, makeVolume, sameGrid, voxelsPerVolume, type Volume } from '../core/volume.js';
import { posedBlobBox } from './posed-blob-box.js';
import { posedBlobWeights } from './posed-blob-weights.js';
import { placeCentres } from './plant-placement.js';
import { blobTruth } from './blob-truth.js';
import { blobSizeMm, blobSupportMm, checkBlobShape, type BlobShapeSpec } from './plant-profile.js';

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
  /**
   * How the run was acquired (src/acquire): the head's pose at each volume, the B0 displacement,
   * the slice times. The blobs are fixed to the head: at volume t each raw voxel gets the blob
   * weight of the head position it saw (through the inverse pose, and the field map's displacement
   * along phase encode). __Default value:__ none: the head still, no displacement, every slice at
   * once (planting in fixed scanner voxels, as a run without these facts has it)
   */
  acquisition?: AcquisitionModel | null;
  /**
   * One time course per slice along the acquisition's slice axis (the k axis without an acquisition),
   * each with one value per volume: the regressor sampled at each slice's acquisition time
   * ({@link plantTimeCourses} makes them on `timeCourse`'s scale). Required when the acquisition has
   * slice times. __Default value:__ none: every slice follows `timeCourse`
   */
  sliceTimeCourses?: readonly ArrayLike<number>[] | null;
  /**
   * Blob centres in (possibly fractional) voxel indices of the run's grid, one per blob, instead of
   * drawing them (a study plants the group's blobs displaced per subject). `count` must equal their
   * number; the placement mask, margin and separation are then not used. __Default value:__ drawn
   */
  centresVoxel?: readonly Vec3[] | null;
  /**
   * Return only the planted voxels' series instead of a planted copy of the run: the result's
   * `volume` is then the input run itself (not copied, not modified) and `plantedSeries` holds every
   * voxel planting can change, with its whole planted series (the same values the copy would hold).
   * A sweep worker so keeps a planting at the size of its blobs. __Default value:__ false
   */
  seriesOnly?: boolean;
}

/** The voxels a planting can change, with their planted series (from {@link PlantOptions.seriesOnly}). */
export interface PlantedSeries {
  /** Voxel indices within one volume, ascending. */
  voxels: Int32Array;
  /** Planted values, volume by volume: volume t, voxel q at t * voxels.length + q. */
  values: Float32Array;
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

/**
 * The ground truth kept with a planted run: in the reference frame (the head in its reference
 * position) on the run's grid. Without an acquisition model the reference frame and the raw scanner
 * voxels coincide. `centresMm` and `shape` describe the blobs analytically, so the truth can be
 * evaluated on any other grid of the reference frame ({@link truthOnGrid}).
 */
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
  /**
   * Time course planted, one value per volume, at the model's sample time of each volume; maximum 1
   * (at most 1 with slice times: all courses share the scale of the largest planted value).
   */
  timeCourse: Float64Array;
  /** Time course planted in each slice (along the acquisition's slice axis), same scale; absent or null when every slice followed `timeCourse`. */
  sliceTimeCourses?: Float64Array[] | null;
  /** What of the acquisition the planting followed; absent when planted without an acquisition model. */
  acquired?: {
    /** Volumes in which the head was away from its reference pose. */
    movedVolumes: number;
    /** Whether signal was displaced by a field map. */
    fieldMap: boolean;
    /** Whether each slice was sampled at its own time. */
    sliceTimed: boolean;
  };
  /** Blob centres in world mm. */
  centresMm: Vec3[];
  /** Blob centres in voxel indices. */
  centresVoxel: Vec3[];
  /** Per-blob details, same order as the centres. */
  blobs: PlantedBlob[];
}

/**
 * Plant known activations into a raw run. Each voxel v at volume t receives
 * `amplitudePct/100 * baseline[v] * weight_t[v] * course[t]`, where baseline is the voxel's temporal
 * mean in the input, weight_t the summed blob weights the voxel sees at volume t and course the given
 * regressor (of the voxel's slice, when slices are timed), all courses scaled by one factor to a
 * largest value of 1. Centres are drawn at random (seeded) inside the placement mask, away from its
 * edge and from each other, in the reference frame on the run's grid.
 *
 * Following the acquisition (`options.acquisition`): the blobs are fixed to the head, so at volume t
 * raw voxel x sees the head at inverse(pose_t)(x) and gets the analytic blob weight there. With a
 * field map, the posed weight image is displaced along phase encode by the field (moved with the
 * head) with {@link distortLines}, the kernel the digital phantom distorts with; the weight is the
 * displaced weight image over the displaced unit image (the mean blob weight of the head positions
 * whose signal lands in the voxel, for a baseline that varies slowly over the displacement; the
 * raw baseline already carries the pile-up and thinning). Only voxels the blobs can reach are
 * touched (the blobs' support carried by every pose; with a field map, the stretch of each
 * phase-encode line through the blobs that displaced signal can reach).
 * With no acquisition, identity poses, no field map and no slice times the output is byte-identical
 * to planting in fixed scanner voxels.
 * @param volume - the raw 4D run (not modified)
 * @param options - blob shape, size, count, amplitude, time course (and per-slice courses), mask, seed,
 *   acquisition model
 * @returns the new run and its ground truth (reference frame, run's grid); with seriesOnly the input run itself and the planted voxels' series (`plantedSeries`)
 * @throws BoldsweepError INVALID_ARGUMENT for bad sizes or time courses (or slice time courses
 *   missing when the acquisition has slice times), NOT_4D for a 3D image, GRID_MISMATCH for a mask
 *   or an acquisition model on another grid, PLANTING_DOES_NOT_FIT when the blobs do not fit
 * @example
 * const { volume, truth } = plantActivations(run.volume, { count: 6, fwhmMm: 6, amplitudePct: 1,
 *   timeCourse: regressor, placementMask: greyMatter, seed: 7 })
 * // following the acquisition: acquisitionModel(run, { motionTable }), courses from plantTimeCourses
 * plantActivations(run.volume, { ...options, timeCourse, sliceTimeCourses, acquisition: model })
 */
export function plantActivations(volume: Volume, options: PlantOptions): { volume: Volume; truth: PlantTruth; plantedSeries?: PlantedSeries } {
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
  const acquisition = checkAcquisition(options.acquisition ?? null, volume);
  const sliceAxis = acquisition ? acquisition.sliceAxis : 2;
  const { timeCourse, sliceTimeCourses } = peakOneTimeCourses(options.timeCourse, options.sliceTimeCourses ?? null, nt, volume.dims[sliceAxis]);
  if (acquisition?.sliceTimesSec && !sliceTimeCourses) fail('INVALID_ARGUMENT', 'the acquisition has slice times: pass sliceTimeCourses, one per slice (plantTimeCourses makes them)');
  const mask = placementMaskArray(options.placementMask, volume);

  // 1. centres (given, or drawn at random inside the mask)
  const rng = createRng(options.seed);
  const centresVoxel = options.centresVoxel ? givenCentres(options.centresVoxel, count)
    : placeCentres(mask, volume.dims, volume.affine, { count, minDistanceMm: separation * sizeMm, marginMm, maxAttempts }, rng);

  // 2. spatial profile and truth (reference frame)
  const { profile, mask: truthMask, blobs } = blobTruth([nx, ny, nz], volume.affine, centresVoxel, spec, truthFraction);
  const centresMm = blobs.map((b) => b.centreMm);

  // 3. add amplitude * baseline * weight_t * course (baseline = temporal mean of the input)
  const seriesOnly = options.seriesOnly ?? false;
  const data = seriesOnly ? null : new Float32Array(volume.data);
  const poses = acquisition?.poses?.map((p) => (isIdentity(p) ? null : p)) ?? null;
  const moved = poses ? poses.filter((p) => p !== null).length : 0;
  const b0 = acquisition?.b0 ?? null;
  const weights = moved > 0 || b0 ? new VolumeWeights(volume, profile, centresMm, spec, poses, b0) : null;
  const voxels = weights ? weights.voxels : nonZero(profile);
  const slices = sliceIndices(voxels, volume.dims, sliceAxis);
  // volume by volume (the voxels are in storage order, so reads stay near each other); each voxel's
  // sum still adds its values in time order
  const baseline = new Float64Array(voxels.length);
  for (let t = 0; t < nt; t++) {
    const offset = n * t;
    for (let q = 0; q < voxels.length; q++) baseline[q] += volume.data[voxels[q] + offset];
  }
  for (let q = 0; q < voxels.length; q++) baseline[q] /= nt;
  const scale = options.amplitudePct / 100;
  // series only: the voxels' own values, volume by volume, planted in place of the copy's
  const m = voxels.length;
  const values = seriesOnly ? new Float32Array(m * nt) : null;
  for (let t = 0; t < nt; t++) {
    const w = weights ? weights.at(t) : profile;
    const offset = n * t;
    if (values) for (let q = 0; q < m; q++) values[t * m + q] = volume.data[voxels[q] + offset];
    for (let q = 0; q < m; q++) {
      const v = voxels[q];
      if (w[v] === 0) continue;
      const course = sliceTimeCourses ? sliceTimeCourses[slices[q]] : timeCourse;
      const add = scale * baseline[q] * w[v] * course[t];
      if (values) values[t * m + q] += add;
      else data![v + offset] += add;
    }
  }

  const out = data ? makeVolume({ dims: [nx, ny, nz, nt], spacingMm: [...volume.spacingMm], trSec: volume.trSec, affine: new Float64Array(volume.affine), data }) : volume;
  const truth: PlantTruth = {
    dims: [nx, ny, nz], affine: new Float64Array(volume.affine), shape: spec, sizeMm,
    amplitudePct: options.amplitudePct, truthFraction, seed: options.seed,
    mask: truthMask, profile, timeCourse,
    centresMm, centresVoxel: blobs.map((b) => b.centreVoxel), blobs,
  };
  if (sliceTimeCourses) truth.sliceTimeCourses = sliceTimeCourses;
  if (acquisition) truth.acquired = { movedVolumes: moved, fieldMap: b0 !== null, sliceTimed: sliceTimeCourses !== null };
  return values ? { volume: out, truth, plantedSeries: { voxels: Int32Array.from(voxels), values } } : { volume: out, truth };
}

/**
 * The blob weights each volume's raw voxels see, when the head moves or a field map displaces the
 * signal: computed per volume on the voxels the blobs can reach, in one reused array.
 */
class VolumeWeights {
  /** Voxels any volume's weights can reach, ascending. */
  readonly voxels: Int32Array;
  private readonly posed: Float32Array;
  private readonly result: Float32Array;
  private readonly displaced: Float32Array | null = null;
  private readonly unit: Float32Array | null = null;
  private readonly unitDisplaced: Float32Array | null = null;
  private readonly shift: Float32Array | null = null;
  private readonly lineStarts: Int32Array | null = null;
  private readonly toVoxel: Affine;
  /** Weights of a volume in the reference pose with a field map (the same for every such volume). */
  private still: Float32Array | null = null;

  constructor(
    private readonly volume: Volume,
    private readonly profile: Float32Array,
    private readonly centresMm: readonly Vec3[],
    private readonly spec: BlobShapeSpec,
    private readonly poses: Array<Affine | null> | null,
    private readonly b0: AcquisitionModel['b0'],
  ) {
    const [nx, ny, nz] = volume.dims;
    const n = nx * ny * nz;
    this.toVoxel = invertAffine(volume.affine);
    const reach = new Uint8Array(n);
    const support = blobSupportMm(spec);
    const distinct = poses ? [...new Set(poses)] : [null];
    for (const pose of distinct) {
      if (pose === null) { for (let v = 0; v < n; v++) if (profile[v] !== 0) reach[v] = 1; continue; }
      for (const c of centresMm) {
        const [i0, i1, j0, j1, k0, k1] = posedBlobBox(volume.dims, volume.affine, pose, c, support);
        for (let k = k0; k <= k1; k++) for (let j = j0; j <= j1; j++) reach.fill(1, i0 + nx * (j + ny * k), i1 + 1 + nx * (j + ny * k));
      }
    }
    this.posed = new Float32Array(n);
    this.result = b0 ? new Float32Array(n) : this.posed;
    if (b0) {
      // displaced signal stays on its phase-encode line, within maxShift of where it started: on each
      // line through the reach (positions lo..hi) weights can land on lo - M - 1 .. hi + M + 1
      // (M = largest shift, whole voxels; 1 for the linear deposit), and the unit image's signal that
      // lands there starts within 2M + 2 of the reach, its pieces reading one voxel further: so the
      // unit image is needed on lo - 2M - 3 .. hi + 2M + 3 (exactly as on the whole line there) and
      // the shift two voxels beyond that
      const axis = b0.phaseEncodeAxis;
      const stride = axis === 0 ? 1 : axis === 1 ? nx : nx * ny;
      const len = volume.dims[axis];
      let maxHz = 0;
      for (let v = 0; v < n; v++) maxHz = Math.max(maxHz, Math.abs(b0.fieldMapHz[v]));
      const margin = 2 * Math.ceil(maxHz * b0.totalReadoutTimeSec) + 3;
      const span = new Map<number, [number, number]>();
      for (let v = 0; v < n; v++) {
        if (!reach[v]) continue;
        const position = axis === 0 ? v % nx : axis === 1 ? Math.floor(v / nx) % ny : Math.floor(v / (nx * ny));
        const start = v - stride * position;
        const seen = span.get(start);
        if (seen) { seen[0] = Math.min(seen[0], position); seen[1] = Math.max(seen[1], position); } else span.set(start, [position, position]);
      }
      this.lineStarts = Int32Array.from([...span.keys()].sort((a, b) => a - b));
      this.unit = new Float32Array(n);
      for (const [start, [lo, hi]] of span) {
        for (let t = Math.max(0, lo - margin - 2); t <= Math.min(len - 1, hi + margin + 2); t++) reach[start + t * stride] = 1;
        for (let t = Math.max(0, lo - margin); t <= Math.min(len - 1, hi + margin); t++) this.unit[start + t * stride] = 1;
      }
      this.displaced = new Float32Array(n);
      this.unitDisplaced = new Float32Array(n);
      this.shift = new Float32Array(n);
    }
    this.voxels = nonZero(reach);
  }

  /**
   * Weights of volume t (valid until the next call).
   * @param t - volume index
   * @returns float32 weights on the run's grid (0 away from the blobs)
   */
  at(t: number): Float32Array {
    const pose = this.poses ? this.poses[t] : null;
    if (!this.b0) {
      if (pose === null) return this.profile;
      for (const v of this.voxels) this.posed[v] = 0;
      return posedBlobWeights(this.volume.dims, this.volume.affine, pose, this.centresMm, this.spec, this.posed);
    }
    if (pose === null && this.still) return this.still;
    for (const v of this.voxels) this.posed[v] = 0;
    if (pose === null) for (const v of this.voxels) this.posed[v] = this.profile[v];
    else posedBlobWeights(this.volume.dims, this.volume.affine, pose, this.centresMm, this.spec, this.posed);
    const dims = [this.volume.dims[0], this.volume.dims[1], this.volume.dims[2]] as [number, number, number];
    // the field map is fixed to the head: raw voxel -> world -> head (inverse pose) -> field-map voxel
    const fieldFromOut = pose === null ? composeAffine(this.toVoxel, this.volume.affine) : composeAffine(this.toVoxel, composeAffine(invertAffine(pose), this.volume.affine));
    const b0 = this.b0;
    headFieldShiftVoxels(b0.fieldMapHz, dims, fieldFromOut, dims, { totalReadoutTimeSec: b0.totalReadoutTimeSec, sign: b0.phaseEncodeSign }, this.shift!, this.voxels);
    distortLines(this.posed, this.shift!, dims, b0.phaseEncodeAxis, this.lineStarts!, this.displaced!);
    distortLines(this.unit!, this.shift!, dims, b0.phaseEncodeAxis, this.lineStarts!, this.unitDisplaced!);
    const out = pose === null ? new Float32Array(this.result.length) : this.result;
    for (const v of this.voxels) {
      const density = this.unitDisplaced![v];
      // where (almost) no signal lands the voxel is a void: nothing to plant
      out[v] = density > 1e-6 ? this.displaced![v] / density : 0;
    }
    if (pose === null) this.still = out;
    return out;
  }
}

/** Indices of the nonzero entries, ascending. */
function nonZero(a: ArrayLike<number>): Int32Array {
  let count = 0;
  for (let v = 0; v < a.length; v++) if (a[v] !== 0) count++;
  const out = new Int32Array(count);
  for (let v = 0, q = 0; v < a.length; v++) if (a[v] !== 0) out[q++] = v;
  return out;
}

/** Slice index of each voxel along the slice axis. */
function sliceIndices(voxels: Int32Array, dims: readonly number[], axis: 0 | 1 | 2): Int32Array {
  const [nx, ny] = dims;
  return voxels.map((v) => (axis === 0 ? v % nx : axis === 1 ? Math.floor(v / nx) % ny : Math.floor(v / (nx * ny))));
}

function isIdentity(p: Affine): boolean {
  for (let r = 0; r < 4; r++) for (let c = 0; c < 4; c++) if (p[4 * r + c] !== (r === c ? 1 : 0)) return false;
  return true;
}

function checkAcquisition(a: AcquisitionModel | null, volume: Volume): AcquisitionModel | null {
  if (!a) return null;
  if (!sameGrid({ dims: [...a.grid.dims, 1], affine: a.grid.affine }, volume)) fail('GRID_MISMATCH', `the acquisition model's grid [${a.grid.dims.join('x')}] is not the run's [${volume.dims.slice(0, 3).join('x')}] (or their voxel-to-world mappings differ)`);
  if (a.nt !== volume.dims[3]) fail('INVALID_ARGUMENT', `the acquisition model has ${a.nt} volumes, the run ${volume.dims[3]}`);
  if (Math.abs(a.trSec - volume.trSec) > 1e-9) fail('INVALID_ARGUMENT', `the acquisition model's TR is ${a.trSec} s, the run's ${volume.trSec} s`);
  if (a.poses && a.poses.length !== a.nt) fail('MOTION_TABLE_LENGTH', `the acquisition model has ${a.poses.length} poses for ${a.nt} volumes`);
  if (a.b0 && a.b0.fieldMapHz.length !== voxelsPerVolume(volume)) fail('GRID_MISMATCH', `the acquisition model's field map has ${a.b0.fieldMapHz.length} voxels, the run's grid ${voxelsPerVolume(volume)}`);
  return a;
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

/** The courses divided by their common largest value (checked: finite, one per volume, one per slice). */
function peakOneTimeCourses(tc: ArrayLike<number>, perSlice: readonly ArrayLike<number>[] | null, nt: number, nSlices: number): { timeCourse: Float64Array; sliceTimeCourses: Float64Array[] | null } {
  if (!tc || tc.length !== nt) fail('INVALID_ARGUMENT', `timeCourse must have one value per volume (${nt}), got ${tc ? tc.length : 'none'}`);
  if (perSlice && perSlice.length !== nSlices) fail('INVALID_ARGUMENT', `sliceTimeCourses must have one course per slice (${nSlices}), got ${perSlice.length}`);
  let max = -Infinity;
  const scan = (c: ArrayLike<number>, what: string) => {
    if (!c || c.length !== nt) fail('INVALID_ARGUMENT', `${what} must have one value per volume (${nt}), got ${c ? c.length : 'none'}`);
    for (let t = 0; t < nt; t++) {
      if (!Number.isFinite(c[t])) fail('INVALID_ARGUMENT', `${what}[${t}] is not finite (${c[t]})`);
      if (c[t] > max) max = c[t];
    }
  };
  scan(tc, 'timeCourse');
  perSlice?.forEach((c, s) => scan(c, `sliceTimeCourses[${s}]`));
  if (!(max > 0)) fail('INVALID_ARGUMENT', `timeCourse must have a positive maximum to scale to 1, got ${max}`);
  const scaled = (c: ArrayLike<number>) => {
    const out = new Float64Array(nt);
    for (let t = 0; t < nt; t++) out[t] = c[t] / max;
    return out;
  };
  return { timeCourse: scaled(tc), sliceTimeCourses: perSlice ? perSlice.map(scaled) : null };
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

/** Given centres, checked: one per blob, finite. */
function givenCentres(centres: readonly Vec3[], count: number): Vec3[] {
  if (centres.length !== count) fail('INVALID_ARGUMENT', `centresVoxel gives ${centres.length} centres but count is ${count}`);
  for (const c of centres) if (c.length !== 3 || !c.every(Number.isFinite)) fail('INVALID_ARGUMENT', `every centre must be three finite voxel positions, got [${c.join(', ')}]`);
  return centres.map((c) => [c[0], c[1], c[2]]);
}
