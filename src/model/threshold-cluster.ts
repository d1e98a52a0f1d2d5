import { labelComponents, type Connectivity } from '../core/components.js';
import { fail } from '../core/fail.js';
import { clusterFweP, clusterTheory, minClusterVoxels, type ClusterTheory } from './cluster-extent.js';
import type { Resels } from './rft-ec-density.js';
import { reselCounts } from './resels.js';
import { checkMapAndMask, checkOpenUnit, type StatMap } from './threshold-input.js';
import type { ThresholdResult } from './threshold-result.js';
import { checkStatisticKind, upperCriticalValue, upperTailP, type StatisticKind } from './threshold-statistic.js';

/** Options of {@link thresholdClusterExtent}. */
export interface ClusterExtentOptions {
  /** Family-wise error rate for clusters, in (0, 1). */
  alpha: number;
  /** Null distribution of the map. */
  stat: StatisticKind;
  /** Smoothness FWHM in mm, one number or one per axis. */
  fwhmMm: number | readonly number[];
  /** Voxel size in mm along x, y, z. */
  spacingMm: readonly number[];
  /**
   * Cluster-forming threshold as an uncorrected one-sided p-value. Ignored when `formingThreshold` is
   * given. __Default value:__ 0.001 (lower values of p are safer: the theory is poor at p = 0.01,
   * Eklund A, Nichols TE & Knutsson H 2016, PNAS 113:7900-7905).
   */
  formingP?: number;
  /** Cluster-forming threshold on the statistic itself; overrides `formingP`. */
  formingThreshold?: number;
  /**
   * Which neighbours join a cluster. __Default value:__ 6 (faces), the adjacency of the lattice whose
   * Euler characteristic gives the expected cluster count.
   */
  connectivity?: Connectivity;
}

/** One suprathreshold cluster. */
export interface ClusterInfo {
  /** Label in `details.labels`. */
  label: number;
  voxels: number;
  /** Family-wise p-value of a cluster this large. */
  fweP: number;
  /** Peak statistic inside the cluster. */
  peak: number;
}

/** Details of a cluster-extent threshold. */
export interface ClusterExtentDetails {
  alpha: number;
  formingThreshold: number;
  /** One-sided p-value of the forming threshold. */
  formingP: number;
  /** Clusters need at least this many voxels to survive. */
  minClusterVoxels: number;
  resels: Resels;
  theory: ClusterTheory;
  connectivity: Connectivity;
  /** All suprathreshold clusters, largest first. */
  clusters: ClusterInfo[];
  /** Component labels of the suprathreshold voxels (0 = below threshold or outside the mask). */
  labels: Int32Array;
  survivingClusters: number;
  survivorCount: number;
}

/**
 * Cluster-extent family-wise threshold: mark in-mask voxels at or above a cluster-forming threshold,
 * group them into connected clusters, and keep the clusters of at least k voxels, where k is the
 * smallest size whose family-wise p-value under the random-field cluster-size distribution of
 * Friston et al. (1994, Hum Brain Mapp 1:210-220) is at most alpha (see clusterTheory).
 * @param map - statistic map
 * @param mask - nonzero = search region
 * @param dims - [nx, ny, nz] of the map
 * @param options - alpha, statistic kind, smoothness, voxel size, forming threshold, connectivity
 * @returns rule 'cluster-fwe'; `threshold` is the cluster-forming threshold; survivors are the voxels of surviving clusters
 * @throws BoldsweepError INVALID_ARGUMENT (alpha, formingP, stat, FWHM, connectivity), GRID_MISMATCH, NON_FINITE_VOXELS
 * @example thresholdClusterExtent(z, mask, [64, 64, 36], { alpha: 0.05, stat: { kind: 'z' }, fwhmMm: 8, spacingMm: [3, 3, 3], formingP: 0.001 })
 */
export function thresholdClusterExtent(map: StatMap, mask: ArrayLike<number>, dims: readonly number[], options: ClusterExtentOptions): ThresholdResult<ClusterExtentDetails> {
  checkOpenUnit('alpha', options.alpha);
  checkStatisticKind(options.stat);
  const connectivity = options.connectivity ?? 6;
  if (connectivity !== 6 && connectivity !== 18 && connectivity !== 26) fail('INVALID_ARGUMENT', `connectivity must be 6, 18 or 26, got ${String(connectivity)}`);
  const voxels = checkMapAndMask(map, mask, dims);
  let formingThreshold: number;
  if (options.formingThreshold !== undefined) {
    if (!Number.isFinite(options.formingThreshold)) fail('INVALID_ARGUMENT', `formingThreshold must be finite, got ${options.formingThreshold}`);
    formingThreshold = options.formingThreshold;
  } else {
    formingThreshold = upperCriticalValue(checkOpenUnit('formingP', options.formingP ?? 0.001), options.stat);
  }
  const { resels } = reselCounts(mask, dims, options.fwhmMm, options.spacingMm);
  const dimensions = Math.max(1, dims.slice(0, 3).filter((d) => d > 1).length) as 1 | 2 | 3;
  const theory = clusterTheory({ resels, voxels, formingThreshold, stat: options.stat, dimensions });
  const k = minClusterVoxels(theory, options.alpha);

  const above = new Uint8Array(map.length);
  for (let i = 0; i < map.length; i++) if (mask[i] && map[i] >= formingThreshold) above[i] = 1;
  const { labels, sizes } = labelComponents(above, dims.slice(0, 3), connectivity);
  const peaks = new Float64Array(sizes.length).fill(Number.NEGATIVE_INFINITY);
  for (let i = 0; i < labels.length; i++) if (labels[i]) peaks[labels[i] - 1] = Math.max(peaks[labels[i] - 1], map[i]);
  const clusters: ClusterInfo[] = sizes.map((size, c) => ({ label: c + 1, voxels: size, fweP: clusterFweP(size, theory), peak: peaks[c] }));
  clusters.sort((a, b) => b.voxels - a.voxels || a.label - b.label);
  const keep = new Uint8Array(sizes.length + 1);
  let survivingClusters = 0;
  for (const c of clusters) if (c.voxels >= k) { keep[c.label] = 1; survivingClusters++; }
  const survivors = new Uint8Array(map.length);
  let survivorCount = 0;
  for (let i = 0; i < labels.length; i++) if (keep[labels[i]] && labels[i]) { survivors[i] = 1; survivorCount++; }
  return {
    rule: 'cluster-fwe',
    threshold: formingThreshold,
    survivors,
    details: {
      alpha: options.alpha, formingThreshold, formingP: upperTailP(formingThreshold, options.stat), minClusterVoxels: k,
      resels, theory, connectivity, clusters, labels, survivingClusters, survivorCount,
    },
  };
}
