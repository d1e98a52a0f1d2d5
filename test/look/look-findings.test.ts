import { describe, expect, it } from 'vitest';
import type { Finding } from '../../src/look/finding-types.js';
import { lookAtRun, LOW_BASELINE_FRACTION, type LookResult } from '../../src/look/look-at-run.js';
import { CONSOLE_FINDINGS, lookConsoleLines } from '../../src/look/look-console-lines.js';
import { rankFindings } from '../../src/look/rank-findings.js';
import { sliceFindings } from '../../src/look/slice-findings.js';
import { spikeFindings } from '../../src/look/spike-findings.js';
import { voxelSpikes, type VoxelSpike } from '../../src/look/voxel-spikes.js';
import { defaultLowBaselineVoxels, defaultPhantomEyes, demoPhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import type { PhantomRun } from '../../src/simulate/phantom-types.js';
import { syntheticRun } from './synthetic-run.js';

const spike = (voxel: number, volume: number, z: number): VoxelSpike => ({ voxel, ijk: [voxel, 0, 0], volume, z, size: 10 * z, sizePercent: z, meanSignal: 1000, scale: 'own' });

describe('grouping spikes into findings', () => {
  it('makes one unstable-voxel finding of a voxel at many volumes, one censoring finding of a many-voxel volume, and keeps isolated spikes per volume', () => {
    const spikes = [
      ...[5, 9, 14, 30, 31, 40].map((t) => spike(7, t, 8)),          // one voxel, six volumes
      ...Array.from({ length: 12 }, (_, i) => spike(100 + i, 50, 7)), // twelve voxels in volume 50
      spike(200, 60, -9), spike(201, 61, 6.5),                          // two isolated spikes
    ];
    const f = spikeFindings(spikes, { cutoffZ: 6, voxelsForCensor: 10 });
    expect(f.map((x) => x.kind)).toEqual(['voxel-spike', 'unstable-voxel', 'voxel-spike', 'voxel-spike']);
    expect(f[0].volumes).toEqual([50]);
    expect(f[0].consequence).toMatch(/censored/);
    expect(f[1].volumes).toEqual([5, 9, 14, 30, 31, 40]);
    expect(f[1].voxels).toEqual([[7, 0, 0]]);
    expect(f[2].volumes).toEqual([60]); // strongest isolated first
    // every spike is in exactly one finding
    expect(f.reduce((s, x) => s + (x.kind === 'unstable-voxel' ? x.volumes.length : x.voxels.length), 0)).toBe(spikes.length);
  });

  it('makes one finding of several slice flags in one volume, a dropout when any slice is dark', () => {
    const flags = [
      { slice: 3, volume: 20, z: 6, value: 1100, typical: 1000, direction: 'bright' as const },
      { slice: 9, volume: 20, z: -7, value: 800, typical: 1000, direction: 'dark' as const },
      { slice: 4, volume: 20, z: 5.5, value: 1080, typical: 1000, direction: 'bright' as const },
      { slice: 5, volume: 33, z: 8, value: 1200, typical: 1000, direction: 'bright' as const },
    ];
    const f = sliceFindings(flags, 5);
    expect(f.map((x) => [x.kind, x.volumes, x.slices])).toEqual([['slice-dropout', [20], [3, 4, 9]], ['slice-bright', [33], [5]]]);
  });

  it('ranks by consequence: dropped start, then censored volumes, then one voxel, then isolated spikes', () => {
    const mk = (kind: Finding['kind'], volumes: number[], consequence: string, z = 1): Finding => ({ kind, volumes, slices: [], voxels: [], evidence: { z: [z] }, reason: '', advice: '', verdict: kind, consequence });
    const ranked = rankFindings([
      mk('voxel-spike', [3], 'none needed', 20), mk('unstable-voxel', [1, 2, 3], 'one voxel'), mk('slice-dropout', [9], 'volume 9 censored'),
      mk('voxel-spike', [4], 'volume 4 censored'), mk('volume-jump', [5, 6], 'censored'), mk('non-steady-start', [0, 1], 'dropped'),
    ]);
    expect(ranked.map((f) => f.kind + (f.consequence.includes('censored') ? '*' : ''))).toEqual(['non-steady-start', 'volume-jump*', 'slice-dropout*', 'voxel-spike*', 'unstable-voxel', 'voxel-spike']);
  });

  it('finds one unstable voxel (with all its volumes) in a run where one voxel jumps at several volumes', () => {
    const volumes = [20, 25, 33, 41, 47];
    const run = syntheticRun({ dims: [20, 20, 10, 60], spikes: volumes.map((volume) => ({ ijk: [10, 10, 5] as [number, number, number], volume, size: 300 })) });
    const look = lookAtRun(run);
    const unstable = look.findings.filter((f) => f.kind === 'unstable-voxel');
    expect(unstable.length, look.verdicts.join('\n')).toBe(1);
    expect(unstable[0].volumes).toEqual(volumes);
    expect(look.findings.filter((f) => f.kind === 'voxel-spike')).toEqual([]);
  });

  it('judges a voxel of near-zero baseline on the absolute scale, not in percent of its own mean', () => {
    // brain 1000 +- 10; one voxel sits at 20 +- 1 and falls to 0 at three volumes: -100 % of its own
    // mean and robust z about -20 against itself, but 20 signal units is 2 brain SDs: no spike
    const run = syntheticRun({ dims: [20, 20, 10, 60], seed: 4 });
    const n = 20 * 20 * 10, v = 10 + 20 * (10 + 20 * 5);
    for (let t = 0; t < 60; t++) run.data[t * n + v] = [30, 40, 50].includes(t) ? 0 : 20 + ((t * 7) % 3) - 1;
    const absolute = { belowMean: LOW_BASELINE_FRACTION * 1000, floorScale: 10, referenceMean: 1000 };
    expect(voxelSpikes(run, [v], { firstVolume: 0 }).map((s) => s.volume).sort()).toEqual([30, 40, 50]);
    expect(voxelSpikes(run, [v], { firstVolume: 0, absolute })).toEqual([]);
    const look = lookAtRun(run);
    expect(look.spikes.filter((s) => s.voxel === v), look.verdicts.join('\n')).toEqual([]);
  });
});

// A real-looking run: the demo phantom with eyes and optic nerves in the field of view and three
// edge voxels of near-zero baseline that fall to zero at six volumes each (what a 3 T run showed).
describe('look at a real-looking phantom run (eyes, near-zero-baseline edge voxels)', () => {
  let phantom: PhantomRun;
  let look: LookResult;
  it('runs', () => {
    phantom = simulatePhantomRun({ ...demoPhantomSpec(), eyes: defaultPhantomEyes(), lowBaselineVoxels: defaultLowBaselineVoxels() });
    look = lookAtRun({ volume: phantom.volume, sidecar: phantom.sidecar, events: null } as never);
    expect(phantom.truth.lowBaselineVoxels?.length).toBe(3);
  }, 60000);

  it('shows at most ten findings on the console, the most consequential first, and keeps every planted problem', () => {
    const lines = lookConsoleLines(look, 'real-looking');
    expect(lines.filter((l) => l.startsWith('  - ')).length).toBeLessThanOrEqual(CONSOLE_FINDINGS);
    expect(look.findings[0].kind).toBe('non-steady-start');
    const jerk = phantom.truth.spec.motion!.jerk!;
    expect(look.findings.some((f) => f.kind === 'volume-jump' && f.volumes.includes(jerk.volume))).toBe(true);
    for (const d of phantom.truth.dropouts) expect(look.findings.some((f) => f.kind === 'slice-dropout' && f.volumes[0] === d.volume && f.slices.includes(d.slice))).toBe(true);
    for (const s of phantom.truth.spikes) expect(look.findings.some((f) => f.kind === 'voxel-spike' && f.volumes[0] === s.volume && f.voxels.some((v) => v.join() === s.voxel.join()))).toBe(true);
    expect(look.recommendation.dropInitialVolumes).toBeGreaterThanOrEqual(phantom.truth.steadyState.nonSteadyVolumeCount);
  });

  it('lists no near-zero-baseline voxel as a percent change of its own mean', () => {
    for (const lb of phantom.truth.lowBaselineVoxels!) {
      const about = look.findings.filter((f) => f.voxels.some((v) => v.join() === lb.voxel.join()));
      expect(about.map((f) => f.verdict)).toEqual([]);
    }
    // judged on their own scale, each would spike at its six volumes: one finding per voxel, not six
    const idx = phantom.truth.lowBaselineVoxels!.map(({ voxel: [i, j, k] }) => i + 44 * (j + 52 * k));
    const own = voxelSpikes(phantom.volume, idx, { firstVolume: look.recommendation.dropInitialVolumes, censorVolumes: look.recommendation.censorVolumes });
    const grouped = spikeFindings(own, { cutoffZ: 6, voxelsForCensor: 10 });
    expect(grouped.filter((f) => f.kind === 'unstable-voxel').length).toBe(3);
  });

  it('leaves the eyes out of the mask and matches the reference segmentation (Dice)', () => {
    const labels = phantom.truth.tissueLabels.data; // 2 CSF, 3 grey, 4 white matter
    const eye = phantom.truth.eyeFraction!.data;
    let eyeVoxels = 0, eyeIn = 0, brain = 0, both = 0;
    for (let v = 0; v < labels.length; v++) {
      const isBrain = labels[v] >= 2 && labels[v] <= 4 && !(eye[v] > 0.5);
      if (isBrain) brain++;
      if (isBrain && look.mask.mask[v]) both++;
      if (eye[v] > 0.5) { eyeVoxels++; if (look.mask.mask[v]) eyeIn++; }
    }
    const dice = (2 * both) / (brain + look.mask.voxels);
    // measured: Dice 0.986 against the phantom's brain labels (CSF, grey, white matter); the
    // Otsu + cross-opening mask kept 264 of 272 eye voxels and had Dice 0.978 on this run
    expect(dice).toBeGreaterThan(0.98); // partial volume at the surface and the sinus signal loss
    expect(eyeIn / eyeVoxels).toBeLessThan(0.05); // a stub of optic nerve next to the brain may stay
    expect(look.mask.method).toMatch(/Lemieux/);
  });
});

describe('a look without a sidecar', () => {
  it('says it skipped the steady-state model and how to supply the flip angle and TR', () => {
    const look = lookAtRun(syntheticRun({ dims: [20, 20, 10, 40], trSec: 0 }));
    expect(look.skipped.length).toBe(1);
    expect(look.skipped[0].why).toMatch(/flip angle/);
    expect(look.skipped[0].how).toMatch(/FlipAngle/);
    expect(lookConsoleLines(look, 'x').join('\n')).toMatch(/skipped: steady-state model/);
  });
});
