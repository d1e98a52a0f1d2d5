import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { fdCensorVolumes } from '../../src/model/fd-censor-volumes.js';
import { framewiseDisplacement } from '../../src/model/framewise-displacement.js';
import { parseSweepSpec } from '../../src/sweep/parse-sweep-spec.js';
import { planSweep } from '../../src/sweep/plan.js';
import { fewestDropped, modelNeedsMotion, runSweep, type SweepResult } from '../../src/sweep/runner.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';
import { movingPhantom } from './sweep-test-runs.js';

// The motion model as a sweep axis: motion regressors (0, 6, 24) x censoring by framewise
// displacement (none, 0.5 mm) on a phantom whose head wanders slowly and coughs once (a 2 mm, 1.5
// degree jerk at volume 40 lasting one volume), planting through the same motion table.
const motion = { wanderStepMm: 0.03, wanderStepDeg: 0.03, jerk: { volume: 40, durationVolumes: 1, shiftMm: [2, -1, 0.5] as [number, number, number], rotationDeg: [1.5, 0, -1] as [number, number, number] } };
let run: ReturnType<typeof movingPhantom>;
let swept: SweepResult;

function spec(): SweepSpecInput {
  return {
    recipe: [{ step: 'smooth', params: { fwhmMm: 6 } }],
    vary: { 'model.motionRegressors': [0, 6, 24], 'model.censorFdMm': [null, 0.5] },
    plant: { sizesFwhmMm: [10], amplitudesPct: [3], count: 3 },
    repeats: 1,
    threshold: { kind: 'fwe-rft' },
    seed: 11,
  };
}

beforeAll(async () => {
  run = movingPhantom(motion);
  swept = await runSweep(run, spec(), { inThisThread: true, placementMask: run.greyMatter, brainMask: run.brain, motionTable: run.motionTable, rotationCentreMm: run.rotationCentreMm });
}, 300_000);
afterAll(async () => { await closeSharedWorkerPools(); });

describe('motion regressors and censoring by framewise displacement in a sweep', () => {
  it('each setting\'s model loses one degree of freedom per motion column and per censored volume', () => {
    const censored = fdCensorVolumes(framewiseDisplacement(run.motionTable), 0.5);
    // the cough moves the head out at volume 40 and back at 41 (FD 5.7 mm each, measured); the wander
    // steps of 0.03 mm and 0.03 degree stay below 0.5 mm (0.25 mm at most on this phantom, measured)
    expect(censored).toEqual([40, 41]);
    const dof = (m: number, c: number | null) => swept.scorecard.rows.find((r) => r['model.motionRegressors'] === m && r['model.censorFdMm'] === c)!.dof as number;
    const base = dof(0, null);
    expect(dof(6, null)).toBe(base - 6);
    expect(dof(24, null)).toBe(base - 24);
    expect(dof(0, 0.5)).toBe(base - 2);
    expect(dof(24, 0.5)).toBe(base - 26);
  });

  it('censoring one volume before and two after each movement takes the neighbours out of the model too', async () => {
    const reach = await runSweep(run, { ...spec(), vary: {}, model: { censorFdMm: 0.5, censorFdBefore: 1, censorFdAfter: 2 } }, { inThisThread: true, placementMask: run.greyMatter, brainMask: run.brain, motionTable: run.motionTable, rotationCentreMm: run.rotationCentreMm });
    // flagged 40 and 41 -> 39..43: five volumes, each its own indicator column
    expect(fdCensorVolumes(framewiseDisplacement(run.motionTable), 0.5, { before: 1, after: 2 })).toEqual([39, 40, 41, 42, 43]);
    const base = swept.scorecard.rows.find((r) => r['model.motionRegressors'] === 0 && r['model.censorFdMm'] === null)!.dof as number;
    expect(reach.scorecard.rows[0].dof).toBe(base - 5);
    expect(() => parseSweepSpec({ ...spec(), vary: { 'model.censorFdAfter': [0, 2.5] } })).toThrow(expect.objectContaining({ code: 'SPEC_INVALID' }));
    expect(planSweep(parseSweepSpec({ ...spec(), vary: { 'model.censorFdMm': [0.5], 'model.censorFdAfter': [0, 2] } }), { runHash: 'r', contextHash: 'c' }).cells.length).toBe(2);
  }, 120_000);

  it('names the new model options in words and keeps every cell distinct', () => {
    const keys = new Set(planSweep(parseSweepSpec(spec()), { runHash: 'r', contextHash: 'c' }).cells.map((c) => c.key));
    expect(keys.size).toBe(6);
    expect(modelNeedsMotion(parseSweepSpec(spec()))).toBe(true);
    expect(modelNeedsMotion(parseSweepSpec({ ...spec(), vary: { 'model.motionRegressors': [0] } }))).toBe(false);
  });

  it('the motion estimate starts at the fewest initial volumes any setting drops', () => {
    const drop = (count: number, vary?: number[]) => fewestDropped(parseSweepSpec({ ...spec(), recipe: [{ step: 'drop-initial-volumes', params: { count } }, { step: 'smooth', params: { fwhmMm: 6 } }], vary: vary ? { 'drop-initial-volumes.count': vary } : {} }));
    expect(fewestDropped(parseSweepSpec(spec()))).toBe(0);
    expect(drop(3)).toBe(3);
    expect(drop(3, [4, 2])).toBe(2);
  });

  it('a spec without the motion options plans the same keys as one that never knew them (absent = none)', () => {
    const plain = parseSweepSpec({ ...spec(), vary: {} });
    expect('motionRegressors' in plain.model).toBe(false);
    expect('censorFdMm' in plain.model).toBe(false);
  });

  it('asks for the motion table when the model needs one and it may not estimate it, and refuses counts other than 0, 6, 12, 24', async () => {
    let code: string | undefined;
    try { await runSweep(run, spec(), { inThisThread: true, brainMask: run.brain, estimateMotion: false }); } catch (e) { code = isBoldsweepError(e) ? e.code : String(e); }
    expect(code).toBe('MOTION_TABLE_MISSING');
    expect(() => parseSweepSpec({ ...spec(), vary: { 'model.motionRegressors': [0, 7] } })).toThrow(expect.objectContaining({ code: 'SPEC_INVALID' }));
    expect(() => parseSweepSpec({ ...spec(), vary: {}, model: { censorFdMm: 0 } })).toThrow(expect.objectContaining({ code: 'SPEC_INVALID' }));
  });
});

describe('the motion options in words', () => {
  it('settingText names them with units, and a null value as none', async () => {
    const { settingText } = await import('../../src/sweep/settings-grid.js');
    expect(settingText({ 'model.motionRegressors': 24, 'model.censorFdMm': 0.5 })).toBe('motion regressors 24, censoring above framewise displacement 0.5 mm');
    expect(settingText({ 'model.censorFdMm': null })).toBe('censoring above framewise displacement none');
    expect(settingText({ 'model.censorFdBefore': 1, 'model.censorFdAfter': 2 })).toBe('volumes censored before each movement 1, volumes censored after each movement 2');
  });
});
