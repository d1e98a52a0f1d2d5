import { afterAll, describe, expect, it } from 'vitest';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { runSweep } from '../../src/sweep/runner.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';

afterAll(async () => { await closeSharedWorkerPools(); });

describe('motion-correct in a sweep', () => {
  it('the spec varies its model and kernel; the motion is estimated once per setting from the unplanted run', async () => {
    // a small moving phantom: 5 mm voxels, 40 volumes, the default head motion and noise
    const phantom = simulatePhantomRun({ dims: [30, 36, 24], spacingMm: [5, 5, 5], nVolumes: 40, physio: null, activation: null });
    const spec: SweepSpecInput = {
      recipe: [{ step: 'drop-initial-volumes', params: { count: 4 } }, { step: 'motion-correct', params: {} }],
      vary: { 'motion-correct.model': ['rigid', 'affine'], 'motion-correct.kernel': ['linear'] },
      plant: { sizesFwhmMm: [12], amplitudesPct: [5], count: 2, separation: 2.5 },
      repeats: 1,
      threshold: { kind: 'fwe-rft' },
      model: { ar1: false, highpassCutoffSec: null },
      events: { kind: 'random-blocks', onSec: 20, offMinSec: 16, offMaxSec: 24 },
      seed: 3,
    };
    const r = await runSweep({ volume: phantom.volume, events: null, sidecar: phantom.sidecar }, spec, { inThisThread: true });
    expect(r.stats.estimatesComputed).toBe(2);
    expect(r.scorecard.varied).toEqual(['motion-correct.model', 'motion-correct.kernel']);
    expect(r.scorecard.rows).toHaveLength(2);
    expect(r.scorecard.rows.map((row) => row['motion-correct.model'])).toEqual(['rigid', 'affine']);
    // each setting's note names its correction
    expect(r.notes.map((n) => n.notes.find((x) => x.step === 'motion-correct')?.summary)).toEqual([expect.stringMatching(/^Motion corrected: rigid/), expect.stringMatching(/^Motion corrected: affine/)]);
  }, 300_000);
});
