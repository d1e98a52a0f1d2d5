import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { registerStep, type StepDefinition } from '../../src/steps/registry.js';
import { runSweep, type SweepResult } from '../../src/sweep/runner.js';
import { scorecardToTsv } from '../../src/sweep/scorecard-tsv.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';
import type { MotionRow } from '../../src/acquire/rigid-motion-affine.js';
import { movingPhantom, smallPhantom } from './sweep-test-runs.js';
// @ts-expect-error: a plain JavaScript fixture (what a user would write), without type declarations
import { calls, undoMotionDefinition } from './fixtures/undo-motion-definition.mjs';

// Issue 9's check at the sweep level: the sweep itself plants through known non-identity head poses
// (runSweep's motionTable: the run's own motion, as the phantom simulated it), a user's geometric
// step (fixtures/undo-motion*.mjs, on 2 worker threads: build first) takes the same motion table as
// its parameter and brings every volume back to the reference pose with resampleRun's per-volume
// affines, declaring the reference frame; scoring there must find the blobs where they were planted,
// and clearly better than the same sweep with the step left as a copy (undo: false, raw frame).
const moduleUrl = new URL('./fixtures/undo-motion.mjs', import.meta.url).href;
registerStep('undo-motion', undoMotionDefinition as StepDefinition<Record<string, unknown>>, { module: moduleUrl, replace: true });

// a slow wander of 0.25 mm and 0.25 degrees per volume, then from volume 40 on a lasting jerk of
// several mm and degrees about every axis
const motion = { wanderStepMm: 0.25, wanderStepDeg: 0.25, jerk: { volume: 40, shiftMm: [4, -3, 2] as [number, number, number], rotationDeg: [3, -2, 4] as [number, number, number] } };
let run: ReturnType<typeof movingPhantom>;
let swept: SweepResult;

function posedSpec(table: MotionRow[], centre: [number, number, number]): SweepSpecInput {
  return {
    recipe: [{ step: 'undo-motion', params: { motionTable: table, rotationCentreMm: centre } }, { step: 'smooth', params: { fwhmMm: 6 } }],
    vary: { 'undo-motion.undo': [false, true] },
    plant: { sizesFwhmMm: [12], amplitudesPct: [8], count: 3 },
    repeats: 2,
    threshold: { kind: 'fwe-rft' },
    seed: 5,
  };
}

beforeAll(async () => {
  run = movingPhantom(motion);
  swept = await runSweep(run, posedSpec(run.motionTable, run.rotationCentreMm), {
    workers: 2, placementMask: run.greyMatter, brainMask: run.brain, motionTable: run.motionTable, rotationCentreMm: run.rotationCentreMm,
  });
}, 300_000);
afterAll(async () => { await closeSharedWorkerPools(); });

async function codeOf(f: () => Promise<unknown>): Promise<string | undefined> {
  try { await f(); } catch (e) { return isBoldsweepError(e) ? e.code : String(e); }
  return undefined;
}

describe('a sweep that plants through known head poses, scored in the reference frame after the inverse transform', () => {
  it('plants under clearly non-identity poses, varying over volumes', () => {
    const shiftMm = run.motionTable.map((r) => Math.hypot(r.shiftXMm, r.shiftYMm, r.shiftZMm));
    const rotDeg = run.motionTable.map((r) => Math.max(Math.abs(r.rotXDeg), Math.abs(r.rotYDeg), Math.abs(r.rotZDeg)));
    expect(Math.max(...shiftMm)).toBeGreaterThan(4);
    expect(Math.max(...rotDeg)).toBeGreaterThan(3);
    // measured on this phantom (seed 3): 5.7 mm and 4.6 degrees at most
    expect(new Set(shiftMm.map((x) => x.toFixed(3))).size).toBeGreaterThan(40);
    expect(swept.stats.workers).toBe(2);
  });

  it('finds every blob where it was planted after the inverse transform, and clearly better than without it', () => {
    const rows = (undo: boolean) => swept.scorecard.rows.filter((r) => r['undo-motion.undo'] === undo);
    const undone = rows(true), left = rows(false);
    expect(undone).toHaveLength(2);
    expect(left).toHaveLength(2);
    const setting = (undo: boolean) => swept.plan.settings.findIndex((s) => s['undo-motion.undo'] === undo);
    expect(swept.notes.find((n) => n.settingIndex === setting(true))!.notes[0].summary).toBe('known motion undone (cubic)');
    for (const r of undone) {
      expect(r.blobHitRate).toBe(1);
      // the statistic peaks in the 3x3x3 voxels around each planted centre's voxel (5 mm voxels: at
      // most one voxel off on each axis, 5 sqrt(3) mm); at 8 % in this noise a peak moves by a voxel
      // (measured: 0 and 7.1 mm, one voxel off on two axes)
      expect(r.peakErrorMaxMm as number).toBeLessThanOrEqual(5 * Math.sqrt(3) + 1e-9);
    }
    // the same plantings with the motion left in: the blobs are smeared over the head's path
    // (measured blob hit rate 0.67 and 0.33 against 1 and 1; peak statistic 5.4 and 5.2 against 7.4
    // and 7.0; voxel hit rate 0.33 and 0.14 against 0.76 and 0.67)
    const mean = (rs: typeof undone, k: string) => rs.reduce((s, r) => s + (r[k] as number), 0) / rs.length;
    expect(mean(undone, 'blobHitRate') - mean(left, 'blobHitRate')).toBeGreaterThanOrEqual(0.3);
    for (let i = 0; i < 2; i++) {
      expect(undone[i].plantSeed).toBe(left[i].plantSeed);
      expect(undone[i].peakStatisticMean as number).toBeGreaterThan(1.2 * (left[i].peakStatisticMean as number));
      expect(undone[i].hitRate as number).toBeGreaterThan(1.5 * (left[i].hitRate as number));
    }
  });

  it('stops with MOTION_TABLE_LENGTH before any work when the motion table has another length', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'boldsweep-posed-'));
    try {
      const short = run.motionTable.slice(0, 79);
      calls.apply = 0;
      let progress = 0;
      const options = { placementMask: run.greyMatter, brainMask: run.brain, motionTable: short, rotationCentreMm: run.rotationCentreMm, cacheDir: dir, onProgress: () => { progress++; } };
      expect(await codeOf(() => runSweep(run, posedSpec(run.motionTable, run.rotationCentreMm), { ...options, inThisThread: true }))).toBe('MOTION_TABLE_LENGTH');
      expect(await codeOf(() => runSweep(run, posedSpec(run.motionTable, run.rotationCentreMm), { ...options, workers: 2 }))).toBe('MOTION_TABLE_LENGTH');
      expect(calls.apply).toBe(0);
      expect(progress).toBe(0);
      expect(readdirSync(dir)).toEqual([]);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('gives the same scorecard rows with a motion table of zeros as with none', async () => {
    const still = smallPhantom();
    const zeros: MotionRow[] = Array.from({ length: still.volume.dims[3] }, (_, volume) => ({ volume, shiftXMm: 0, shiftYMm: 0, shiftZMm: 0, rotXDeg: 0, rotYDeg: 0, rotZDeg: 0 }));
    const spec: SweepSpecInput = { recipe: [{ step: 'smooth', params: { fwhmMm: 6 } }], vary: { 'smooth.fwhmMm': [4, 8] }, plant: { sizesFwhmMm: [10], amplitudesPct: [4], count: 3 }, repeats: 1, threshold: { kind: 'fwe-rft' }, seed: 11 };
    const none = await runSweep(still, spec, { inThisThread: true, placementMask: still.greyMatter });
    const zero = await runSweep(still, spec, { inThisThread: true, placementMask: still.greyMatter, motionTable: zeros });
    expect(none.scorecard.rows.length).toBe(2);
    expect(zero.scorecard.rows).toEqual(none.scorecard.rows);
    expect(scorecardToTsv(zero.scorecard).split('\n').slice(1)).toEqual(scorecardToTsv(none.scorecard).split('\n').slice(1));
    expect(none.scorecard.rows.some((r) => (r.blobsDetected as number) > 0)).toBe(true);
  });
});
