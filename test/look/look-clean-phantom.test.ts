import { expect, it } from 'vitest';
import { lookAtRun } from '../../src/look/look-at-run.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';

// A phantom run with no jerk, spike or dropout (the documented defaults). Under Gaussian noise the
// expected number of false flags at the look's cutoffs is: volumes 2 x 100 x P(|z| > 5) ~ 1e-4, slices
// 34 x 100 x 2 P(z > 5) ~ 0.002, voxel spikes ~2e4 voxels x 100 x 2 P(z > 6) ~ 0.004: about 0.01 in
// all. A Poisson count of mean 0.01 exceeds 1 with probability 5e-5, so at most one flag is allowed.
it('flags no more on a clean phantom than the cutoffs imply', () => {
  const phantom = simulatePhantomRun({ nVolumes: 100, seed: 5 });
  const look = lookAtRun({ volume: phantom.volume, sidecar: phantom.sidecar, events: null } as never);
  const flags = look.findings.filter((f) => f.kind !== 'non-steady-start');
  expect(flags.length, look.verdicts.join('\n')).toBeLessThanOrEqual(1);
  expect(look.recommendation.dropInitialVolumes).toBeGreaterThanOrEqual(phantom.truth.steadyState.nonSteadyVolumeCount);
}, 60000);
