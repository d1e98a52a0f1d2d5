import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { framewiseDisplacement } from '../../src/model/framewise-displacement.js';
import { runSweep, type SweepResult } from '../../src/sweep/runner.js';
import { scorecardToTsv } from '../../src/sweep/scorecard-tsv.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';
import { movingPhantom } from './sweep-test-runs.js';

// A sweep given no motion table estimates the run's motion once (rigid, least squares, to the middle
// volume), plants with its poses, gives the model the same table, and keeps the estimate in its cache.
// The phantom's head wanders slowly and coughs once: 2 mm and 1.5 degrees at volume 40 for one volume.
const motion = { wanderStepMm: 0.03, wanderStepDeg: 0.03, jerk: { volume: 40, durationVolumes: 1, shiftMm: [2, -1, 0.5] as [number, number, number], rotationDeg: [1.5, 0, -1] as [number, number, number] } };
let run: ReturnType<typeof movingPhantom>;
let dir: string;
let first: SweepResult;
let second: SweepResult;

function spec(): SweepSpecInput {
  return {
    recipe: [{ step: 'smooth', params: { fwhmMm: 6 } }],
    vary: { 'model.motionRegressors': [0, 24] },
    model: { censorFdMm: 0.5 },
    plant: { sizesFwhmMm: [10], amplitudesPct: [3], count: 3 },
    repeats: 1,
    threshold: { kind: 'fwe-rft' },
    seed: 11,
  };
}

beforeAll(async () => {
  run = movingPhantom(motion);
  dir = mkdtempSync(join(tmpdir(), 'planting-motion-'));
  const options = { workers: 2, placementMask: run.greyMatter, brainMask: run.brain, cacheDir: join(dir, 'cache') };
  first = await runSweep(run, spec(), options);
  second = await runSweep(run, spec(), options);
}, 600_000);
afterAll(async () => {
  await closeSharedWorkerPools();
  rmSync(dir, { recursive: true, force: true });
});

describe('a sweep without a motion table estimates the motion once and plants with it', () => {
  it('estimates (then reads from the cache) and says how', () => {
    expect(first.motion?.source).toBe('estimated');
    expect(first.motion?.fromCache).toBe(false);
    expect(first.motion?.method).toMatch(/rigid \(6 parameters\), least squares, every volume to the middle volume \(40\)/);
    expect(second.motion?.fromCache).toBe(true);
    // same estimate, same keys: every cell comes from the cache with the same scorecard
    expect(second.stats.cellsFromCache).toBe(second.stats.cellsInPlan);
    expect(scorecardToTsv(second.scorecard)).toBe(scorecardToTsv(first.scorecard));
  });

  it('finds the cough: the model censors volumes 40 and 41 by the estimated FD, as by the true one', () => {
    const above = (fd: Float64Array) => [...fd].map((x, t) => (x > 0.5 ? t : -1)).filter((t) => t >= 0);
    const truth = framewiseDisplacement(run.motionTable);
    const estimated = framewiseDisplacement(first.motion!.table);
    expect(above(truth)).toEqual([40, 41]);
    expect(above(estimated)).toEqual([40, 41]);
    // FD barely depends on the reference volume at these small rotations, so the cough's FD (5.7 mm
    // in truth) is compared directly: 0.6 mm is the registration's stated accuracy (0.1 mm, 0.1 degree
    // per parameter) summed over the six parameters with the 50 mm arc, 3 x 0.1 + 3 x 0.087 = 0.56 mm
    for (const t of [40, 41]) expect(Math.abs(estimated[t] - truth[t])).toBeLessThan(0.6);
    // censoring 2 volumes and 24 motion columns: the dof of the two settings differ by 24 exactly
    const dof = (m: number) => first.scorecard.rows.find((r) => r['model.motionRegressors'] === m)!.dof as number;
    expect(dof(0) - dof(24)).toBe(24);
  });
});
