import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { parameterTradeoff } from '../../src/decide/parameter-tradeoff.js';
import { openRun } from '../../src/io/open-run.js';
import { readSweepSpec } from '../../src/sweep/read-sweep-spec.js';
import { runSweep, type SweepResult } from '../../src/sweep/runner.js';
import type { SweepSpec } from '../../src/sweep/spec.js';

// examples/interpolation-kernel.yaml on the demo run (3.5 mm voxels): both target voxel sizes must
// resample the run (at its own 3.5 mm every kernel would copy the data and give the same cells).
// Worker threads run dist/ (build first). The example as written (10 repeats) is long: its 2 mm cells
// hold 5.4 times the run's voxels. Here it runs with 1 repeat, 2 blobs and the two extreme kernels
// (all four kernels at 1 repeat took 4.7 minutes on 2 loaded cores), and in CI (process.env.CI) with
// every kernel, 2 repeats and its own blob count.
const example = fileURLToPath(new URL('../../examples/interpolation-kernel.yaml', import.meta.url));
const demoRun = fileURLToPath(new URL('../../data-demo/sub-phantom01_task-flicker_bold.nii.gz', import.meta.url));

afterAll(async () => { await closeSharedWorkerPools(); });

async function sweepExample(change: Partial<Pick<SweepSpec, 'repeats'>> & { count?: number; kernels?: string[] }): Promise<{ spec: SweepSpec; result: SweepResult }> {
  const written = readSweepSpec(example);
  const spec: SweepSpec = {
    ...written, repeats: change.repeats ?? written.repeats, plant: { ...written.plant, count: change.count ?? written.plant.count },
    vary: { ...written.vary, ...(change.kernels ? { 'resample.kernel': change.kernels } : {}) },
  };
  const run = await openRun(demoRun, { sharedMemory: true });
  return { spec, result: await runSweep(run, spec, { workers: 2 }) };
}

function checkResampled(spec: SweepSpec, result: SweepResult): void {
  const kernels = spec.vary['resample.kernel'];
  const sizes = spec.vary['resample.voxelSizeMm'];
  expect(result.scorecard.rows).toHaveLength(kernels.length * sizes.length * spec.repeats);
  // every setting resampled onto its own grid (no "No resampling" note)
  for (const n of result.notes) {
    const note = n.notes.find((x) => x.step === 'resample')!;
    expect(note.diagnostics.resampled).toBe(true);
    expect(note.summary).toMatch(/^Resampled to (2 x 2 x 2|3 x 3 x 3) mm voxels/);
  }
  // the kernels differ at both sizes: each trade-off line names values instead of "none differs"
  const groups = parameterTradeoff(result.scorecard, 'resample.kernel');
  expect(groups).toHaveLength(2);
  for (const g of groups) {
    expect(g.same.blur).toBe(false);
    expect(g.text).not.toContain('none differs');
  }
}

describe('examples/interpolation-kernel.yaml', () => {
  it('parses, and both of its target voxel sizes differ from the demo run\'s 3.5 mm', () => {
    const spec = readSweepSpec(example);
    expect(spec.vary['resample.voxelSizeMm']).toEqual([2, 3]);
    expect(spec.vary['resample.kernel']).toEqual(['nearest', 'linear', 'cubic', 'lanczos3']);
    expect(spec.recipe.map((r) => r.step)).toEqual(['drop-initial-volumes', 'resample', 'smooth']);
  });

  // outside CI; CI runs the whole example below instead
  it.skipIf(process.env.CI)('completes a 1-repeat run on the demo run with every setting resampled (nearest and lanczos3)', async () => {
    const { spec, result } = await sweepExample({ repeats: 1, count: 2, kernels: ['nearest', 'lanczos3'] });
    checkResampled(spec, result);
  }, 600_000);

  it.runIf(process.env.CI)('completes with 2 repeats and its own planting on the demo run (CI only: several minutes)', async () => {
    const { spec, result } = await sweepExample({ repeats: 2 });
    checkResampled(spec, result);
  }, 900_000);
});
