import { sliceTimingGuidance, type SliceTimingGuidance } from '../model/slice-timing-guidance.js';
import { fail } from '../core/fail.js';
import { volumeLike, voxelsPerVolume, type Volume } from '../core/volume.js';
import type { Run } from '../io/run-types.js';
import { brainMaskFromMean, checkUserMask, type BrainMask } from './brain-mask.js';
import type { Finding } from './finding-types.js';
import { FINDING_ADVICE, describeVolumes, signed } from './finding-text.js';
import { summariseInMask, type MapSummary } from './map-summary.js';
import { keptVolumeStats } from './kept-volume-stats.js';
import { maskSeriesPass, type EdgePlan } from './mask-series-pass.js';
import { edgeSides } from './edge-sides.js';
import { edgeSignatureFromSums } from './edge-signature-from-sums.js';
import { otsuThreshold } from './otsu-threshold.js';
import { runTimeSums, type RunTimeSums } from './run-time-sums.js';
import { sliceOutliers, type SliceOutliers } from './slice-outliers.js';
import { dvarsNullExpectation, standardisedDvars } from './standardised-dvars.js';
import { GREY_MATTER_T1_SEC_3T, steadyStateExcess, steadyStateModelCount } from './steady-state-model.js';
import { steadyStateOnset, type SteadyStateOnset } from './steady-state-onset.js';
import { steadyStateFromFirstVolume, type PerVoxelSteadyState } from './steady-state-per-voxel.js';
import { trimmedDvars } from './trimmed-dvars.js';
import { volumeOutliers, type VolumeOutliers } from './volume-outliers.js';
import { screenSpikeVoxels } from './spike-screen.js';
import { voxelSpikes, type VoxelSpike } from './voxel-spikes.js';
import { signalLossLook, type LookB0 } from './signal-loss-look.js';
import { rankFindings } from './rank-findings.js';
import { sliceFindings } from './slice-findings.js';
import { spikeFindings } from './spike-findings.js';
import { lookMotion, type LookMotion } from './look-motion.js';
import { lookMotionWithSignature } from './look-motion-with-signature.js';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { FD_CENSOR_THRESHOLD_MM } from '../model/framewise-displacement.js';

/** Fewest volumes a look accepts: robust z-scores and the steady-state reference window need them. */
export const LOOK_MIN_VOLUMES = 12;

/** Spikes in this many voxels of one volume (not otherwise flagged) make the volume one to censor. */
export const SPIKE_VOXELS_FOR_CENSOR = 10;

/**
 * In a volume the volume measures already flag, this many slices or more off their usual mean are
 * the whole image moving or changing (a head jerk shifts the slices at the edges of the head most),
 * not separate slice dropouts; they are reported with the volume's finding. Fewer stay slice findings,
 * so a dropout inside a flagged volume is still named.
 */
export const SLICES_FOR_VOLUME_EVENT = 3;

/**
 * A voxel whose mean is below this fraction of the median brain voxel's mean has a baseline near the
 * noise floor (edges, vessels, signal voids, outside the brain): its spikes are judged against the
 * median brain voxel's temporal SD and expressed in % of the median brain mean, not of its own.
 */
export const LOW_BASELINE_FRACTION = 0.3;

/**
 * Otsu's separability (between-class / total variance of the mean image) below which the mean image
 * has no clear brain/background split: a normal distribution split at its mean gives 2/pi = 0.64 and a
 * uniform one 0.75 (common practice, no source: both follow from the definition); brain EPI gives
 * about 0.9 or more (the demo phantom 0.96).
 */
export const MASK_MIN_SEPARABILITY = 0.8;

/** A check the look could not run, why, and how to make it possible. */
export interface SkippedCheck {
  check: string;
  why: string;
  how: string;
}

/** Options of {@link lookAtRun}; every cutoff is a robust z (median / 1.4826 MAD units). */
export interface LookOptions {
  /** A brain mask to use instead of the one made from the mean image (same grid, 3D). */
  mask?: Volume;
  /** Polynomial drift order removed before SDs and outlier scores (default 2). */
  detrendOrder?: number;
  /** Initial volumes to drop: a number, or 'auto' (default) for the steady-state recommendation. */
  dropInitialVolumes?: number | 'auto';
  /** Volume outliers: DVARS (one-sided) and global mean (two-sided) cutoff (default 5). */
  volumeCutoffZ?: number;
  /** Slice outliers cutoff (default 5). */
  sliceCutoffZ?: number;
  /** Single-voxel spike cutoff (default 6: at 20 000 voxels x 200 volumes, about 0.01 false spikes per run for Gaussian noise). */
  spikeCutoffZ?: number;
  /** Steady state: cutoff above the extrapolated steady level (default 5). */
  steadyCutoffZ?: number;
  /** T1 for the steady-state model, seconds (default grey matter at 3 T, {@link GREY_MATTER_T1_SEC_3T}). */
  t1Sec?: number;
  /** Flip angle in degrees when the sidecar has none. */
  flipAngleDeg?: number;
  /** Most spike findings listed (volumes with the strongest spikes first; default 20). */
  maxSpikeFindings?: number;
  /**
   * A B0 field in Hz on the run's grid (a field map, or the field a reversed phase-encode pair gives)
   * and where it came from: the look adds its shift map, the signal-loss map and a `signal-loss`
   * finding (see signalLossLook). __Default value:__ none
   */
  b0?: { fieldMapHz: Float32Array; source: string; pairUnwarped?: { imageA: Float32Array; imageB: Float32Array; unwarpedA: Float32Array; unwarpedB: Float32Array } | null } | null;
  /**
   * The head's position at each volume (shifts mm, rotations degrees; one row per volume of the run
   * as opened), for framewise displacement and the head-motion finding. Without it the look reports
   * the motion edge signature only.
   */
  motionTable?: readonly MotionRow[] | null;
  /** How the motion table was obtained, in words (default 'given by the caller'). */
  motionTableMethod?: string;
  /** Framewise displacement above which a volume is reported, mm (default 0.5: common practice, and Power et al. 2012's). */
  fdThresholdMm?: number;
}

/** Everything a look found: maps, traces, findings and the recommendation. */
export interface LookResult {
  /** Maps over the volumes kept (from dropInitialVolumes, censored volumes left out): mean, SD and tSNR (signal units; tSNR dimensionless), and the mask (0/1). */
  maps: { mean: Volume; sd: Volume; tsnr: Volume; mask: Volume };
  /** Map summaries inside the mask. */
  summaries: { mean: MapSummary; sd: MapSummary; tsnr: MapSummary };
  mask: BrainMask;
  /** Per-volume traces, one value per volume (NaN where not defined). */
  series: {
    /** Mean signal in the mask (signal units). */
    globalMean: Float64Array;
    /** DVARS (signal units) and as % of the median global mean. */
    dvars: Float64Array;
    dvarsPercent: Float64Array;
    /** DVARS / sqrt(E[DVARS^2]) (Afyouni & Nichols 2018): about 1 without artefacts. */
    dvarsStandardised: Float64Array;
    /** E[DVARS^2] under the null, squared signal units. */
    dvarsNullExpectation: number;
    /** Per-slice mask means [slice * nt + volume] and their robust z. */
    sliceMean: Float64Array;
    sliceZ: Float64Array;
    dvarsZ: Float64Array;
    globalZ: Float64Array;
  };
  steadyState: {
    /** Leading volumes above the steady level in the data. */
    dataCount: number;
    onset: SteadyStateOnset;
    /** Closed-form count at the same relative threshold, when TR and flip angle are known. */
    modelCount: number | null;
    model: { trSec: number; flipAngleDeg: number; t1Sec: number; t1Source: string; relativeThreshold: number; excessFirstVolume: number } | null;
    /** The same approach fitted per voxel to the first volume (each voxel's own T1), 1 % rule, 99 % of mask voxels. */
    perVoxel: PerVoxelSteadyState | null;
  };
  /** DVARS-flagged volumes whose DVARS falls below the cutoff once a few voxels are left out: spikes, not whole-volume events. */
  dvarsFromFewVoxels: Array<{ volume: number; dvarsZ: number; trimmedDvarsZ: number; voxels: number[] }>;
  volumeOutliers: VolumeOutliers;
  sliceOutliers: SliceOutliers;
  /** Every spike found in the kept, uncensored volumes. */
  spikes: VoxelSpike[];
  /** Head motion: framewise displacement (with a motion table) and the motion edge signature. */
  motion: LookMotion;
  /** Findings ranked by consequence (rankFindings): the most consequential first. */
  findings: Finding[];
  /** Checks not run for want of information (e.g. no sidecar), with how to supply it. */
  skipped: SkippedCheck[];
  /** One line per finding, same order. */
  verdicts: string[];
  recommendation: { dropInitialVolumes: number; censorVolumes: number[]; why: string[] };
  settings: Required<Omit<LookOptions, 'mask' | 'flipAngleDeg' | 'dropInitialVolumes' | 'b0' | 'motionTable' | 'motionTableMethod'>> & { dropInitialVolumes: number | 'auto'; ddof: number; maskSource: 'otsu' | 'user' };
  dims: [number, number, number, number];
  trSec: number;
  /** What the B0 field given in the options does (shift map, lost signal); absent without one. */
  b0?: LookB0 | null;
  /**
   * Guidance on slice-timing correction at the run's TR (shift or model, the aliased cardiac and
   * respiratory frequencies: sliceTimingGuidance), or null without a TR.
   */
  sliceTiming: SliceTimingGuidance | null;
}

/**
 * Look at a run before choosing anything: brain mask, mean/SD/tSNR maps, global mean, DVARS
 * (plain and standardised), per-slice means, steady-state onset, volume/slice outliers and
 * single-voxel spikes, turned into findings with verdicts and a recommendation (volumes to drop,
 * volumes to censor).
 *
 * Phases (reads of the run in brackets):
 *   1. whole-run sums per voxel [1 streamed pass]: mean image, sums of squares, lag-1 products, drift
 *      projections, a drift fit from volume ~10 and its residual extremes -> brain mask (Otsu +
 *      morphology) or user mask
 *   2. global mean, DVARS, slice means in the mask, and the motion edge signature's changes at the
 *      mask's edge voxels (mask voxels too) [mask voxels only]
 *   3. steady-state onset from the global mean     -> volumes to drop [first volumes]
 *   4. volume and slice outliers (traces only)     -> volumes to censor
 *   5. mean, detrended SD, tSNR, lag-1 per voxel over kept, uncensored volumes: the sums of phase 1 minus
 *      the dropped and censored volumes' terms [those volumes only]; standardised DVARS; spike screen from
 *      the residual extremes, exact for the few undecided voxels, spikes scored on the candidates [few voxels]
 *   6. head motion: the motion edge signature [summed in phase 2; read again only when a change needs a
 *      voxel's exact floor] and, with a motion table,
 *      framewise displacement and the volumes above its threshold
 *   7. findings, verdicts, recommendation
 * @param input - a Run (sidecar gives FlipAngle) or a 4D Volume
 * @param options - see {@link LookOptions}
 * @returns the look
 * @throws BoldsweepError NOT_4D (3D image), TOO_FEW_VOLUMES (fewer than {@link LOOK_MIN_VOLUMES}),
 *   CONSTANT_DATA (no contrast for a mask, or no voxel varies over time), GRID_MISMATCH (user mask)
 * @example const look = lookAtRun(await openRun('sub-01_task-x_bold.nii.gz')); console.log(look.verdicts.join('\n'))
 */
export function lookAtRun(input: Run | Volume, options: LookOptions = {}): LookResult {
  const run: Volume = 'volume' in input ? input.volume : input;
  const sidecar = 'volume' in input ? input.sidecar : null;
  const [nx, ny, nz, nt] = run.dims;
  if (nt < 2) fail('NOT_4D', `the image has ${nt} volume (${nx}x${ny}x${nz}); a look needs the 4D run`);
  if (nt < LOOK_MIN_VOLUMES) fail('TOO_FEW_VOLUMES', `a look needs at least ${LOOK_MIN_VOLUMES} volumes (robust outlier scores and the steady-state reference window), the run has ${nt}`);
  const detrendOrder = options.detrendOrder ?? 2;
  const volumeCutoffZ = options.volumeCutoffZ ?? 5;
  const sliceCutoffZ = options.sliceCutoffZ ?? 5;
  const spikeCutoffZ = options.spikeCutoffZ ?? 6;
  const steadyCutoffZ = options.steadyCutoffZ ?? 5;
  const maxSpikeFindings = options.maxSpikeFindings ?? 20;
  const n = voxelsPerVolume(run);

  // 1. one streamed read: whole-run sums (phases 3 and 5 subtract what they leave out), then the mask
  const h = Math.min(5, Math.floor(nt / 10)); // the per-voxel steady-state reference starts here
  const fitFrom = Math.max(0, Math.min(h, nt - detrendOrder - 2));
  const sums = runTimeSums(run, { detrendOrder, fitFrom, residualsAbove: backgroundLevel(run, fitFrom), reuse: takeSpareSums() });
  const meanAll = sums.meanAll;
  const nonFinite = new Uint8Array(n);
  const nonFiniteCount = markNonFinite(meanAll, nonFinite);
  if (nonFiniteCount === n) fail('CONSTANT_DATA', 'every voxel holds a NaN or infinite value in some volume; nothing can be measured');
  let mask: BrainMask;
  let unclearMask: { separability: number; mask: BrainMask } | null = null;
  if (options.mask) {
    mask = checkUserMask(options.mask, run);
    let dropped = 0;
    for (let v = 0; v < n; v++) if (mask.mask[v] && nonFinite[v]) { mask.mask[v] = 0; dropped++; }
    mask.voxels -= dropped;
    if (mask.voxels === 0) fail('INVALID_ARGUMENT', 'every voxel of the user mask holds NaN or infinite values');
  } else {
    mask = brainMaskFromMean(meanAll, [nx, ny, nz], { spacingMm: run.spacingMm });
    if (mask.otsu && mask.otsu.separability < MASK_MIN_SEPARABILITY) unclearMask = { separability: mask.otsu.separability, mask: mask = wholeFieldMask(meanAll) };
  }
  const emptySlices = zeroSlices(meanAll, [nx, ny, nz]);

  // 2. traces in the mask, and the motion edge signature's changes from the same reads
  const edges = edgePlan(mask.mask, [nx, ny, nz], sums);
  const pass = maskSeriesPass(run, mask.mask, 10, edges);
  const traces = pass.series;

  // 3. steady state
  const onset = steadyStateOnset(traces.globalMean, { cutoffZ: steadyCutoffZ });
  const trSec = run.trSec > 0 ? run.trSec : typeof sidecar?.RepetitionTime === 'number' ? sidecar.RepetitionTime : 0;
  const flip = typeof sidecar?.FlipAngle === 'number' ? sidecar.FlipAngle : options.flipAngleDeg;
  const steadyLevel = onset.level[Math.min(nt - 1, onset.reference[0])];
  let model: LookResult['steadyState']['model'] = null;
  let modelCount: number | null = null;
  if (trSec > 0 && flip !== undefined && flip > 0 && steadyLevel > 0) {
    const t1Sec = options.t1Sec ?? GREY_MATTER_T1_SEC_3T;
    const relativeThreshold = (steadyCutoffZ * onset.scale) / steadyLevel;
    const params = { trSec, flipAngleDeg: flip, t1Sec };
    modelCount = steadyStateModelCount(params, relativeThreshold);
    model = {
      trSec, flipAngleDeg: flip, t1Sec,
      t1Source: options.t1Sec !== undefined ? 'given' : 'grey matter at 3 T, Wansapura et al. 1999 J Magn Reson Imaging 9:531 (1.331 s)',
      relativeThreshold, excessFirstVolume: steadyStateExcess(1, params),
    };
  }
  let perVoxel: PerVoxelSteadyState | null = null;
  if (trSec > 0 && flip !== undefined && flip > 0) {
    // steady mean without the first few volumes, so their excess does not bias the reference (in the
    // mean image's buffer: the mask and the non-finite flags are made, and it is not used again)
    const late = meanAll;
    const { shift, sum } = sums;
    if (sums.fitFrom === h) {
      const c0 = sums.fit[0]; // mean of z over volumes h..nt-1
      addInto(shift, c0, late);
    } else {
      for (let v = 0; v < n; v++) {
        let s = sum[v];
        for (let t = 0; t < h; t++) s -= run.data[t * n + v] - shift[v];
        late[v] = shift[v] + s / (nt - h);
      }
    }
    perVoxel = steadyStateFromFirstVolume(run.data.subarray(0, n), late, mask.mask, { trSec, flipAngleDeg: flip });
  }
  const auto = options.dropInitialVolumes === undefined || options.dropInitialVolumes === 'auto';
  const drop = auto ? Math.max(onset.count, perVoxel?.count ?? 0) : (options.dropInitialVolumes as number);
  if (!Number.isInteger(drop) || drop < 0) fail('INVALID_ARGUMENT', `dropInitialVolumes must be a whole number of volumes, 0 or more (or 'auto'); got ${drop}`);
  if (nt - drop < LOOK_MIN_VOLUMES) {
    fail(auto ? 'TOO_FEW_VOLUMES' : 'INVALID_ARGUMENT', `dropping ${drop} initial volumes leaves ${nt - drop}; a look needs ${LOOK_MIN_VOLUMES}`);
  }

  // 4. volume and slice outliers from the traces alone: their volumes stay out of the maps below
  const vol = volumeOutliers(traces.dvars, traces.globalMean, { firstVolume: drop, cutoffZ: volumeCutoffZ, detrendOrder });
  const sl = sliceOutliers(traces.sliceMean, nz, nt, { firstVolume: drop, cutoffZ: sliceCutoffZ, detrendOrder });
  // a DVARS flag that disappears when the few most-changed voxels are left out is a voxel spike (it
  // is found as such below), not a reason to censor the whole volume
  const trimK = Math.max(10, Math.round(0.0005 * mask.voxels));
  const dvarsFromFewVoxels: LookResult['dvarsFromFewVoxels'] = [];
  if (mask.voxels > 4 * trimK && vol.dvarsScale > 0) {
    vol.flagged = vol.flagged.filter((f) => {
      if (f.reasons.length !== 1 || f.reasons[0] !== 'dvars-high') return true;
      const trimmed = trimmedDvars(run, mask.mask, f.volume, trimK);
      const trimmedZ = (trimmed.dvars - vol.dvarsMedian) / vol.dvarsScale;
      if (trimmedZ > volumeCutoffZ) return true;
      dvarsFromFewVoxels.push({ volume: f.volume, dvarsZ: f.dvarsZ, trimmedDvarsZ: trimmedZ, voxels: trimmed.left });
      return false;
    });
  }
  const censor = new Set<number>();
  for (const f of vol.flagged) censor.add(f.volume);
  for (const f of sl.flagged) censor.add(f.volume);
  if (nt - drop - censor.size < LOOK_MIN_VOLUMES) fail('TOO_FEW_VOLUMES', `after dropping ${drop} and censoring ${censor.size} volumes only ${nt - drop - censor.size} remain; a look needs ${LOOK_MIN_VOLUMES}`);
  const censorForStats = [...censor].sort((a, b) => a - b);

  // 5. maps over kept volumes (censored ones excluded, so an artefact does not inflate every SD)
  const stats = keptVolumeStats(run, sums, { firstVolume: drop, censorVolumes: censorForStats, mask: mask.mask });
  if (nonFiniteCount > 0) for (let v = 0; v < n; v++) if (nonFinite[v]) stats.mean[v] = stats.sd[v] = stats.tsnr[v] = stats.lag1[v] = NaN;
  const varying = countPositiveIn(stats.sd, mask.mask);
  if (varying === 0) fail('CONSTANT_DATA', `none of the ${mask.voxels} mask voxels varies over time`);
  const maskF32 = Float32Array.from(mask.mask);
  const maps = {
    mean: volumeLike(run, 1, stats.mean),
    sd: volumeLike(run, 1, stats.sd),
    tsnr: volumeLike(run, 1, stats.tsnr),
    mask: volumeLike(run, 1, maskF32),
  };
  const summaries = {
    mean: summariseInMask(stats.mean, mask.mask),
    sd: summariseInMask(stats.sd, mask.mask),
    tsnr: summariseInMask(stats.tsnr, mask.mask),
  };
  const nullE = dvarsNullExpectation(stats.sd, stats.lag1, mask.mask);
  const dvarsStd = standardisedDvars(traces.dvars, nullE);
  const globalMedian = summariseInMask(traces.globalMean.subarray(drop)).median;
  const dvarsPercent = traces.dvars.map((d) => (100 * d) / globalMedian);

  // spikes: screen every mask voxel by max|residual| / SD, then score the few candidates exactly.
  // A voxel with up to 4 spikes of robust z >= c still has max|r|/SD >= c / sqrt(1 + 4 c^2 / T)
  // (each spike inflates the SD); 0.9 leaves room for the drift fit and the MAD/SD difference.
  const T = stats.usedVolumes;
  const screen = (0.9 * spikeCutoffZ) / Math.sqrt(1 + (4 * spikeCutoffZ * spikeCutoffZ) / T);
  const candidates = screenSpikeVoxels(run, sums, stats, screen);
  const absolute = { belowMean: LOW_BASELINE_FRACTION * summaries.mean.median, floorScale: summaries.sd.median, referenceMean: summaries.mean.median };
  const spikes = voxelSpikes(run, candidates, { firstVolume: drop, detrendOrder, cutoffZ: spikeCutoffZ, censorVolumes: censorForStats, absolute });

  // 6. findings
  const findings: Finding[] = [];
  if (nonFiniteCount > 0) findings.push(nonFiniteFinding(nonFinite, [nx, ny, nz]));
  if (emptySlices.length > 0) findings.push(emptySliceFinding(emptySlices, nz));
  if (drop > 0) findings.push(steadyFinding(drop, auto, onset, modelCount, model, perVoxel, traces.globalMean));
  const { slicesWithVolume, sliceOnly } = splitSliceFlags(sl, new Set(vol.flagged.map((f) => f.volume)));
  findings.push(...volumeFindings(vol, traces.dvars, dvarsStd, traces.globalMean, slicesWithVolume));
  findings.push(...sliceFindings(sliceOnly, sl.cutoffZ));
  const explainedVolume = new Set(sl.wholeVolumeEvents);
  const unexplained = spikes.filter((s) => !explainedVolume.has(s.volume));
  findings.push(...spikeFindings(unexplained, { cutoffZ: spikeCutoffZ, voxelsForCensor: SPIKE_VOXELS_FOR_CENSOR, maxIsolated: maxSpikeFindings }));
  // head motion: the edge signature always (from the mask-series pass), FD when a table is known
  const fdThresholdMm = options.fdThresholdMm ?? FD_CENSOR_THRESHOLD_MM;
  const motionOptions = { table: options.motionTable ?? null, source: options.motionTable ? 'given' as const : null, method: options.motionTableMethod ?? 'given by the caller', fdThresholdMm, firstVolume: drop };
  const { motion, finding: motionFinding } = edges && pass.sideSums
    ? lookMotionWithSignature(edgeSignatureFromSums(pass.sideSums, edges.sides, nt), nt, motionOptions)
    : lookMotion(run, mask.mask, motionOptions);
  if (motionFinding) findings.push(motionFinding);
  const skipped: SkippedCheck[] = [];
  const b0Look = options.b0 ? signalLossLook(options.b0, [nx, ny, nz], sidecar, mask.mask) : null;
  if (b0Look?.finding) findings.push(b0Look.finding);
  if (b0Look?.skipped) skipped.push({ check: 'signal lost to the B0 field (shift map, dephasing and folding)', ...b0Look.skipped });
  const ranked = rankFindings(findings);
  if (unclearMask) {
    skipped.push({
      check: 'automatic brain mask',
      why: `the mean image has no clear brain/background split (Otsu separability ${unclearMask.separability.toFixed(2)}, below ${MASK_MIN_SEPARABILITY}: a uniform object or an image without background), so every voxel with a finite, nonzero mean (${unclearMask.mask.voxels}) is used`,
      how: 'give a brain mask on the run\'s grid (--mask on the command line, the mask option of lookAtRun)',
    });
  }
  if (nz === 1) {
    skipped.push({
      check: 'slice checks (dropouts, bright slices, slice means moving with the head)',
      why: 'the run has one slice, so no slice can be compared with the others',
      how: 'nothing to do for a single-slice run; the volume measures (DVARS, global mean) and spike checks still ran',
    });
  }
  if (!(trSec > 0) || flip === undefined || !(flip > 0)) {
    const missing = [!(trSec > 0) ? 'the repetition time' : '', flip === undefined || !(flip > 0) ? 'the flip angle' : ''].filter(Boolean).join(' and ');
    skipped.push({
      check: 'steady-state model (how many volumes the spoiled-gradient-echo signal needs to settle, per voxel and for grey matter)',
      why: `${missing} ${missing.includes(' and ') ? 'are' : 'is'} not known${sidecar ? ' (the sidecar has no ' + [!(trSec > 0) ? 'RepetitionTime' : '', flip === undefined ? 'FlipAngle' : ''].filter(Boolean).join(' or ') + ')' : ' (no BIDS sidecar beside the run)'}; the volumes to drop come from the global mean alone`,
      how: 'put a BIDS sidecar beside the run (X_bold.nii.gz -> X_bold.json) with "RepetitionTime" (s) and "FlipAngle" (deg), or give them: flipAngleDeg in the look options / --flip-angle-deg on the command line',
    });
  }

  const spikesPerVolume = new Map<number, number>();
  for (const s of unexplained) spikesPerVolume.set(s.volume, (spikesPerVolume.get(s.volume) ?? 0) + 1);
  for (const [t, k] of spikesPerVolume) if (k >= SPIKE_VOXELS_FOR_CENSOR) censor.add(t);
  const censorVolumes = [...censor].sort((a, b) => a - b);
  const why: string[] = [];
  if (drop > 0) why.push(`drop ${drop}: ${auto ? `steady state reached at volume ${drop} (global mean: ${onset.count}${modelCount !== null ? `, grey-matter model: ${modelCount}` : ''}${perVoxel ? `, per-voxel model: ${perVoxel.count}` : ''})` : 'as requested'}`);
  if (censorVolumes.length) why.push(`censor ${describeVolumes(censorVolumes)}: flagged by DVARS, global mean, slice means or many simultaneous spikes`);

  const result: LookResult = {
    maps, summaries, mask,
    series: {
      globalMean: traces.globalMean, dvars: traces.dvars, dvarsPercent, dvarsStandardised: dvarsStd, dvarsNullExpectation: nullE,
      sliceMean: traces.sliceMean, sliceZ: sl.z, dvarsZ: vol.dvarsZ, globalZ: vol.globalZ,
    },
    steadyState: { dataCount: onset.count, onset, modelCount, model, perVoxel },
    dvarsFromFewVoxels,
    volumeOutliers: vol, sliceOutliers: sl, spikes, motion,
    findings: ranked, skipped, verdicts: ranked.map((f) => f.verdict),
    recommendation: { dropInitialVolumes: drop, censorVolumes, why },
    settings: { detrendOrder, volumeCutoffZ, sliceCutoffZ, spikeCutoffZ, steadyCutoffZ, t1Sec: model?.t1Sec ?? options.t1Sec ?? GREY_MATTER_T1_SEC_3T, maxSpikeFindings, fdThresholdMm, dropInitialVolumes: options.dropInitialVolumes ?? 'auto', ddof: stats.ddof, maskSource: mask.source },
    dims: [nx, ny, nz, nt], trSec,
    ...(b0Look ? { b0: b0Look.b0 } : {}),
    sliceTiming: trSec > 0 ? sliceTimingGuidance(trSec) : null,
  };
  spareSums = sums; // nothing returned above refers to the sums' arrays
  return result;
}

/**
 * The whole-run sums of the previous look, whose ~13 MB of arrays (for a 64 x 64 x 36 grid) the next
 * look of a grid of that size overwrites instead of taking fresh memory: first touches of fresh pages
 * and the garbage collections they bring cost more than the arithmetic on them. Kept until the next
 * look; taken (set to null) while a look uses them.
 */
let spareSums: RunTimeSums | null = null;

function takeSpareSums(): RunTimeSums | undefined {
  const s = spareSums;
  spareSums = null;
  return s ?? undefined;
}

/**
 * Half the Otsu threshold of one volume (every 8th voxel of volume `t`): voxels darker than this on
 * average are background, and the whole-run sums skip their residual extremes. Only speed depends on
 * it: a mask voxel below it is screened from its data instead.
 */
function backgroundLevel(run: Volume, t: number): number {
  const n = voxelsPerVolume(run);
  const sample = new Float64Array(Math.ceil(n / 8)); // Float64 like the mean image: one array type for the histogram code
  for (let i = 0; i < sample.length; i++) sample[i] = run.data[t * n + 8 * i];
  try {
    return 0.5 * otsuThreshold(sample).threshold;
  } catch {
    return -Infinity; // one value or none finite: nothing to skip
  }
}

/**
 * The edge voxels of the mask for the motion edge signature, with a bound on each one's floor (a tenth
 * of its mean over the run) from the whole-run sums: the mean as motionEdgeSignature sums it differs
 * from shift + S / nt by rounding, of order 1e-16 x (number of volumes) x its terms, far inside the
 * 1e-9 x (|mean| + |shift| + RMS deviation) allowed. Null when some side has no edge voxel (then
 * lookMotion finds no signature either).
 */
function edgePlan(mask: Uint8Array, dims: [number, number, number], sums: RunTimeSums): EdgePlan | null {
  const sides = edgeSides(mask, dims);
  for (let a = 0; a < 3; a++) if (sides.plus[a].length === 0 || sides.minus[a].length === 0) return null;
  const { edge } = sides;
  const floorAbove = new Float64Array(edge.length);
  for (let e = 0; e < edge.length; e++) {
    const v = edge[e];
    const m = sums.meanAll[v], sh = sums.shift[v], rms = Math.sqrt(sums.sumSquares[v] / sums.nt);
    const bound = (Math.abs(m) + 1e-9 * (Math.abs(m) + Math.abs(sh) + rms)) / 10;
    floorAbove[e] = Number.isFinite(bound) && bound > 0 ? bound : Infinity;
  }
  return { sides, floorAbove };
}

/** Sets flags[v] = 1 where values[v] is not finite; returns how many. */
function markNonFinite(values: Float64Array, flags: Uint8Array): number {
  let count = 0;
  for (let v = 0; v < values.length; v++) if (!Number.isFinite(values[v])) { flags[v] = 1; count++; }
  return count;
}

/** out[v] = a[v] + b[v]. */
function addInto(a: Float64Array, b: Float64Array, out: Float64Array): void {
  for (let v = 0; v < out.length; v++) out[v] = a[v] + b[v];
}

/** Voxels with mask[v] set and values[v] > 0. */
function countPositiveIn(values: Float32Array, mask: Uint8Array): number {
  let count = 0;
  for (let v = 0; v < values.length; v++) if (mask[v] && values[v] > 0) count++;
  return count;
}

function nonFiniteFinding(nonFinite: Uint8Array, dims: [number, number, number]): Finding {
  const [nx, ny, nz] = dims;
  const perSlice = new Array<number>(nz).fill(0);
  for (let v = 0; v < nonFinite.length; v++) if (nonFinite[v]) perSlice[Math.floor(v / (nx * ny))]++;
  const slices = perSlice.map((c, z) => (c > 0 ? z : -1)).filter((z) => z >= 0);
  const whole = slices.filter((z) => perSlice[z] === nx * ny);
  const total = perSlice.reduce((a, b) => a + b, 0);
  return {
    kind: 'non-finite', volumes: [], slices, voxels: [],
    evidence: { voxels: total, slicesAffected: slices.length, wholeSlices: whole, voxelsPerSlice: slices.map((z) => perSlice[z]) },
    reason: `${total} voxels hold NaN or infinite values in at least one volume${whole.length ? `; ${describeVolumes(whole, 'slice')} entirely` : ''}`,
    advice: FINDING_ADVICE['non-finite'],
    verdict: `${total} voxels with NaN/infinite values (${describeVolumes(slices, 'slice')}): excluded; repair or mask them`,
    consequence: `${total} voxels excluded from every measure`,
  };
}

function steadyFinding(drop: number, auto: boolean, onset: SteadyStateOnset, modelCount: number | null, model: LookResult['steadyState']['model'], perVoxel: PerVoxelSteadyState | null, g: Float64Array): Finding {
  const volumes = Array.from({ length: drop }, (_, i) => i);
  const excessPercent = volumes.map((t) => (100 * (g[t] - onset.level[t])) / onset.level[t]);
  const evidence: Finding['evidence'] = {
    dataCount: onset.count, cutoffZ: onset.cutoffZ, robustSdSignal: onset.scale,
    zOfDropped: volumes.map((t) => round(onset.z[t], 2)), excessPercent: excessPercent.map((e) => round(e, 3)),
    referenceVolumes: `${onset.reference[0]}-${onset.reference[1] - 1}`,
  };
  if (model) Object.assign(evidence, { modelCount: modelCount ?? 0, trSec: model.trSec, flipAngleDeg: model.flipAngleDeg, t1Sec: model.t1Sec, t1Source: model.t1Source, relativeThreshold: model.relativeThreshold });
  if (perVoxel) Object.assign(evidence, { perVoxelCount: perVoxel.count, perVoxelMedianT1Sec: round(perVoxel.medianT1Sec, 3), perVoxelFractionNeeding: perVoxel.fractionNeeding.map((f) => round(f, 4)) });
  const modelText = model
    ? `; the spoiled-gradient-echo approach (TR ${model.trSec} s, flip ${model.flipAngleDeg} deg) predicts ${modelCount} above the same threshold for grey matter (T1 ${model.t1Sec} s), and ${perVoxel?.count ?? 0} to bring ${Math.round(100 * (perVoxel?.coverage ?? 0.99))} % of brain voxels within 1 % when each voxel's T1 is fitted to its first-volume excess (median ${perVoxel ? perVoxel.medianT1Sec.toFixed(2) : '?'} s)`
    : '; no flip angle known, so no model check';
  return {
    kind: 'non-steady-start', volumes, slices: [], voxels: [], evidence,
    reason: `${auto ? `the global mean of the first ${onset.count} volumes lies more than ${onset.cutoffZ} robust SDs above the steady level (volumes 0-${drop - 1}: ${excessPercent.map((e) => signed(e, 2) + ' %').join(', ')})${modelText}` : `${drop} volumes dropped as requested (data count ${onset.count})`}`,
    advice: FINDING_ADVICE['non-steady-start'],
    verdict: `${drop} volume${drop === 1 ? '' : 's'} brighter than steady state: drop ${drop === 1 ? 'it' : 'them'}`,
    consequence: `${drop} volume${drop === 1 ? '' : 's'} dropped from the start`,
  };
}

/** Slice flags of flagged volumes with {@link SLICES_FOR_VOLUME_EVENT} or more of them (per volume) apart from the rest. */
function splitSliceFlags(sl: SliceOutliers, flaggedVolumes: Set<number>): { slicesWithVolume: Map<number, number[]>; sliceOnly: SliceOutliers['flagged'] } {
  const perVolume = new Map<number, number[]>();
  for (const f of sl.flagged) perVolume.set(f.volume, [...(perVolume.get(f.volume) ?? []), f.slice]);
  const slicesWithVolume = new Map<number, number[]>();
  for (const [t, slices] of perVolume) if (flaggedVolumes.has(t) && slices.length >= SLICES_FOR_VOLUME_EVENT) slicesWithVolume.set(t, slices.sort((a, b) => a - b));
  return { slicesWithVolume, sliceOnly: sl.flagged.filter((f) => !slicesWithVolume.has(f.volume)) };
}

function volumeFindings(vol: VolumeOutliers, dvars: Float64Array, dvarsStd: Float64Array, g: Float64Array, slicesWithVolume: Map<number, number[]>): Finding[] {
  const runs: Array<typeof vol.flagged> = [];
  for (const f of vol.flagged) {
    const last = runs[runs.length - 1];
    if (last && last[last.length - 1].volume === f.volume - 1) last.push(f);
    else runs.push([f]);
  }
  return runs.map((group) => {
    const volumes = group.map((f) => f.volume);
    const jump = group.some((f) => f.reasons.includes('dvars-high'));
    const kind = jump ? 'volume-jump' as const : 'global-signal' as const;
    const maxD = Math.max(...group.map((f) => f.dvarsZ).filter(Number.isFinite));
    const maxG = group.reduce((m, f) => (Math.abs(f.globalZ) > Math.abs(m) ? f.globalZ : m), 0);
    const withSlices = volumes.filter((t) => slicesWithVolume.has(t));
    const slices = [...new Set(withSlices.flatMap((t) => slicesWithVolume.get(t)!))].sort((a, b) => a - b);
    const sliceText = withSlices.length
      ? `; slice means move with it (${withSlices.map((t) => `${slicesWithVolume.get(t)!.length} slices of volume ${t}`).join(', ')}), as when the whole head moves`
      : '';
    const reason = (jump
      ? `DVARS robust z up to ${maxD.toFixed(1)} (cutoff ${vol.cutoffZ}, one-sided): the image changes abruptly from the volume before`
      : `global mean robust z ${signed(maxG)} (cutoff +-${vol.cutoffZ}) after removing drift`) + sliceText;
    return {
      kind, volumes, slices, voxels: [],
      evidence: {
        dvarsSignal: volumes.map((t) => round(dvars[t], 3)), dvarsStandardised: volumes.map((t) => round(dvarsStd[t], 3)),
        dvarsZ: group.map((f) => round(f.dvarsZ, 2)), globalMean: volumes.map((t) => round(g[t], 3)), globalZ: group.map((f) => round(f.globalZ, 2)),
        cutoffZ: vol.cutoffZ,
        slicesOffPerVolume: volumes.map((t) => slicesWithVolume.get(t)?.length ?? 0),
      },
      reason,
      advice: FINDING_ADVICE[kind],
      verdict: jump
        ? `abrupt change at ${describeVolumes(volumes)} (DVARS ${(Math.max(...volumes.map((t) => dvarsStd[t]))).toFixed(1)}x its null level): censor`
        : `global signal off its drift at ${describeVolumes(volumes)} (z ${signed(maxG)}): censor`,
      consequence: `${describeVolumes(volumes)} censored`,
    };
  });
}

function round(x: number, digits: number): number {
  if (!Number.isFinite(x)) return x;
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/** Every voxel whose mean is finite and nonzero: the mask when the mean image has no clear split. */
function wholeFieldMask(mean: Float64Array): BrainMask {
  const m = new Uint8Array(mean.length);
  let voxels = 0;
  for (let v = 0; v < m.length; v++) if (Number.isFinite(mean[v]) && mean[v] !== 0) { m[v] = 1; voxels++; }
  if (voxels === 0) fail('CONSTANT_DATA', 'every voxel has a zero or non-finite mean; nothing can be measured');
  return { mask: m, voxels, threshold: NaN, otsu: null, steps: null, source: 'otsu', method: 'no clear brain/background split in the mean image: every voxel with a finite, nonzero mean' };
}

/** Slices whose mean is exactly 0 in every voxel (empty slices: padding, or lost in reconstruction). */
function zeroSlices(mean: Float64Array, dims: [number, number, number]): number[] {
  const [nx, ny, nz] = dims;
  const out: number[] = [];
  for (let k = 0; k < nz; k++) {
    let empty = true;
    for (let v = k * nx * ny; v < (k + 1) * nx * ny && empty; v++) if (mean[v] !== 0) empty = false;
    if (empty) out.push(k);
  }
  return out;
}

function emptySliceFinding(slices: number[], nz: number): Finding {
  return {
    kind: 'empty-slices', volumes: [], slices, voxels: [],
    evidence: { slices, slicesInRun: nz },
    reason: `${describeVolumes(slices, 'slice')} hold${slices.length === 1 ? 's' : ''} zero in every voxel of every volume: no signal was recorded there (or the slices were padded)`,
    advice: FINDING_ADVICE['empty-slices'],
    verdict: `${describeVolumes(slices, 'slice')} empty (all zeros): left out of the mask and every measure`,
    consequence: `${slices.length} of ${nz} slices carry no data`,
  };
}
