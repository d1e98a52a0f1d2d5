import type { Finding } from './finding-types.js';
import { FINDING_ADVICE, describeVolumes, signed } from './finding-text.js';
import type { VoxelSpike } from './voxel-spikes.js';

/** Options of {@link spikeFindings}. */
export interface SpikeFindingOptions {
  /** The spike cutoff (robust z) used, for the text. */
  cutoffZ: number;
  /** Spikes in this many voxels of one volume make it one volume to censor. */
  voxelsForCensor: number;
  /** A voxel spiking at this many volumes or more is one 'unstable-voxel' finding (default 2). */
  volumesForUnstable?: number;
  /** Most findings of isolated spikes kept (strongest volumes first; default 20). */
  maxIsolated?: number;
}

/**
 * Turn single-voxel spikes into findings a researcher can act on, in three groups:
 * 1. a volume with spikes in `voxelsForCensor` or more voxels: one 'voxel-spike' finding that
 *    censors the volume (many voxels at once is a volume event);
 * 2. of the rest, a voxel with spikes at `volumesForUnstable` or more volumes: one 'unstable-voxel'
 *    finding with all its volumes (one voxel behaving badly is one thing to know, not one per volume);
 * 3. the remaining isolated spikes: one 'voxel-spike' finding per volume, strongest first.
 * Every spike given appears in exactly one finding (group 3 may be cut at `maxIsolated`).
 * @param spikes - from voxelSpikes
 * @param options - see {@link SpikeFindingOptions}
 * @returns findings, in the group order above
 * @example spikeFindings(look.spikes, { cutoffZ: 6, voxelsForCensor: 10 })
 */
export function spikeFindings(spikes: readonly VoxelSpike[], options: SpikeFindingOptions): Finding[] {
  const minVolumes = options.volumesForUnstable ?? 2;
  const out: Finding[] = [];
  const byVolume = groupBy(spikes, (s) => s.volume);
  const rest: VoxelSpike[] = [];
  for (const [t, list] of [...byVolume].sort((a, b) => a[0] - b[0])) {
    if (new Set(list.map((s) => s.voxel)).size >= options.voxelsForCensor) out.push(volumeFinding(t, list, options.cutoffZ, true));
    else rest.push(...list);
  }
  const byVoxel = groupBy(rest, (s) => s.voxel);
  const isolated: VoxelSpike[] = [];
  const unstable: Finding[] = [];
  for (const list of byVoxel.values()) {
    if (new Set(list.map((s) => s.volume)).size >= minVolumes) unstable.push(unstableFinding(list, options.cutoffZ));
    else isolated.push(...list);
  }
  unstable.sort((a, b) => b.volumes.length - a.volumes.length || maxAbs(b.evidence.z as number[]) - maxAbs(a.evidence.z as number[]));
  out.push(...unstable);
  const groups = [...groupBy(isolated, (s) => s.volume).entries()]
    .map(([t, list]) => ({ t, list: list.sort((a, b) => Math.abs(b.z) - Math.abs(a.z)) }))
    .sort((a, b) => Math.abs(b.list[0].z) - Math.abs(a.list[0].z))
    .slice(0, options.maxIsolated ?? 20);
  for (const g of groups) out.push(volumeFinding(g.t, g.list, options.cutoffZ, false));
  return out;
}

function volumeFinding(t: number, list: VoxelSpike[], cutoffZ: number, censor: boolean): Finding {
  const top = list[0];
  const where = list.length === 1 ? `voxel (${top.ijk.join(', ')})` : `${list.length} voxels`;
  return {
    kind: 'voxel-spike', volumes: [t], slices: [...new Set(list.map((s) => s.ijk[2]))].sort((a, b) => a - b), voxels: list.map((s) => s.ijk),
    evidence: {
      z: list.map((s) => round(s.z, 2)), sizeSignal: list.map((s) => round(s.size, 3)), sizePercent: list.map((s) => round(s.sizePercent, 2)),
      meanSignal: list.map((s) => round(s.meanSignal, 3)), scale: list.map((s) => s.scale).join(' '),
    },
    reason: `${where} in volume ${t} depart${list.length === 1 ? 's' : ''} from ${list.length === 1 ? 'its' : 'their'} own time course by up to ${percentText(top)} (robust z ${signed(top.z)}, cutoff +-${cutoffZ})`,
    advice: FINDING_ADVICE['voxel-spike'],
    verdict: `spike in ${where} at volume ${t} (${percentText(top)}): ${censor ? 'many voxels at once: censor the volume' : 'isolated: leave it or despike'}`,
    consequence: censor ? `volume ${t} censored` : 'none needed: one value of one voxel barely moves a model fit',
  };
}

function unstableFinding(list: VoxelSpike[], cutoffZ: number): Finding {
  const byT = [...list].sort((a, b) => a.volume - b.volume);
  const volumes = [...new Set(byT.map((s) => s.volume))];
  const top = list.reduce((m, s) => (Math.abs(s.z) > Math.abs(m.z) ? s : m), list[0]);
  const low = top.scale === 'absolute';
  return {
    kind: 'unstable-voxel', volumes, slices: [top.ijk[2]], voxels: [top.ijk],
    evidence: {
      z: byT.map((s) => round(s.z, 2)), sizeSignal: byT.map((s) => round(s.size, 3)), sizePercent: byT.map((s) => round(s.sizePercent, 2)),
      meanSignal: round(top.meanSignal, 3), scale: top.scale, cutoffZ,
    },
    reason: `voxel (${top.ijk.join(', ')}) departs from its own time course at ${describeVolumes(volumes)}, by up to ${percentText(top)} (robust z ${signed(top.z)}, cutoff +-${cutoffZ})${low ? `; its mean (${top.meanSignal.toFixed(1)}) is near the noise floor, so it is judged against the brain's typical noise and signal, not in percent of its own mean` : ''}`,
    advice: FINDING_ADVICE['unstable-voxel'],
    verdict: `unstable voxel (${top.ijk.join(', ')}): off its own time course at ${volumes.length} volumes (${describeVolumes(volumes)}), up to ${percentText(top)}: leave it out of region averages or despike`,
    consequence: "one voxel's series unreliable; the volumes are not",
  };
}

/** "+254.3 %" or, for a low-baseline voxel, "+12.0 % of the brain's mean signal". */
function percentText(s: VoxelSpike): string {
  return `${signed(s.sizePercent)} %${s.scale === 'absolute' ? " of the brain's mean signal" : ''}`;
}

function groupBy<K>(items: readonly VoxelSpike[], key: (s: VoxelSpike) => K): Map<K, VoxelSpike[]> {
  const m = new Map<K, VoxelSpike[]>();
  for (const s of items) { const k = key(s); const l = m.get(k); if (l) l.push(s); else m.set(k, [s]); }
  return m;
}

function maxAbs(xs: number[]): number {
  return xs.reduce((m, x) => Math.max(m, Math.abs(x)), 0);
}

function round(x: number, digits: number): number {
  if (!Number.isFinite(x)) return x;
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
