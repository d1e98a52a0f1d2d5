import { labelComponents, type Connectivity } from '../core/components.js';
import { fail } from '../core/fail.js';

/** Result of {@link clusterCounts}. */
export interface ClusterCounts {
  /** Connected clusters of surviving voxels. */
  clusters: number;
  /** Clusters that contain at least one truth voxel. */
  trueClusters: number;
  /** Clusters that contain no truth voxel (false alarms counted per cluster). */
  falseClusters: number;
  /** Voxels in the false clusters. */
  falseClusterVoxels: number;
}

/**
 * Count surviving clusters and how many of them miss the truth entirely.
 * @param survivors - per-voxel detection, nonzero = survived the threshold
 * @param truthMask - per-voxel truth, nonzero = planted
 * @param dims - [nx, ny, nz]
 * @param connectivity - neighbourhood for clusters (6, 18 or 26). __Default value:__ 26
 * @returns cluster counts
 * @throws BoldsweepError INVALID_ARGUMENT on length mismatch
 * @example clusterCounts(survivors, truth.mask, truth.dims).falseClusters
 */
export function clusterCounts(survivors: ArrayLike<number>, truthMask: ArrayLike<number>, dims: readonly number[], connectivity: Connectivity = 26): ClusterCounts {
  if (truthMask.length !== survivors.length) fail('INVALID_ARGUMENT', `survivors (${survivors.length}) and truth (${truthMask.length}) differ in length`);
  const { labels, sizes, count } = labelComponents(survivors, dims, connectivity);
  const touches = new Uint8Array(count + 1);
  for (let v = 0; v < labels.length; v++) if (labels[v] && truthMask[v]) touches[labels[v]] = 1;
  let trueClusters = 0, falseClusterVoxels = 0;
  for (let c = 1; c <= count; c++) {
    if (touches[c]) trueClusters++;
    else falseClusterVoxels += sizes[c - 1];
  }
  return { clusters: count, trueClusters, falseClusters: count - trueClusters, falseClusterVoxels };
}
