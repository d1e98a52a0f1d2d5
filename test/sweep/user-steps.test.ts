import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { z } from 'zod';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume } from '../../src/core/volume.js';
import { brainMaskFromMean } from '../../src/look/brain-mask.js';
import { meanImage } from '../../src/look/mean-image.js';
import { getStep, registerStep, stepModules } from '../../src/steps/registry.js';
import type { StepDefinition } from '../../src/steps/registry.js';
import { runSweep, type SweepResult } from '../../src/sweep/runner.js';
import { scorecardToTsv } from '../../src/sweep/scorecard-tsv.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';
import { smallPhantom } from './sweep-test-runs.js';
// @ts-expect-error: a plain JavaScript fixture (what a user would write), without type declarations
import { calls, volumeMeans, volumeMeanScaleDefinition } from './fixtures/volume-mean-scale-definition.mjs';

// Worker threads run the compiled files under dist/ (build first). The fixture module
// fixtures/volume-mean-scale.mjs registers the step in dist's registry, which the workers use; this
// test registers the same definition in the source registry (src/, what vitest runs) and names that
// module, so the sweep hands it to its workers.
const moduleUrl = new URL('./fixtures/volume-mean-scale.mjs', import.meta.url).href;
registerStep('volume-mean-scale', volumeMeanScaleDefinition as StepDefinition<{ target: number; regressor: boolean }>, { module: moduleUrl, replace: true });

const spec: SweepSpecInput = {
  recipe: [{ step: 'drop-initial-volumes', params: { count: 3 } }, { step: 'volume-mean-scale', params: {} }, { step: 'smooth', params: { fwhmMm: 4 } }],
  vary: { 'volume-mean-scale.regressor': [false, true] },
  plant: { sizesFwhmMm: [10], amplitudesPct: [3], count: 3 },
  repeats: 2,
  threshold: { kind: 'fwe-rft' },
  seed: 5,
};

let run: ReturnType<typeof smallPhantom>;
let here: SweepResult;
beforeAll(async () => {
  run = smallPhantom();
  calls.estimate = 0; calls.apply = 0; calls.received.length = 0;
  here = await runSweep(run, spec, { inThisThread: true, placementMask: run.greyMatter });
});

async function codeOf(f: () => Promise<unknown>): Promise<string | undefined> {
  try { await f(); } catch (e) { return isBoldsweepError(e) ? e.code : String(e); }
  return undefined;
}

describe('a user-registered step in a sweep', () => {
  it('runs on two worker threads with the same scorecard as in this thread and on one worker', async () => {
    expect(stepModules(['smooth', 'volume-mean-scale'])).toEqual([moduleUrl]);
    const two = await runSweep(run, spec, { workers: 2, placementMask: run.greyMatter });
    expect(two.stats.workers).toBe(2);
    const one = await runSweep(run, spec, { workers: 1, placementMask: run.greyMatter });
    expect(scorecardToTsv(two.scorecard)).toBe(scorecardToTsv(here.scorecard));
    expect(scorecardToTsv(one.scorecard)).toBe(scorecardToTsv(here.scorecard));
    expect(here.notes[0].notes.map((n) => n.step)).toEqual(['drop-initial-volumes', 'volume-mean-scale', 'smooth']);
  });

  it('estimates once per setting from the unplanted run and hands the same estimate to every planting', () => {
    // 2 settings of the steps up to volume-mean-scale -> 2 estimates; 2 groups x 2 settings = 4 cells
    // plus one tSNR per setting apply it
    expect(here.stats.estimatesComputed).toBe(2);
    expect(calls.estimate).toBe(2);
    expect(calls.apply).toBe(4 + 2);
    // the estimate is the unplanted run's (after dropping 3 volumes), whatever was planted
    const nt = run.volume.dims[3] - 3;
    const n = run.volume.dims[0] * run.volume.dims[1] * run.volume.dims[2];
    const dropped = makeVolume({ ...run.volume, dims: [run.volume.dims[0], run.volume.dims[1], run.volume.dims[2], nt], data: run.volume.data.subarray(3 * n) });
    // the sweep's brain mask: the look module's mask of the run's mean image (runner.ts)
    const brain = brainMaskFromMean(meanImage(run.volume), run.volume.dims.slice(0, 3)).mask;
    const expected = volumeMeans(dropped, brain);
    expect(calls.received).toHaveLength(6);
    for (const e of calls.received as Array<{ means: Float64Array }>) expect(Array.from(e.means)).toEqual(Array.from(expected));
  });

  it('adds the regressors a step hands the model to the design (one column fewer degrees of freedom)', () => {
    const dof = (reg: boolean) => here.scorecard.rows.filter((r) => r['volume-mean-scale.regressor'] === reg).map((r) => r.dof as number);
    for (let i = 0; i < 2; i++) expect(dof(false)[i] - dof(true)[i]).toBeCloseTo(1, 6);
  });

  it('refuses a user step without a module on worker threads (STEP_MODULE_MISSING), and runs it in this thread', async () => {
    registerStep('volume-mean-scale-here', volumeMeanScaleDefinition as StepDefinition<{ target: number; regressor: boolean }>, { replace: true });
    const local: SweepSpecInput = { ...spec, recipe: [{ step: 'volume-mean-scale-here', params: {} }], vary: { 'volume-mean-scale-here.target': [100, 200] }, repeats: 1 };
    expect(await codeOf(() => runSweep(run, local, { workers: 2, placementMask: run.greyMatter }))).toBe('STEP_MODULE_MISSING');
    const r = await runSweep(run, local, { inThisThread: true, placementMask: run.greyMatter });
    expect(r.scorecard.rows).toHaveLength(2);
  });

  it('bumping a step version makes its cached estimates, stages, cells and tSNR miss', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'boldsweep-version-'));
    const def = getStep('volume-mean-scale') as StepDefinition<unknown>;
    try {
      const first = await runSweep(run, spec, { inThisThread: true, placementMask: run.greyMatter, cacheDir: dir });
      expect(first.stats.cellsComputed).toBe(4);
      const again = await runSweep(run, spec, { inThisThread: true, placementMask: run.greyMatter, cacheDir: dir });
      expect(again.stats.cellsFromCache).toBe(4);
      expect(again.stats.estimatesComputed).toBe(0);
      registerStep('volume-mean-scale', { ...def, version: 2 }, { module: moduleUrl, replace: true });
      const bumped = await runSweep(run, spec, { inThisThread: true, placementMask: run.greyMatter, cacheDir: dir });
      expect(bumped.stats.cellsFromCache).toBe(0);
      expect(bumped.stats.cellsComputed).toBe(4);
      expect(bumped.stats.estimatesComputed).toBe(2);
      expect(readdirSync(join(dir, 'estimates'))).toHaveLength(4);
      expect(scorecardToTsv(bumped.scorecard).split('\n').slice(1)).toEqual(scorecardToTsv(first.scorecard).split('\n').slice(1));
    } finally {
      registerStep('volume-mean-scale', def, { module: moduleUrl, replace: true });
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('registerStep checks the definition', () => {
  const base = getStep('smooth') as StepDefinition<unknown>;
  const codeOfSync = (f: () => void) => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : String(e); } return undefined; };
  it('refuses a version that is not a positive integer, an unknown kind, labels for missing parameters', () => {
    expect(codeOfSync(() => registerStep('bad-version', { ...base, version: 0 }))).toBe('INVALID_ARGUMENT');
    expect(codeOfSync(() => registerStep('bad-version', { ...base, version: 1.5 }))).toBe('INVALID_ARGUMENT');
    expect(codeOfSync(() => registerStep('bad-kind', { ...base, kind: 'warp' as never }))).toBe('INVALID_ARGUMENT');
    expect(codeOfSync(() => registerStep('bad-labels', { ...base, labels: { sigma: { name: 'sigma', unit: 'mm' } } }))).toBe('INVALID_ARGUMENT');
    expect(codeOfSync(() => registerStep('bad-labels', { ...base, labels: { fwhmMm: { name: '', unit: 'mm' } } }))).toBe('INVALID_ARGUMENT');
    expect(codeOfSync(() => registerStep('bad-module', { ...base }, { module: 'relative/path.mjs' }))).toBe('INVALID_ARGUMENT');
    expect(codeOfSync(() => registerStep('model', { ...base }))).toBe('INVALID_ARGUMENT');
    expect(codeOfSync(() => registerStep('plain-ok', { schema: z.object({}).strict(), version: 3, kind: 'temporal', apply: base.apply, describe: () => 'ok', labels: {} }))).toBeUndefined();
  });
});

describe('slice times through the steps', () => {
  const seen: Array<number[] | null> = [];
  // a stand-in for slice-timing correction: it aligns every slice to one time (null: leaves them)
  registerStep<{ alignToSec: number | null }>('record-slice-times', {
    schema: z.object({ alignToSec: z.number().min(0).nullable().default(null) }).strict(),
    version: 1, kind: 'temporal', labels: { alignToSec: { name: 'slice time aligned to', unit: 's' } }, describe: (p) => `slice times ${p.alignToSec ?? 'as acquired'}`,
    apply: (volume, params, context) => {
      seen.push(context.sliceTimesSec ? Array.from(context.sliceTimesSec) : null);
      const note = { step: 'record-slice-times', params, summary: '', diagnostics: {}, methodsText: '', citations: [] };
      return params.alignToSec === null ? { volume, note } : { volume, note, context: { ...context, sliceTimesSec: new Float64Array(volume.dims[2]).fill(params.alignToSec) } };
    },
  }, { replace: true });
  // a second recording step after it (a step may appear once per recipe: a twin under another name)
  registerStep('record-slice-times-after', getStep('record-slice-times') as StepDefinition<unknown>, { replace: true });

  it('reach each step from the sidecar\'s SliceTiming; a step may replace them; aligned times set the model\'s sample time', async () => {
    const nz = run.volume.dims[2];
    const tr = run.volume.trSec;
    const times = Array.from({ length: nz }, (_, k) => ((k % 2) * Math.ceil(nz / 2) + Math.floor(k / 2)) * (tr / nz));
    const sidecar = { ...(run.sidecar ?? {}), RepetitionTime: tr, SliceTiming: times } as typeof run.sidecar;
    const s: SweepSpecInput = {
      ...spec, repeats: 1, vary: { 'record-slice-times.alignToSec': [null, tr / 2, 0] },
      recipe: [{ step: 'record-slice-times', params: {} }, { step: 'record-slice-times-after', params: {} }, { step: 'smooth', params: { fwhmMm: 4 } }],
    };
    seen.length = 0;
    const r = await runSweep({ volume: run.volume, events: run.events, sidecar }, s, { inThisThread: true, placementMask: run.greyMatter });
    // every run of the recipe: the first step sees the sidecar's times, the second what the first handed on
    for (let i = 0; i < seen.length; i += 2) expect(seen[i]).toEqual(times);
    expect(seen.filter((x, i) => i % 2 === 1).map((x) => JSON.stringify(x))).toEqual(expect.arrayContaining([JSON.stringify(times), JSON.stringify(new Array(nz).fill(tr / 2)), JSON.stringify(new Array(nz).fill(0))]));
    // slices aligned to mid-volume: the same design as sampling mid-volume without slice times
    const row = (v: number | null) => r.scorecard.rows.find((x) => x['record-slice-times.alignToSec'] === v)!;
    const metrics = (x: Record<string, unknown>) => Object.fromEntries(r.scorecard.metrics.map((m) => [m, x[m]]));
    expect(metrics(row(tr / 2))).toEqual(metrics(row(null)));
    // slices aligned to the start of the volume: the model samples there, so the fit changes
    expect(row(0).centreMargin).not.toBe(row(null).centreMargin);
  });
});
