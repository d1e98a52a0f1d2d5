import { describe, expect, it } from 'vitest';
import { lookAtRun, SLICES_FOR_VOLUME_EVENT, type LookResult } from '../../src/look/look-at-run.js';
import { findingsTable } from '../../src/look/findings-table.js';
import { demoPhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import type { PhantomRun } from '../../src/simulate/phantom-types.js';

// The demo phantom's ground truth (what was planted) is the outside reference here: every planted
// jerk, bright start volume, spike and dropout must appear among the findings.
describe('look at the demo phantom', () => {
  let phantom: PhantomRun;
  let look: LookResult;
  it('runs', () => {
    phantom = simulatePhantomRun(demoPhantomSpec());
    look = lookAtRun({ volume: phantom.volume, sidecar: phantom.sidecar, events: null } as never);
    expect(look.findings.length).toBeGreaterThan(0);
  }, 60000);

  it('drops at least the planted non-steady volumes (1 % rule of the truth)', () => {
    expect(look.recommendation.dropInitialVolumes).toBeGreaterThanOrEqual(phantom.truth.steadyState.nonSteadyVolumeCount);
    expect(look.recommendation.dropInitialVolumes).toBeLessThanOrEqual(phantom.truth.steadyState.nonSteadyVolumeCount + 1);
    expect(look.findings.some((f) => f.kind === 'non-steady-start')).toBe(true);
  });

  it('finds the jerk as an abrupt change at its volume', () => {
    const jerk = phantom.truth.spec.motion?.jerk;
    expect(jerk).toBeTruthy();
    const f = look.findings.find((x) => x.kind === 'volume-jump' && x.volumes.includes(jerk!.volume));
    expect(f, look.verdicts.join('\n')).toBeTruthy();
    expect(look.recommendation.censorVolumes).toContain(jerk!.volume);
  });

  it('reports the jerk as one abrupt change, not as slice dropouts of its volumes', () => {
    // the jerk moves the head for durationVolumes volumes; slices at the edges of the head change most
    const jerk = phantom.truth.spec.motion!.jerk!;
    const moved = Array.from({ length: (jerk.durationVolumes ?? 1) + 1 }, (_, i) => jerk.volume + i);
    const sliceKinds = look.findings.filter((f) => (f.kind === 'slice-dropout' || f.kind === 'slice-bright') && moved.includes(f.volumes[0]));
    expect(sliceKinds.map((f) => f.verdict)).toEqual([]);
    const jump = look.findings.find((f) => f.kind === 'volume-jump' && f.volumes.includes(jerk.volume))!;
    expect(jump.slices.length).toBeGreaterThanOrEqual(SLICES_FOR_VOLUME_EVENT);
  });

  it('finds every planted spike at its voxel and volume', () => {
    for (const s of phantom.truth.spikes) {
      const f = look.findings.find((x) => x.kind === 'voxel-spike' && x.volumes[0] === s.volume && x.voxels.some((v) => v.join() === s.voxel.join()));
      expect(f, `spike ${JSON.stringify(s)} not among\n${look.verdicts.join('\n')}`).toBeTruthy();
    }
  });

  it('finds every planted slice dropout', () => {
    for (const d of phantom.truth.dropouts) {
      const f = look.findings.find((x) => x.kind === 'slice-dropout' && x.volumes[0] === d.volume && x.slices.includes(d.slice));
      expect(f, `dropout ${JSON.stringify(d)} not among\n${look.verdicts.join('\n')}`).toBeTruthy();
      expect(look.recommendation.censorVolumes).toContain(d.volume);
    }
  });

  it('lists every finding in the danfo table with its evidence', () => {
    const table = findingsTable(look);
    expect(table.shape).toEqual([look.findings.length, 9]);
    expect(table.columns).toContain('evidence');
  });

  it('keeps its mask on the brain (Otsu + morphology), not the scalp or air', () => {
    const labels = phantom.truth.tissueLabels.data; // 2 CSF, 3 grey, 4 white matter
    let inBrain = 0, brain = 0, outside = 0;
    for (let v = 0; v < labels.length; v++) {
      const isBrain = labels[v] >= 2 && labels[v] <= 4;
      if (isBrain) brain++;
      if (look.mask.mask[v]) { if (isBrain) inBrain++; else outside++; }
    }
    // partial volume at the surface and the sinus signal loss: 85 % / 10 % leave room for both
    expect(inBrain / brain).toBeGreaterThan(0.85);
    expect(outside / look.mask.voxels).toBeLessThan(0.1);
  });
});
