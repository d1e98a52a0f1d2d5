/** What a finding is about. */
export type FindingKind =
  | 'non-steady-start'
  | 'volume-jump'
  | 'global-signal'
  | 'slice-dropout'
  | 'slice-bright'
  | 'voxel-spike'
  | 'unstable-voxel'
  | 'non-finite'
  | 'empty-slices'
  | 'head-motion';

/** One thing the look found, with the numbers behind it and what to do. */
export interface Finding {
  kind: FindingKind;
  /** Volumes concerned (0-based). */
  volumes: number[];
  /** Slices concerned (0-based, third image axis). */
  slices: number[];
  /** Voxels concerned as (i, j, k), for voxel-level findings. */
  voxels: Array<[number, number, number]>;
  /** The measurements that triggered the finding (names carry units). */
  evidence: Record<string, number | string | number[]>;
  /** Why it was flagged: the measure, its value and the cutoff. */
  reason: string;
  /** What to do about it. */
  advice: string;
  /** One short plain-text line: what and what to do. */
  verdict: string;
  /**
   * What the finding does to the analysis, in words ("3 volumes dropped", "volume 112 censored",
   * "one voxel's series unreliable"); findings are ranked by it (see rankFindings).
   */
  consequence: string;
}
