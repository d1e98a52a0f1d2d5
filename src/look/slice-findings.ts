import type { Finding } from './finding-types.js';
import { FINDING_ADVICE, describeVolumes, signed } from './finding-text.js';
import type { SliceOutliers } from './slice-outliers.js';

/**
 * Slice flags as findings, one per volume: several slices off their usual mean in one volume are
 * one event of that volume (one thing to censor), listed with every slice and its change. The kind is
 * 'slice-dropout' when any of the slices lost signal (the graver case), else 'slice-bright'.
 * @param flagged - slice flags to report (those not already reported with a volume finding)
 * @param cutoffZ - the slice cutoff used, for the text
 * @returns one finding per volume, in volume order
 * @example sliceFindings(look.sliceOutliers.flagged, 5)
 */
export function sliceFindings(flagged: SliceOutliers['flagged'], cutoffZ: number): Finding[] {
  const byVolume = new Map<number, SliceOutliers['flagged']>();
  for (const f of flagged) { const l = byVolume.get(f.volume); if (l) l.push(f); else byVolume.set(f.volume, [f]); }
  return [...byVolume].sort((a, b) => a[0] - b[0]).map(([t, raw]) => {
    const list = [...raw].sort((a, b) => a.slice - b.slice);
    const dark = list.some((f) => f.direction === 'dark');
    const kind = dark ? 'slice-dropout' as const : 'slice-bright' as const;
    const pct = list.map((f) => (100 * (f.value - f.typical)) / f.typical);
    const slices = list.map((f) => f.slice);
    const parts = list.map((f, i) => `slice ${f.slice} ${signed(pct[i])} % (z ${signed(f.z)})`);
    const what = list.length === 1
      ? `slice ${slices[0]} of volume ${t} ${dark ? 'drops out' : 'is bright'} (${signed(pct[0])} %)`
      : `${list.length} slices of volume ${t} off their usual mean (${list.map((f, i) => `${f.slice}: ${signed(pct[i])} %`).join(', ')})`;
    return {
      kind, volumes: [t], slices, voxels: [],
      evidence: {
        sliceMean: list.map((f) => round(f.value, 3)), typical: list.map((f) => round(f.typical, 3)),
        changePercent: pct.map((p) => round(p, 2)), z: list.map((f) => round(f.z, 2)), cutoffZ,
      },
      reason: `in volume ${t}, ${parts.join('; ')} from each slice's usual value (robust z cutoff +-${cutoffZ})`,
      advice: FINDING_ADVICE[kind],
      verdict: `${what}: censor volume ${t}`,
      consequence: `${describeVolumes([t])} censored`,
    };
  });
}

function round(x: number, digits: number): number {
  if (!Number.isFinite(x)) return x;
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
