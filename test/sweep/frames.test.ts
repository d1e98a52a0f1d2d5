import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parameterTradeoff } from '../../src/decide/parameter-tradeoff.js';
import { runFacts } from '../../src/report/run-facts.js';
import { writeReport } from '../../src/report/write-report.js';
import { applyAffine } from '../../src/core/affine.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { plantActivations } from '../../src/plant/plant-activations.js';
import { maskOnGrid } from '../../src/resample/mask-on-grid.js';
import { truthInFrame } from '../../src/score/truth-in-frame.js';
import { registerStep, type StepDefinition } from '../../src/steps/registry.js';
import { runSweep, type SweepResult } from '../../src/sweep/runner.js';
import { scorecardToTsv } from '../../src/sweep/scorecard-tsv.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';
import { gaussianNullRun } from './sweep-test-runs.js';
// @ts-expect-error: a plain JavaScript fixture (what a user would write), without type declarations
import { coarseGrid, coarsenGridDefinition } from './fixtures/coarsen-grid-definition.mjs';

// The geometric test step coarsen-grid stands in for the resample step: its output lives on a target
// grid with twice the voxel size. Worker threads import fixtures/coarsen-grid.mjs (build first).
registerStep('coarsen-grid', coarsenGridDefinition as StepDefinition<{ factor: number; kernel: string }>, { module: new URL('./fixtures/coarsen-grid.mjs', import.meta.url).href, replace: true });

const spec: SweepSpecInput = {
  recipe: [{ step: 'coarsen-grid', params: { factor: 1 } }],
  vary: { 'coarsen-grid.factor': [1, 2], 'coarsen-grid.kernel': ['trilinear', 'nearest'] },
  plant: { sizesFwhmMm: [12], amplitudesPct: [6], count: 4, separation: 2.5 },
  repeats: 2,
  threshold: { kind: 'fwe-rft' },
  model: { ar1: false, highpassCutoffSec: null },
  events: { kind: 'random-blocks', onSec: 20, offMinSec: 16, offMaxSec: 24 },
  seed: 9,
};

let null3: ReturnType<typeof gaussianNullRun>;
let here: SweepResult;
beforeAll(async () => {
  null3 = gaussianNullRun({ dims: [32, 32, 24], nt: 100, fwhmMm: 6, seed: 21 });
  here = await runSweep({ volume: null3.volume, events: null, sidecar: null }, spec, { inThisThread: true, brainMask: null3.mask });
});
afterAll(async () => { await closeSharedWorkerPools(); });

describe('frames: scoring carries the truth into the cell\'s output frame', () => {
  it('on the run\'s own grid the carried truth and masks are the planted ones', () => {
    const { truth } = plantActivations(null3.volume, { count: 3, fwhmMm: 9, amplitudePct: 2, timeCourse: new Float64Array(100).fill(1), placementMask: null3.mask, seed: 2 });
    const same = truthInFrame(truth, { kind: 'target', grid: { dims: [32, 32, 24], affine: null3.volume.affine } });
    expect(Array.from(same.mask)).toEqual(Array.from(truth.mask));
    for (let v = 0; v < truth.profile.length; v++) expect(Math.abs(same.profile[v] - truth.profile[v])).toBeLessThan(1e-6); // float32 profile, centres through an inverse affine
    expect(truthInFrame(truth, { kind: 'reference' })).toBe(truth);
    expect(Array.from(maskOnGrid(null3.mask, { dims: [32, 32, 24], affine: null3.volume.affine }, { dims: [32, 32, 24], affine: null3.volume.affine }))).toEqual(Array.from(null3.mask));
    // on a grid twice as coarse, a voxel is truth exactly when its centre lies within half the FWHM
    // of a blob centre (a Gaussian is at half its maximum at FWHM / 2: fact of the trade)
    const { grid } = coarseGrid([32, 32, 24], null3.volume.affine, 2);
    const coarse = truthInFrame(truth, { kind: 'target', grid });
    const [gx, gy, gz] = grid.dims;
    let truthCount = 0;
    for (let k = 0; k < gz; k++) for (let j = 0; j < gy; j++) for (let i = 0; i < gx; i++) {
      const w = applyAffine(grid.affine, [i, j, k]);
      const near = truth.centresMm.some((c) => Math.hypot(w[0] - c[0], w[1] - c[1], w[2] - c[2]) <= 9 / 2);
      expect(coarse.mask[i + gx * (j + gy * k)]).toBe(near ? 1 : 0);
      truthCount += near ? 1 : 0;
    }
    expect(truthCount).toBeGreaterThan(0);
    // centres keep their exact world positions
    coarse.centresVoxel.forEach((c, b) => c.forEach((x, a) => expect(x).toBeCloseTo((truth.centresVoxel[b][a] - 0.5) / 2, 9)));
  });

  it('a sweep whose step moves the run onto a coarser grid finds the planted blobs where they were planted', () => {
    const rows = (factor: number) => here.scorecard.rows.filter((r) => r['coarsen-grid.factor'] === factor && r['coarsen-grid.kernel'] === 'trilinear');
    for (const r of rows(2)) {
      expect(r.blobHitRate).toBe(1);
      // the statistic peaks within one target voxel (6 mm) of each planted centre
      expect(r.peakErrorMaxMm as number).toBeLessThanOrEqual(6 * Math.sqrt(3) / 2 + 1e-9);
      expect(r.smoothnessFwhmMm as number).toBeGreaterThan(6);
    }
    // one eighth of the voxels, so about an eighth of the truth voxels
    for (let i = 0; i < 2; i++) {
      const ratio = (rows(2)[i].truthVoxels as number) / (rows(1)[i].truthVoxels as number);
      expect(ratio).toBeGreaterThan(1 / 12);
      expect(ratio).toBeLessThan(1 / 5);
    }
    for (const r of rows(1)) expect(r.blobHitRate).toBe(1);
    // on the run's own grid both kernels sample the voxels themselves: the same scores
    const nearest1 = here.scorecard.rows.filter((r) => r['coarsen-grid.factor'] === 1 && r['coarsen-grid.kernel'] === 'nearest');
    nearest1.forEach((r, i) => expect(r.hitRate).toBe(rows(1)[i].hitRate));
  });

  it('the report says which kernel detects best and which blurs least at each grid, with numbers', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'boldsweep-frames-report-'));
    try {
      const folder = { result: here, run: runFacts({ volume: null3.volume, sidecar: null }), masks: { brain: { kind: 'brain' as const }, placement: { kind: 'brain' as const }, exclude: null } };
      const { files } = await writeReport(dir, folder);
      const html = readFileSync(files.report, 'utf8');
      const lines = parameterTradeoff(here.scorecard, 'coarsen-grid.kernel').map((g) => g.text);
      expect(lines).toHaveLength(2);
      // at factor 1 both kernels take the voxels themselves: the same cells, so no kernel is named best
      expect(lines[0]).toMatch(/^At grid coarsening factor 1, of the coarsening kernel values \(trilinear, nearest\), none differs from the others/);
      // at factor 2 both kernels find every planted voxel (hit rate 1 in both repeats): neither is named best
      expect(lines[1]).toMatch(/^At grid coarsening factor 2, of the coarsening kernel values, ((trilinear|nearest) detects best|none detects better than the others) and (trilinear|nearest) blurs least: mean hit rate/);
      // block averaging (trilinear at the block centre) spreads the noise over more voxels than picking one
      const g2 = parameterTradeoff(here.scorecard, 'coarsen-grid.kernel')[1];
      expect(g2.blursLeast.value).toBe('nearest');
      for (const line of lines) expect(html).toContain(line.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').split(':')[0]);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("runs 'resample' then 'smooth' within the brain mask on the target grid, on two worker threads", async () => {
    const masked: SweepSpecInput = {
      ...spec, recipe: [{ step: 'resample', params: { kernel: 'linear', voxelSizeMm: 4.5 } }, { step: 'smooth', params: { fwhmMm: 6, withinMask: true } }],
      vary: { 'resample.kernel': ['nearest', 'linear'] }, repeats: 1,
    };
    const r = await runSweep({ volume: null3.volume, events: null, sidecar: null }, masked, { workers: 2, brainMask: null3.mask });
    expect(r.scorecard.rows).toHaveLength(2);
    for (const row of r.scorecard.rows) {
      expect(row.blobHitRate).toBe(1);
      // smoothing within the carried mask sets the voxels outside it to zero: the tSNR in the brain
      // stays finite and the 4.5 mm grid's truth is there
      expect(Number.isFinite(row.tsnrMedian as number)).toBe(true);
      expect(row.truthVoxels as number).toBeGreaterThan(0);
    }
    expect(r.notes[0].notes.map((n) => n.summary)).toEqual([expect.stringMatching(/^Resampled to 4\.5 x 4\.5 x 4\.5 mm voxels/), expect.stringMatching(/inside the brain mask/)]);
  });

  it('gives the same scorecard on two worker threads', async () => {
    const two = await runSweep({ volume: null3.volume, events: null, sidecar: null }, spec, { workers: 2, brainMask: null3.mask });
    expect(scorecardToTsv(two.scorecard)).toBe(scorecardToTsv(here.scorecard));
  });
});
