import { fail } from '../core/fail.js';
import { expectedEulerCharacteristic, type Resels } from './rft-ec-density.js';
import { checkOpenUnit } from './threshold-input.js';
import { checkStatisticKind, upperTailP, type StatisticKind } from './threshold-statistic.js';

/** Inputs of the random-field cluster-size distribution. */
export interface ClusterTheoryInput {
  /** [R0, R1, R2, R3] of the search region. */
  resels: Resels;
  /** In-mask voxels S (cluster sizes are counted in voxels). */
  voxels: number;
  /** Cluster-forming threshold u on the statistic. */
  formingThreshold: number;
  /** Null distribution of the map. */
  stat: StatisticKind;
  /** Dimensions D of the search region. __Default value:__ 3. */
  dimensions?: 1 | 2 | 3;
}

/** The fitted cluster-size distribution (all sizes in voxels). */
export interface ClusterTheory {
  /** E[m]: expected number of clusters above u, taken as the expected Euler characteristic. */
  expectedClusters: number;
  /** E[N] = S P(stat >= u): expected suprathreshold voxels. */
  expectedVoxels: number;
  /** beta = (Gamma(D/2 + 1) E[m] / E[N])^{2/D}; P(n >= k) = exp(-beta k^{2/D}) for one cluster. */
  beta: number;
  dimensions: 1 | 2 | 3;
}

const GAMMA_HALF_D_PLUS_1 = { 1: Math.sqrt(Math.PI) / 2, 2: 1, 3: (3 * Math.sqrt(Math.PI)) / 4 } as const;

/**
 * Random-field cluster-size distribution of Friston KJ, Worsley KJ, Frackowiak RSJ, Mazziotta JC &
 * Evans AC (1994, Hum Brain Mapp 1:210-220; from memory): for a smooth field thresholded at u, the
 * size n of one cluster satisfies n^{2/D} ~ exponential, P(n >= k) = exp(-beta k^{2/D}) with
 * beta = (Gamma(D/2 + 1) E[m] / E[N])^{2/D}; clusters arrive as a Poisson process with mean E[m].
 * Here E[m] is the full expected Euler characteristic (all four resel terms, the paper used the
 * leading term) and E[N] = S P(stat >= u). For t maps the t-field E[m] and tail are used but the
 * size distribution keeps the Gaussian shape (Cao J & Worsley KJ 1999 give the exact t form [M]).
 * @param input - resels, voxel count, forming threshold, statistic kind
 * @returns E[m], E[N] and beta
 * @throws BoldsweepError INVALID_ARGUMENT when the forming threshold is so low that E[m] <= 0, or bad inputs
 * @example clusterTheory({ resels: [1, 30, 300, 1000], voxels: 125000, formingThreshold: 3.09, stat: { kind: 'z' } }).beta
 */
export function clusterTheory(input: ClusterTheoryInput): ClusterTheory {
  checkStatisticKind(input.stat);
  const dimensions = input.dimensions ?? 3;
  if (dimensions !== 1 && dimensions !== 2 && dimensions !== 3) fail('INVALID_ARGUMENT', `dimensions must be 1, 2 or 3, got ${String(dimensions)}`);
  if (!(input.voxels >= 1)) fail('INVALID_ARGUMENT', `voxels must be >= 1, got ${input.voxels}`);
  if (!Number.isFinite(input.formingThreshold)) fail('INVALID_ARGUMENT', `formingThreshold must be finite, got ${input.formingThreshold}`);
  const expectedClusters = expectedEulerCharacteristic(input.formingThreshold, input.resels, input.stat);
  const expectedVoxels = input.voxels * upperTailP(input.formingThreshold, input.stat);
  if (!(expectedClusters > 0) || !(expectedVoxels > 0)) {
    fail('INVALID_ARGUMENT', `cluster-forming threshold ${input.formingThreshold} gives ${expectedClusters} expected clusters and ${expectedVoxels} expected voxels; the cluster-size theory needs both > 0 (use a higher threshold, e.g. p = 0.001)`);
  }
  const beta = Math.pow((GAMMA_HALF_D_PLUS_1[dimensions] * expectedClusters) / expectedVoxels, 2 / dimensions);
  return { expectedClusters, expectedVoxels, beta, dimensions };
}

/**
 * Family-wise p-value of a cluster of k voxels: the chance that the largest null cluster has at
 * least k voxels, 1 - exp(-E[m] exp(-beta k^{2/D})) (Friston et al. 1994).
 * @param k - cluster size in voxels
 * @param theory - from {@link clusterTheory}
 * @returns P(largest cluster >= k)
 * @example clusterFweP(120, clusterTheory(input))
 */
export function clusterFweP(k: number, theory: ClusterTheory): number {
  return -Math.expm1(-theory.expectedClusters * Math.exp(-theory.beta * Math.pow(k, 2 / theory.dimensions)));
}

/**
 * Smallest cluster size k (voxels) whose family-wise p-value is at most alpha: solve
 * E[m] exp(-beta k^{2/D}) = -ln(1 - alpha) for k, round up. 1 when even a single voxel passes.
 * @param theory - from {@link clusterTheory}
 * @param alpha - family-wise error rate in (0, 1)
 * @returns minimum cluster size in voxels
 * @throws BoldsweepError INVALID_ARGUMENT for alpha outside (0, 1)
 * @example minClusterVoxels(clusterTheory(input), 0.05)
 */
export function minClusterVoxels(theory: ClusterTheory, alpha: number): number {
  checkOpenUnit('alpha', alpha);
  const rate = -Math.log1p(-alpha);
  if (theory.expectedClusters <= rate) return 1;
  const kContinuous = Math.pow(Math.log(theory.expectedClusters / rate) / theory.beta, theory.dimensions / 2);
  // round up, but do not let float noise in an exact integer push k one higher
  let k = Math.max(1, Math.ceil(kContinuous - 1e-9));
  while (k > 1 && clusterFweP(k - 1, theory) <= alpha) k--;
  while (clusterFweP(k, theory) > alpha) k++;
  return k;
}
