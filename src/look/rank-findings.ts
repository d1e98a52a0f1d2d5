import type { Finding, FindingKind } from './finding-types.js';

/**
 * Order of consequence per kind, most consequential first: values that cannot be used at all, then
 * volumes removed from the start, then volumes censored (whole-image events and volumes moved above
 * the framewise-displacement threshold before slice events),
 * then one voxel's series unreliable, then isolated spikes that change nothing.
 */
export const CONSEQUENCE_TIER: Readonly<Record<FindingKind, number>> = {
  'non-finite': 0,
  'empty-slices': 0,
  'non-steady-start': 1,
  'volume-jump': 2,
  'head-motion': 2,
  'global-signal': 3,
  'slice-dropout': 4,
  'slice-bright': 5,
  'unstable-voxel': 7,
  'voxel-spike': 8,
};

/**
 * Rank findings by what they do to the analysis: by {@link CONSEQUENCE_TIER} (a spike finding that
 * censors its volume ranks with the slice events), then by how many volumes they touch, then by the
 * largest |z| in their evidence. Stable for ties (the input order stays).
 * @param findings - findings in any order (not modified)
 * @returns a new array, most consequential first
 * @example rankFindings(look.findings)[0].kind // 'non-steady-start' for most runs
 */
export function rankFindings(findings: readonly Finding[]): Finding[] {
  const keyed = findings.map((f, i) => ({ f, i, tier: tierOf(f), volumes: f.volumes.length, z: largestZ(f) }));
  keyed.sort((a, b) => a.tier - b.tier || b.volumes - a.volumes || b.z - a.z || a.i - b.i);
  return keyed.map((k) => k.f);
}

function tierOf(f: Finding): number {
  if (f.kind === 'voxel-spike' && f.consequence.includes('censored')) return 6;
  return CONSEQUENCE_TIER[f.kind];
}

function largestZ(f: Finding): number {
  let m = 0;
  for (const key of ['z', 'dvarsZ', 'globalZ', 'zOfDropped']) {
    const v = f.evidence[key];
    const list = Array.isArray(v) ? v : typeof v === 'number' ? [v] : [];
    for (const x of list) if (Number.isFinite(x) && Math.abs(x) > m) m = Math.abs(x);
  }
  return m;
}
