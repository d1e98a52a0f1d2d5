import type { Connectivity } from '../core/components.js';
import { fail } from '../core/fail.js';
import { sameGrid, type Volume } from '../core/volume.js';
import type { PlantTruth } from '../plant/plant-activations.js';
import { clusterCounts } from './cluster-counts.js';
import { diceCoefficient } from './dice.js';
import { effectBias } from './effect-bias.js';
import { blobPeaks } from './blob-peaks.js';
import { rocArea } from './roc-area.js';
import { rocCurve, type RocCurve } from './roc-curve.js';

/**
 * One flat row of a scorecard: how well one detection map found the planted activations.
 * Rates are fractions in [0, 1]; counts are voxels or clusters; distances mm; effects percent
 * signal change (% of the voxel's temporal mean, at the time-course peak). Voxel counts and rates
 * are within the brain mask. NaN marks a measure that is undefined for this map (say, no effect map).
 */
export type ScoreRow = {
  /** Blob shape planted: 'gaussian' or 'sphere'. */
  shape: string;
  /** Blob size (mm): FWHM of a Gaussian, diameter of a sphere. */
  sizeMm: number;
  /** Planted peak amplitude (% signal change). */
  amplitudePct: number;
  /** Seed the blob centres were drawn with. */
  plantSeed: number;
  /** Name of the threshold rule that made the survivors ('' when not given). */
  thresholdMethod: string;
  /** Statistic threshold that made the survivors (NaN when not given). */
  threshold: number;
  /** Voxels in the brain mask. */
  brainVoxels: number;
  /** Truth voxels (planted weight >= truth fraction) inside the brain mask. */
  truthVoxels: number;
  /** Surviving voxels inside the brain mask. */
  survivorVoxels: number;
  /** Surviving truth voxels (true positives). */
  truePositiveVoxels: number;
  /** Surviving non-truth voxels (false positives). */
  falsePositiveVoxels: number;
  /** True-positive rate: truePositiveVoxels / truthVoxels (fraction). */
  hitRate: number;
  /** False-positive rate: falsePositiveVoxels / (brainVoxels - truthVoxels) (fraction). */
  falseAlarmRate: number;
  /** Number of planted blobs. */
  blobs: number;
  /** Blobs with at least one surviving voxel in their truth region. */
  blobsDetected: number;
  /** blobsDetected / blobs (fraction). */
  blobHitRate: number;
  /** Connected clusters of survivors (connectivity as given, default 26). */
  clusters: number;
  /** Clusters containing no truth voxel: false alarms per run, counted as clusters. */
  falseClusters: number;
  /** Dice overlap of survivors and truth, 2|S ∩ T| / (|S| + |T|) (fraction; Dice 1945). */
  dice: number;
  /** Area under the voxelwise ROC curve of the statistic, truth vs other brain voxels (0.5 = chance). */
  rocAuc: number;
  /** Radius (mm) around each true centre searched for the statistic peak. */
  peakSearchRadiusMm: number;
  /** Mean over blobs of the distance (mm) from the true centre to the statistic peak. */
  peakErrorMeanMm: number;
  /** Largest such distance over blobs (mm). */
  peakErrorMaxMm: number;
  /** Mean over blobs of the largest statistic within the search radius (statistic units). */
  peakStatisticMean: number;
  /** Mean over blobs of the statistic at the true centre voxel (statistic units): the matched-filter gain shows here. */
  centreStatisticMean: number;
  /** Mean estimated effect over truth voxels (%), NaN without an effect map. */
  effectEstimatedPct: number;
  /** Mean planted effect over the same voxels (%). */
  effectPlantedPct: number;
  /** effectEstimatedPct - effectPlantedPct (%); negative = shrunk. */
  effectBiasPct: number;
  /** effectEstimatedPct / effectPlantedPct (1 = unbiased). */
  effectRatio: number;
  /** Mean over blobs of the estimated effect at the centre voxel (%). */
  effectCentrePct: number;
  /** effectCentrePct - amplitudePct (%). */
  effectCentreBiasPct: number;
};

/** Inputs of {@link scoreDetection}. All maps are on the truth's grid (one value per voxel). */
export interface ScoreInput {
  /** Detection statistic map (t or z; larger = more evidence), a 3D volume or per-voxel array. */
  statistic: Volume | ArrayLike<number>;
  /** Voxels that survived the threshold, nonzero = survived. */
  survivors: ArrayLike<number>;
  /** Ground truth from plantActivations. */
  truth: PlantTruth;
  /** Brain mask: only voxels inside are scored. */
  brainMask: Volume | ArrayLike<number>;
  /** Estimated effect in % signal change (optional; without it the effect fields are NaN). */
  effectPct?: Volume | ArrayLike<number>;
  /** Threshold that made the survivors, recorded in the row. */
  threshold?: number;
  /** Name of the threshold rule, recorded in the row (e.g. a threshold result's `rule`: 'rft-fwe', 'uncorrected'). */
  thresholdMethod?: string;
  /** Search radius for the peak (mm). __Default value:__ the blob size (truth.sizeMm). */
  peakSearchRadiusMm?: number;
  /** Cluster neighbourhood. __Default value:__ 26. */
  connectivity?: Connectivity;
  /** ROC thresholds (see rocCurve). __Default value:__ every distinct statistic value (exact area). */
  rocThresholds?: number | ArrayLike<number>;
  /**
   * The ROC curve of this statistic against the truth mask within the brain mask, when the caller has
   * already computed it (a sweep also samples it for its curve table): its area is used instead of
   * computing the curve again. __Default value:__ computed here (with `rocThresholds`).
   */
  rocCurve?: RocCurve;
}

/**
 * Score one detection map against the planted truth: hits, false alarms, Dice, ROC area, peak
 * location and effect-size bias, as one flat row for the scorecard.
 * @param input - statistic, survivors, truth, brain mask and optional effect map
 * @returns the row (fields documented on {@link ScoreRow})
 * @throws BoldsweepError GRID_MISMATCH when a map is not on the truth's grid, INVALID_ARGUMENT for bad options
 * @example
 * const fwe = thresholdRft(z, brainMask, truth.dims, rftOptions); // any rule returning { rule, threshold, survivors }
 * const row = scoreDetection({ statistic: z, survivors: fwe.survivors, truth, brainMask, threshold: fwe.threshold, thresholdMethod: fwe.rule })
 */
export function scoreDetection(input: ScoreInput): ScoreRow {
  const { truth } = input;
  const n = truth.mask.length;
  const stat = gridData(input.statistic, truth, 'statistic map');
  const brain = gridData(input.brainMask, truth, 'brain mask');
  const survivors = gridData(input.survivors, truth, 'survivors mask');
  const effect = input.effectPct === undefined ? undefined : gridData(input.effectPct, truth, 'effect map');
  const radius = input.peakSearchRadiusMm ?? truth.sizeMm;

  // 1. voxel counts inside the brain
  const inBrainSurvivors = new Uint8Array(n);
  let brainVoxels = 0, truthVoxels = 0, survivorVoxels = 0, tp = 0;
  for (let v = 0; v < n; v++) {
    if (!brain[v]) continue;
    brainVoxels++;
    if (truth.mask[v]) truthVoxels++;
    if (survivors[v]) {
      inBrainSurvivors[v] = 1;
      survivorVoxels++;
      if (truth.mask[v]) tp++;
    }
  }
  const fp = survivorVoxels - tp;

  // 2. per-blob hits and cluster false alarms
  let blobsDetected = 0;
  for (const b of truth.blobs) if (b.truthVoxels.some((v) => inBrainSurvivors[v] === 1)) blobsDetected++;
  const clusters = clusterCounts(inBrainSurvivors, truth.mask, truth.dims, input.connectivity ?? 26);

  // 3. threshold-free measures: ROC area, peak location, effect size
  const rocAuc = truthVoxels > 0 && brainVoxels > truthVoxels ? rocArea(input.rocCurve ?? rocCurve(stat, truth.mask, brain, input.rocThresholds)) : NaN;
  const peaks = blobPeaks(stat, truth.dims, truth.affine, truth.centresVoxel, radius, brain);
  const bias = effect && truthVoxels > 0 ? effectBias(effect, truth, brain) : undefined;

  return {
    shape: truth.shape.shape,
    sizeMm: truth.sizeMm,
    amplitudePct: truth.amplitudePct,
    plantSeed: truth.seed,
    thresholdMethod: input.thresholdMethod ?? '',
    threshold: input.threshold ?? NaN,
    brainVoxels,
    truthVoxels,
    survivorVoxels,
    truePositiveVoxels: tp,
    falsePositiveVoxels: fp,
    hitRate: truthVoxels > 0 ? tp / truthVoxels : NaN,
    falseAlarmRate: brainVoxels > truthVoxels ? fp / (brainVoxels - truthVoxels) : NaN,
    blobs: truth.blobs.length,
    blobsDetected,
    blobHitRate: truth.blobs.length > 0 ? blobsDetected / truth.blobs.length : NaN,
    clusters: clusters.clusters,
    falseClusters: clusters.falseClusters,
    dice: diceCoefficient(inBrainSurvivors, truth.mask, brain),
    rocAuc,
    peakSearchRadiusMm: radius,
    peakErrorMeanMm: mean(peaks.errorMm),
    peakErrorMaxMm: peaks.errorMm.length === 0 ? NaN : peaks.errorMm.reduce((m, d) => (d > m || Number.isNaN(d) ? d : m), -Infinity),
    peakStatisticMean: mean(peaks.peakValue),
    centreStatisticMean: mean(peaks.centreValue),
    effectEstimatedPct: bias?.estimatedPct ?? NaN,
    effectPlantedPct: bias?.plantedPct ?? NaN,
    effectBiasPct: bias?.biasPct ?? NaN,
    effectRatio: bias?.ratio ?? NaN,
    effectCentrePct: bias?.centreEstimatedPct ?? NaN,
    effectCentreBiasPct: bias?.centreBiasPct ?? NaN,
  };
}

function mean(a: Float64Array): number {
  if (a.length === 0) return NaN;
  let s = 0;
  for (const x of a) s += x;
  return s / a.length;
}

/** Per-voxel data of a map, checked to lie on the truth's grid. */
function gridData(map: Volume | ArrayLike<number>, truth: PlantTruth, what: string): ArrayLike<number> {
  const n = truth.mask.length;
  if (typeof map === 'object' && map !== null && 'dims' in map && 'affine' in map && 'data' in map) {
    const vol = map as Volume;
    if (!sameGrid(vol, { dims: [...truth.dims, 1], affine: truth.affine })) {
      fail('GRID_MISMATCH', `${what} grid [${vol.dims.slice(0, 3).join('x')}] differs from the planted truth's grid [${truth.dims.join('x')}] (or their voxel-to-world mappings differ)`);
    }
    if (vol.dims[3] !== 1) fail('INVALID_ARGUMENT', `${what} must be a 3D map, got ${vol.dims[3]} volumes`);
    return vol.data;
  }
  if (map.length !== n) fail('GRID_MISMATCH', `${what} has ${map.length} voxels, the planted truth's grid has ${n}`);
  return map;
}
