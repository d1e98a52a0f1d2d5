import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { writeNifti } from '../../src/io/nifti-write.js';
import { defaultPhantomStructural, defaultPhantomTemplate, resolvePhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { simulatePhantomStructural } from '../../src/simulate/simulate-phantom-structural.js';
import { simulatePhantomTemplate } from '../../src/simulate/simulate-phantom-template.js';
import { runSweep, type SweepResult } from '../../src/sweep/runner.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';
import { quietSpec } from '../simulate/phantom-helpers.js';

// a still head (so the test needs no motion estimate), the run on a 4 mm grid, a 4 mm template
const phantom = resolvePhantomSpec(quietSpec({
  dims: [38, 46, 32], spacingMm: [4, 4, 4], nVolumes: 60, thermalNoiseSd: 8, rician: true,
  design: { firstOnsetSec: 10, onSec: 20, offSec: 20, trialType: 'task' },
  structural: { ...defaultPhantomStructural(), dims: [60, 72, 56], spacingMm: [2.5, 2.5, 2.5], supersample: 1 },
  template: { ...defaultPhantomTemplate(), dims: [40, 50, 38], spacingMm: 4, originVoxel: [20, 27, 18], supersample: 1 },
}));

describe('a sweep over align.concatenate scores on the template grid', () => {
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-align-sweep-'));
  let result: SweepResult;
  beforeAll(async () => {
    const run = simulatePhantomRun(phantom);
    const structural = join(dir, 'sub-x_T1w.nii.gz'), template = join(dir, 'template.nii.gz');
    await writeNifti(structural, simulatePhantomStructural(phantom));
    await writeNifti(template, simulatePhantomTemplate(phantom));
    const brain = Uint8Array.from(run.truth.tissueLabels.data, (l) => (l === 3 || l === 4 ? 1 : 0));
    const spec: SweepSpecInput = {
      recipe: [{ step: 'align', params: { structural, template, kernel: 'linear', motion: 'none' } }],
      vary: { 'align.concatenate': [true, false] },
      plant: { sizesFwhmMm: [12], amplitudesPct: [4], count: 2 },
      repeats: 1,
      threshold: { kind: 'fwe-rft' },
      model: { ar1: false, highpassCutoffSec: null },
      events: { kind: 'run' },
      seed: 5,
    };
    result = await runSweep({ volume: run.volume, events: run.events, sidecar: { ...run.sidecar, TaskName: 'task' } }, spec, { inThisThread: true, brainMask: brain });
  }, 300_000);
  afterAll(async () => { rmSync(dir, { recursive: true, force: true }); await closeSharedWorkerPools(); });

  it('estimates the alignment once per setting, and every cell finds planted blobs on the template grid', () => {
    expect(result.stats.estimatesComputed).toBe(2);
    expect(result.scorecard.rows).toHaveLength(2);
    for (const row of result.scorecard.rows) {
      // a 4 % blob of 12 mm FWHM in noise of SD 8 over 60 volumes is found wherever it lands, if the truth is where the data put it
      expect(row.blobHitRate).toBe(1);
      expect(row.dice as number).toBeGreaterThan(0.3);
    }
    const notes = result.notes.map((n) => n.notes.find((x) => x.step === 'align')!);
    expect(notes.map((n) => n.diagnostics.resamplings)).toEqual([1, 2]);
    expect(notes[0].diagnostics.templateDims).toEqual([40, 50, 38]);
  });
});
