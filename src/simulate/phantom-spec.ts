import type { Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { BlockDesign } from './block-design-events.js';
import { DEFAULT_HEAD_GEOMETRY, type HeadGeometry } from './head-anatomy.js';
import type { PhysioRates } from './physio-traces.js';
import type { MotionSpec } from './simulated-motion-table.js';
import { DEFAULT_TISSUE_PROPERTIES, PHANTOM_TISSUES, type PhantomTissue, type TissueProperties } from './tissue-properties.js';

/** Acquisition of the simulated run (EPI, spoiled gradient echo). */
export interface PhantomAcquisition {
  /** Repetition time, seconds. __Default value:__ 2 */
  trSec: number;
  /** Echo time, seconds. __Default value:__ 0.03 (common practice at 3 T, no source) */
  teSec: number;
  /** Flip angle, degrees. __Default value:__ 77 (the Ernst angle of grey matter, T1 1.33 s, at TR 2 s) */
  flipAngleDeg: number;
  /** Effective echo spacing, seconds (sets the total readout time and so the field-map shift). __Default value:__ 0.00035 */
  effectiveEchoSpacingSec: number;
  /** Phase-encode axis and polarity (BIDS notation; the second image axis, front-back). __Default value:__ 'j' */
  phaseEncodingDirection: 'j' | 'j-';
  /** Main field strength, tesla. __Default value:__ 3 */
  fieldStrengthT: number;
  /**
   * Slices read at once (simultaneous multi-slice): the slices form this many bands of neighbouring
   * slices and each band follows the interleaved order over the TR (sliceOrderTiming); must divide
   * the slice count. The sidecar then carries MultibandAccelerationFactor. Absent from the defaults,
   * so runs without it keep their bytes. __Default value:__ absent (1: one slice at a time)
   */
  multibandFactor?: number;
}

/** Where and how strongly grey matter responds to the task. */
export interface PhantomActivation {
  /** Centre of the responding patch, world mm. __Default value:__ (0, -66, 4), the occipital pole */
  centreMm: Vec3;
  /** Gaussian width of the patch, mm (cut off at 2.5 sigma). __Default value:__ 8 */
  sigmaMm: number;
  /** Signal change of pure grey matter at the patch centre on a sustained block's plateau, percent. __Default value:__ 2 */
  amplitudePercent: number;
}

/** Cardiac and respiratory fluctuation, multiplying each tissue's signal. */
export interface PhantomPhysio {
  /** Rates and their wander. __Default value:__ 1.1 Hz, 0.3 Hz, 5 % wander */
  rates: PhysioRates;
  /** Amplitude of the cardiac fluctuation per tissue, percent of signal. __Default value:__ CSF 1.5, GM 0.5, WM 0.2, extracerebral 0.2 */
  cardiacPercent: Partial<Record<PhantomTissue, number>>;
  /** Amplitude of the respiratory fluctuation per tissue, percent of signal. __Default value:__ CSF 1, GM 0.5, WM 0.25, extracerebral 0.3 */
  respirationPercent: Partial<Record<PhantomTissue, number>>;
}

/** Slow multiplicative drift over the run: Legendre polynomials of time, stronger towards the top of the grid. */
export interface PhantomDrift {
  /** Linear drift from run start to end (P1 amplitude), percent. __Default value:__ 1 */
  linearPercent: number;
  /** Quadratic drift (P2 amplitude), percent. __Default value:__ 0.5 */
  quadraticPercent: number;
  /** Relative change of the drift amplitude from the centre to the top/bottom slice. __Default value:__ 0.5 */
  verticalGradient: number;
}

/** A smooth Gaussian random field per volume multiplying the signal (spatially correlated noise). */
export interface PhantomSmoothNoise {
  /** Smoothness, mm. __Default value:__ 12 */
  fwhmMm: number;
  /** Standard deviation, percent of signal. __Default value:__ 0.4 */
  percent: number;
}

/** Field inhomogeneity from the air-filled sinus. */
export interface PhantomB0 {
  /** Susceptibility of air minus tissue, ppm. __Default value:__ 9.4 (from memory) */
  susceptibilityDifferencePpm: number;
  /** Signal loss from intravoxel dephasing. __Default value:__ true */
  dephasing: boolean;
  /** Geometric shift along the phase-encode axis. __Default value:__ true */
  distortion: boolean;
}

/** A single-voxel spike. */
export interface PhantomSpikeSpec {
  /** Volume, 0-based. */
  volume: number;
  /** Value added to the voxel, signal units (pure grey matter at steady state = `greyMatterSignal`). */
  amplitude: number;
}

/** A slice whose signal is lost in one volume. */
export interface PhantomDropoutSpec {
  /** Volume, 0-based. */
  volume: number;
  /** Slice index (third image axis), 0-based. */
  slice: number;
  /** Fraction of the signal kept (noise is added after). __Default value:__ 0.15 */
  keptFraction: number;
}

/**
 * Two eyes in front of the brain, joined to it by optic nerves: fluid-filled globes that are bright
 * in EPI, as in a real field of view that reaches below the frontal lobe.
 */
export interface PhantomEyes {
  /** Centres of the two globes, world mm. __Default value:__ (-30, 62, -36) and (30, 62, -36) */
  centresMm: [Vec3, Vec3];
  /** Radius of each globe, mm. __Default value:__ 11 */
  radiusMm: number;
  /** Radius of each optic nerve with its fluid sheath and the tissue of the orbit's apex, a straight rod from the globe towards the brain's centre, mm. __Default value:__ 4.5 */
  nerveRadiusMm: number;
  /** Steady signal of the globe, as a fraction of pure grey matter's. __Default value:__ 1.3 */
  signalFraction: number;
}

/**
 * Voxels just inside the brain's surface whose signal sits near the noise floor (a vessel or a signal
 * void at the edge) and changes at a few volumes by about their whole baseline: what a real run shows
 * at the brain's edge, where a look must not list percent changes of a near-zero mean.
 */
export interface PhantomLowBaselineVoxels {
  /** How many voxels. __Default value:__ 3 */
  count: number;
  /** Their mean signal, signal units. __Default value:__ 25 */
  baselineSignal: number;
  /** Their own noise SD, signal units (small: a few quantisation steps). __Default value:__ 1.5 */
  noiseSd: number;
  /** Volumes at which each voxel falls to about zero. __Default value:__ 6 */
  excursionsPerVoxel: number;
}

/** Sequence of a T1-weighted spoiled gradient-echo structural image (short TR, short TE, moderate flip). */
export interface PhantomStructuralSequence {
  /** Repetition time, seconds. __Default value:__ 0.02 */
  trSec: number;
  /** Echo time, seconds. __Default value:__ 0.004 */
  teSec: number;
  /** Flip angle, degrees. __Default value:__ 25 */
  flipAngleDeg: number;
}

/**
 * A structural image of the same head, taken in the same session on a finer grid with its own
 * (T1-weighted) contrast from the tissue model: white matter brighter than grey matter brighter than
 * CSF. The head sits in another pose than in the run's reference volume (it moved between the two
 * scans), stated here, so aligning the run to it has a known answer.
 */
export interface PhantomStructural {
  /** Voxels along x, y, z. __Default value:__ [100, 120, 92] */
  dims: [number, number, number];
  /** Voxel size, mm. __Default value:__ [1.5, 1.5, 1.5] */
  spacingMm: [number, number, number];
  /**
   * Head pose in the structural image relative to the run's reference position (motion-table
   * convention about the world origin: shifts mm, rotations deg). __Default value:__ shift (2.5, -3, 4) mm, rotation (4, -2, 3) deg
   */
  pose: { shiftMm: Vec3; rotationDeg: Vec3 };
  /** __Default value:__ TR 20 ms, TE 4 ms, flip 25 deg */
  sequence: PhantomStructuralSequence;
  /** Noise-free value of pure white matter (sets the intensity scale). __Default value:__ 1000 */
  whiteMatterSignal: number;
  /** Thermal noise SD per channel (magnitude taken, Rician), signal units. __Default value:__ 20 (SNR 50 in white matter) */
  thermalNoiseSd: number;
  /** Intensity non-uniformity: signal gain rises linearly along z from -biasPercent to +biasPercent, percent. __Default value:__ 5 */
  biasPercent: number;
  /** Partial-volume points per voxel edge. __Default value:__ 2 */
  supersample: number;
}

/**
 * boldsweep's own template: a smooth, noise-free, T1-weighted average-head-like image of the phantom
 * head, placed in template space by a known affine (scaling, shear, shift: a template head is not
 * any one head), on a 2 mm grid of our own. The true structural-to-template transform is then known.
 */
export interface PhantomTemplate {
  /** Voxels along x, y, z. __Default value:__ [80, 100, 76] */
  dims: [number, number, number];
  /** Isotropic voxel size, mm. __Default value:__ 2 */
  spacingMm: number;
  /** Voxel index (0-based) of the template's world origin. __Default value:__ [40, 54, 36] */
  originVoxel: Vec3;
  /** Reference-frame world mm -> template world mm: the top three rows of a 4x4 affine. __Default value:__ scale about 1.06, 0.96, 1.04 with a small shear, shift (2, -3, 5) mm */
  fromReferenceRows: [[number, number, number, number], [number, number, number, number], [number, number, number, number]];
  /** Gaussian FWHM the image is smoothed with (what averaging many heads does), mm. __Default value:__ 4 */
  smoothingFwhmMm: number;
  /** Noise-free value of pure white matter before smoothing. __Default value:__ 1000 */
  whiteMatterSignal: number;
  /** Partial-volume points per voxel edge. __Default value:__ 2 */
  supersample: number;
}

/** Defaults of {@link PhantomStructural}. */
export function defaultPhantomStructural(): PhantomStructural {
  return {
    dims: [100, 120, 92],
    spacingMm: [1.5, 1.5, 1.5],
    pose: { shiftMm: [2.5, -3, 4], rotationDeg: [4, -2, 3] },
    // a spoiled gradient echo with T1 weighting (common practice, no source): WM:GM:CSF about 1 : 0.78 : 0.36 with the default tissues
    sequence: { trSec: 0.02, teSec: 0.004, flipAngleDeg: 25 },
    whiteMatterSignal: 1000,
    thermalNoiseSd: 20,
    biasPercent: 5,
    supersample: 2,
  };
}

/** Defaults of {@link PhantomTemplate}. */
export function defaultPhantomTemplate(): PhantomTemplate {
  return {
    dims: [80, 100, 76],
    spacingMm: 2,
    originVoxel: [40, 54, 36],
    fromReferenceRows: [[1.06, 0.02, 0, 2], [0, 0.96, 0.03, -3], [0.01, 0, 1.04, 5]],
    smoothingFwhmMm: 4,
    whiteMatterSignal: 1000,
    supersample: 2,
  };
}

/** Defaults of {@link PhantomEyes}. */
export function defaultPhantomEyes(): PhantomEyes {
  return { centresMm: [[-30, 62, -36], [30, 62, -36]], radiusMm: 11, nerveRadiusMm: 4.5, signalFraction: 1.3 };
}

/** Defaults of {@link PhantomLowBaselineVoxels}. */
export function defaultLowBaselineVoxels(): PhantomLowBaselineVoxels {
  return { count: 3, baselineSignal: 25, noiseSd: 1.5, excursionsPerVoxel: 6 };
}

/**
 * Everything that defines a simulated run of the digital phantom. Same spec and seed -> the same
 * run, to the byte. Components set to `null` (or empty lists) are left out.
 */
export interface PhantomSpec {
  /** Seed of all random draws (noise, physiology, motion wander, spike positions). __Default value:__ 1 */
  seed: number;
  /** Voxels along x, y, z. __Default value:__ [44, 52, 34] */
  dims: [number, number, number];
  /** Voxel size, mm. __Default value:__ [3.5, 3.5, 3.5] */
  spacingMm: [number, number, number];
  /** Number of volumes. __Default value:__ 150 */
  nVolumes: number;
  acquisition: PhantomAcquisition;
  /** Head shape and partial-volume sampling (points per voxel edge). __Default value:__ {@link DEFAULT_HEAD_GEOMETRY}, 3 */
  anatomy: { geometry: HeadGeometry; supersample: number };
  /** Tissue relaxation and density. __Default value:__ {@link DEFAULT_TISSUE_PROPERTIES} */
  tissues: Record<PhantomTissue, TissueProperties>;
  /** Noise-free steady-state value of a voxel of pure grey matter (sets the intensity scale). __Default value:__ 1000 */
  greyMatterSignal: number;
  /** Task timing. __Default value:__ 20 s 'flicker' blocks every 40 s from 20 s */
  design: BlockDesign | null;
  activation: PhantomActivation | null;
  /**
   * Standard deviation of the thermal noise in each of the real and imaginary channels, signal units.
   * __Default value:__ 11 (image SNR about 90 in grey matter)
   */
  thermalNoiseSd: number;
  /** Magnitude of complex noise (Rician) rather than additive Gaussian. __Default value:__ true */
  rician: boolean;
  physio: PhantomPhysio | null;
  drift: PhantomDrift | null;
  smoothNoise: PhantomSmoothNoise | null;
  /** Head motion. __Default value:__ slow wander 0.01 mm and 0.01 deg per volume, no jerk */
  motion: MotionSpec | null;
  /** __Default value:__ null (no inhomogeneity) */
  b0: PhantomB0 | null;
  /** __Default value:__ [] */
  spikes: PhantomSpikeSpec[];
  /** __Default value:__ [] */
  dropouts: PhantomDropoutSpec[];
  /** Eyes and optic nerves (left out when absent; {@link defaultPhantomEyes} gives a real-looking pair). */
  eyes?: PhantomEyes;
  /** Near-zero-baseline edge voxels (left out when absent; {@link defaultLowBaselineVoxels}; positions and volumes from their own seeded stream). */
  lowBaselineVoxels?: PhantomLowBaselineVoxels;
  /** A structural image of the same head (left out when absent; {@link defaultPhantomStructural}; made by `simulatePhantomStructural`). */
  structural?: PhantomStructural;
  /** boldsweep's own template (left out when absent; {@link defaultPhantomTemplate}; made by `simulatePhantomTemplate`). */
  template?: PhantomTemplate;
}

/** Spec fields that are absent unless set (so specs and truth files without them keep their bytes). */
const OPTIONAL_FIELDS = ['eyes', 'lowBaselineVoxels', 'structural', 'template'];

/** A spec with any part left out (nested groups may be given in part too). */
export type PhantomSpecInput = {
  [K in keyof PhantomSpec]?: PhantomSpec[K] extends Array<unknown> ? PhantomSpec[K] : PhantomSpec[K] extends object | null ? Partial<NonNullable<PhantomSpec[K]>> | null : PhantomSpec[K];
};

/**
 * The documented defaults: a clean run with steady-state approach, thermal, physiological, drift and
 * smooth noise, slow head wander, and the occipital response to a flicker block design; no jerk,
 * field inhomogeneity, spikes or dropout (see {@link demoPhantomSpec} for those).
 * @returns a fresh spec
 * @example const spec = defaultPhantomSpec(); spec.nVolumes = 40
 */
export function defaultPhantomSpec(): PhantomSpec {
  return {
    seed: 1,
    dims: [44, 52, 34],
    spacingMm: [3.5, 3.5, 3.5],
    nVolumes: 150,
    acquisition: { trSec: 2, teSec: 0.03, flipAngleDeg: 77, effectiveEchoSpacingSec: 0.00035, phaseEncodingDirection: 'j', fieldStrengthT: 3 },
    anatomy: { geometry: structuredClone(DEFAULT_HEAD_GEOMETRY) as HeadGeometry, supersample: 3 },
    tissues: structuredClone(DEFAULT_TISSUE_PROPERTIES) as Record<PhantomTissue, TissueProperties>,
    greyMatterSignal: 1000,
    design: { firstOnsetSec: 20, onSec: 20, offSec: 20, trialType: 'flicker' },
    activation: { centreMm: [0, -66, 4], sigmaMm: 8, amplitudePercent: 2 },
    thermalNoiseSd: 11,
    rician: true,
    physio: {
      rates: { cardiacHz: 1.1, respirationHz: 0.3, rateWanderFraction: 0.05 },
      cardiacPercent: { csf: 1.5, 'grey-matter': 0.5, 'white-matter': 0.2, extracerebral: 0.2 },
      respirationPercent: { csf: 1, 'grey-matter': 0.5, 'white-matter': 0.25, extracerebral: 0.3 },
    },
    drift: { linearPercent: 1, quadraticPercent: 0.5, verticalGradient: 0.5 },
    smoothNoise: { fwhmMm: 12, percent: 0.4 },
    motion: { wanderStepMm: 0.01, wanderStepDeg: 0.01, jerk: null },
    b0: null,
    spikes: [],
    dropouts: [],
  };
}

/**
 * The spec of the committed demo run (data-demo/): the defaults with weaker spatially coherent noise
 * (grey-matter physiological fluctuation 0.2 %, smooth field 0.1 %), plus realistic head motion (a
 * two-volume jerk at volume 83, a lasting step at 40, a twitch at 121, a slow drift, respiration-coupled
 * motion), field inhomogeneity around the sinus, three single-voxel spikes, one slice dropout, a
 * structural image and boldsweep's own template.
 * @returns a fresh spec
 * @example const run = simulatePhantomRun(demoPhantomSpec())
 */
export function demoPhantomSpec(): PhantomSpec {
  const spec = defaultPhantomSpec();
  spec.seed = 20240611;
  // the head jerks at volume 83 and settles back two volumes later (a cough or a swallow): the look
  // must find it, and censoring those volumes leaves a run a recipe without motion correction can use
  spec.motion = {
    wanderStepMm: 0.01,
    wanderStepDeg: 0.01,
    jerk: { volume: 83, durationVolumes: 2, shiftMm: [0.3, 0.8, 1.2], rotationDeg: [1.5, 0.2, -0.4] },
    // a lasting shift at volume 40 (the head settles into a new position) and a one-volume twitch at 121
    moreJerks: [
      { volume: 40, durationVolumes: null, shiftMm: [0.1, 0.4, 0.3], rotationDeg: [0.5, 0, 0.15] },
      { volume: 121, durationVolumes: 1, shiftMm: [-0.2, 0.3, 0.5], rotationDeg: [0.7, -0.3, 0.2] },
    ],
    // sinking into the cushion and nodding over the 5 minutes
    drift: { shiftMm: [0.1, 0.3, -0.6], rotationDeg: [0.6, 0.1, -0.1] },
    // chest movement carried to the head, mostly along y and z and a nod (at trace 1)
    respiration: { shiftMm: [0, 0.03, 0.05], rotationDeg: [0.03, 0, 0] },
  };
  // noise mostly thermal, hence close to white in space: spatially coherent fluctuation (physiology,
  // the smooth field) is kept small so that planted blobs are found best near their own width, as the
  // matched-filter principle predicts for white noise; coloured noise pulls the best width lower
  spec.physio = {
    ...spec.physio!,
    cardiacPercent: { ...spec.physio!.cardiacPercent, 'grey-matter': 0.2, 'white-matter': 0.1 },
    respirationPercent: { ...spec.physio!.respirationPercent, 'grey-matter': 0.2, 'white-matter': 0.1 },
  };
  spec.smoothNoise = { fwhmMm: 12, percent: 0.1 };
  spec.b0 = { susceptibilityDifferencePpm: 9.4, dephasing: true, distortion: true };
  spec.spikes = [
    { volume: 37, amplitude: 2500 },
    { volume: 101, amplitude: 2000 },
    { volume: 128, amplitude: 3000 },
  ];
  spec.dropouts = [{ volume: 112, slice: 17, keptFraction: 0.15 }];
  spec.structural = defaultPhantomStructural();
  spec.template = defaultPhantomTemplate();
  return spec;
}

/**
 * Fill a partial spec from the defaults (nested groups are merged one level deep; `null` turns a
 * component off) and check every value.
 * @param input - the parts to set
 * @returns a complete, checked spec (the input is not modified)
 * @throws BoldsweepError INVALID_ARGUMENT naming the first bad field
 * @example resolvePhantomSpec({ nVolumes: 20, physio: null })
 */
export function resolvePhantomSpec(input: PhantomSpecInput = {}): PhantomSpec {
  const d = defaultPhantomSpec() as unknown as Record<string, unknown>;
  const out: Record<string, unknown> = { ...d };
  for (const [key, value] of Object.entries(input)) {
    if (value === undefined) continue;
    if (!(key in d) && !OPTIONAL_FIELDS.includes(key)) fail('INVALID_ARGUMENT', `phantom spec has no field '${key}' (fields: ${Object.keys(d).join(', ')})`);
    const base = d[key];
    if (value !== null && typeof value === 'object' && !Array.isArray(value) && base !== null && typeof base === 'object' && !Array.isArray(base)) {
      out[key] = { ...(base as object), ...structuredClone(value as object) };
    } else {
      out[key] = structuredClone(value);
    }
  }
  const spec = out as unknown as PhantomSpec;
  checkPhantomSpec(spec);
  return spec;
}

function checkPhantomSpec(s: PhantomSpec): void {
  const bad = (field: string, why: string, got: unknown): never => fail('INVALID_ARGUMENT', `phantom spec ${field} ${why}, got ${JSON.stringify(got)}`);
  if (!Number.isInteger(s.seed) || s.seed < 0 || s.seed >= 2 ** 32) bad('seed', 'must be an integer in [0, 2^32)', s.seed);
  if (!Array.isArray(s.dims) || s.dims.length !== 3 || s.dims.some((n) => !Number.isInteger(n) || n < 2 || n > 512)) bad('dims', 'must be three integers in 2..512', s.dims);
  if (!Array.isArray(s.spacingMm) || s.spacingMm.length !== 3 || s.spacingMm.some((v) => !(v > 0) || !Number.isFinite(v))) bad('spacingMm', 'must be three positive numbers', s.spacingMm);
  if (!Number.isInteger(s.nVolumes) || s.nVolumes < 1 || s.nVolumes > 10000) bad('nVolumes', 'must be an integer in 1..10000', s.nVolumes);
  const a = s.acquisition;
  if (!(a.trSec > 0) || !Number.isFinite(a.trSec)) bad('acquisition.trSec', 'must be positive', a.trSec);
  if (!(a.teSec > 0) || !(a.teSec < a.trSec)) bad('acquisition.teSec', 'must be positive and below trSec', a.teSec);
  if (!(a.flipAngleDeg > 0) || !(a.flipAngleDeg <= 180)) bad('acquisition.flipAngleDeg', 'must be in (0, 180]', a.flipAngleDeg);
  if (!(a.effectiveEchoSpacingSec > 0) || !(a.effectiveEchoSpacingSec < 0.01)) bad('acquisition.effectiveEchoSpacingSec', 'must be in (0, 0.01) s', a.effectiveEchoSpacingSec);
  if (a.phaseEncodingDirection !== 'j' && a.phaseEncodingDirection !== 'j-') bad('acquisition.phaseEncodingDirection', "must be 'j' or 'j-'", a.phaseEncodingDirection);
  if (!(a.fieldStrengthT > 0)) bad('acquisition.fieldStrengthT', 'must be positive', a.fieldStrengthT);
  if (a.multibandFactor !== undefined && (!Number.isInteger(a.multibandFactor) || a.multibandFactor < 1 || s.dims[2] % a.multibandFactor !== 0)) bad('acquisition.multibandFactor', `must be a positive integer dividing the ${s.dims[2]} slices`, a.multibandFactor);
  if (!Number.isInteger(s.anatomy.supersample) || s.anatomy.supersample < 1 || s.anatomy.supersample > 8) bad('anatomy.supersample', 'must be an integer in 1..8', s.anatomy.supersample);
  for (const t of PHANTOM_TISSUES) {
    const p = s.tissues[t];
    if (!p || !(p.protonDensity >= 0) || !(p.t1Sec > 0) || !(p.t2StarSec > 0)) bad(`tissues.${t}`, 'needs protonDensity >= 0, t1Sec > 0 and t2StarSec > 0', p);
  }
  if (!(s.tissues['grey-matter'].protonDensity > 0)) bad("tissues['grey-matter'].protonDensity", 'must be positive (it sets the intensity scale)', s.tissues['grey-matter'].protonDensity);
  if (!(s.greyMatterSignal > 0) || s.greyMatterSignal > 10000) bad('greyMatterSignal', 'must be in (0, 10000] (the written file is int16)', s.greyMatterSignal);
  if (s.activation && (!(s.activation.sigmaMm > 0) || !Number.isFinite(s.activation.amplitudePercent))) bad('activation', 'needs sigmaMm > 0 and a finite amplitudePercent', s.activation);
  if (!(s.thermalNoiseSd >= 0)) bad('thermalNoiseSd', 'must be >= 0', s.thermalNoiseSd);
  if (s.smoothNoise && (!(s.smoothNoise.fwhmMm > 0) || !(s.smoothNoise.percent >= 0))) bad('smoothNoise', 'needs fwhmMm > 0 and percent >= 0', s.smoothNoise);
  if (s.drift && ![s.drift.linearPercent, s.drift.quadraticPercent, s.drift.verticalGradient].every(Number.isFinite)) bad('drift', 'needs finite numbers', s.drift);
  s.spikes.forEach((sp, i) => {
    if (!Number.isInteger(sp.volume) || sp.volume < 0 || sp.volume >= s.nVolumes || !Number.isFinite(sp.amplitude)) bad(`spikes[${i}]`, `needs volume in 0..${s.nVolumes - 1} and a finite amplitude`, sp);
  });
  if (s.eyes) {
    const e = s.eyes;
    if (!Array.isArray(e.centresMm) || e.centresMm.length !== 2 || e.centresMm.some((c) => !Array.isArray(c) || c.length !== 3 || c.some((x) => !Number.isFinite(x)))) bad('eyes.centresMm', 'must be two [x, y, z] points in mm', e.centresMm);
    if (!(e.radiusMm > 0) || !(e.nerveRadiusMm >= 0) || !(e.signalFraction >= 0)) bad('eyes', 'needs radiusMm > 0, nerveRadiusMm >= 0 and signalFraction >= 0', e);
  }
  if (s.lowBaselineVoxels) {
    const l = s.lowBaselineVoxels;
    if (!Number.isInteger(l.count) || l.count < 0 || !Number.isInteger(l.excursionsPerVoxel) || l.excursionsPerVoxel < 0 || l.excursionsPerVoxel > s.nVolumes) bad('lowBaselineVoxels', 'needs integer count >= 0 and excursionsPerVoxel in 0..nVolumes', l);
    if (!(l.baselineSignal >= 0) || !(l.noiseSd >= 0)) bad('lowBaselineVoxels', 'needs baselineSignal >= 0 and noiseSd >= 0', l);
  }
  if (s.structural) {
    const st = s.structural;
    if (!Array.isArray(st.dims) || st.dims.length !== 3 || st.dims.some((n) => !Number.isInteger(n) || n < 2 || n > 512)) bad('structural.dims', 'must be three integers in 2..512', st.dims);
    if (!Array.isArray(st.spacingMm) || st.spacingMm.length !== 3 || st.spacingMm.some((v) => !(v > 0) || !Number.isFinite(v))) bad('structural.spacingMm', 'must be three positive numbers', st.spacingMm);
    if (![...st.pose.shiftMm, ...st.pose.rotationDeg].every(Number.isFinite) || st.pose.shiftMm.length !== 3 || st.pose.rotationDeg.length !== 3) bad('structural.pose', 'needs three finite shifts and three finite rotations', st.pose);
    if (!(st.sequence.trSec > 0) || !(st.sequence.teSec >= 0) || !(st.sequence.teSec < st.sequence.trSec) || !(st.sequence.flipAngleDeg > 0 && st.sequence.flipAngleDeg <= 180)) bad('structural.sequence', 'needs trSec > 0, 0 <= teSec < trSec and flipAngleDeg in (0, 180]', st.sequence);
    if (!(st.whiteMatterSignal > 0) || st.whiteMatterSignal > 10000 || !(st.thermalNoiseSd >= 0) || !(Math.abs(st.biasPercent) < 50)) bad('structural', 'needs whiteMatterSignal in (0, 10000], thermalNoiseSd >= 0 and |biasPercent| < 50', st);
    if (!Number.isInteger(st.supersample) || st.supersample < 1 || st.supersample > 8) bad('structural.supersample', 'must be an integer in 1..8', st.supersample);
  }
  if (s.template) {
    const t = s.template;
    if (!Array.isArray(t.dims) || t.dims.length !== 3 || t.dims.some((n) => !Number.isInteger(n) || n < 2 || n > 512)) bad('template.dims', 'must be three integers in 2..512', t.dims);
    if (!(t.spacingMm > 0) || !Number.isFinite(t.spacingMm) || t.originVoxel.length !== 3 || !t.originVoxel.every(Number.isFinite)) bad('template', 'needs spacingMm > 0 and a finite originVoxel', t);
    if (t.fromReferenceRows.length !== 3 || t.fromReferenceRows.some((r) => r.length !== 4 || !r.every(Number.isFinite))) bad('template.fromReferenceRows', 'must be three rows of four finite numbers', t.fromReferenceRows);
    const [a, b, c] = t.fromReferenceRows;
    const det = a[0] * (b[1] * c[2] - b[2] * c[1]) - a[1] * (b[0] * c[2] - b[2] * c[0]) + a[2] * (b[0] * c[1] - b[1] * c[0]);
    if (!(det > 0.1)) bad('template.fromReferenceRows', 'must be an invertible affine that keeps handedness (determinant > 0.1)', t.fromReferenceRows);
    if (!(t.smoothingFwhmMm >= 0) || !(t.whiteMatterSignal > 0) || t.whiteMatterSignal > 10000) bad('template', 'needs smoothingFwhmMm >= 0 and whiteMatterSignal in (0, 10000]', t);
    if (!Number.isInteger(t.supersample) || t.supersample < 1 || t.supersample > 8) bad('template.supersample', 'must be an integer in 1..8', t.supersample);
  }
  s.dropouts.forEach((dr, i) => {
    if (!Number.isInteger(dr.volume) || dr.volume < 0 || dr.volume >= s.nVolumes || !Number.isInteger(dr.slice) || dr.slice < 0 || dr.slice >= s.dims[2] || !(dr.keptFraction >= 0 && dr.keptFraction <= 1)) {
      bad(`dropouts[${i}]`, `needs volume in 0..${s.nVolumes - 1}, slice in 0..${s.dims[2] - 1} and keptFraction in [0, 1]`, dr);
    }
  });
}
