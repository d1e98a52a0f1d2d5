import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gridCentreMm } from '../../src/acquire/grid-centre-mm.js';
import { composeAffine, invertAffine } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { motionTableToTsv, parseMotionTable } from '../../src/io/motion-table-tsv.js';
import { affineMotionParameters } from '../../src/register/affine-motion-parameters.js';
import { estimateRunMotion, RUN_MOTION_IN_THREAD_BELOW } from '../../src/register/estimate-run-motion.js';
import { leastMovingVolume } from '../../src/register/least-moving-volume.js';
import { motionParametersAffine } from '../../src/register/motion-parameters-affine.js';
import { resampleVolume } from '../../src/resample/resample-volume.js';
import { gridOf, phantomVolume } from './phantom-pair.js';

// 14 poses: slow drift with a jerk at volume 9 (shifts mm, rotations degrees), volume 0 at rest
const POSES = Array.from({ length: 14 }, (_, t) => {
  const jerk = t >= 9 ? 1 : 0;
  return [0.08 * t + 0.6 * jerk, -0.05 * t, 0.04 * t + 0.8 * jerk, 0.06 * t + 1.2 * jerk, -0.03 * t, 0.05 * t - 0.5 * jerk];
});

let run: Volume;
beforeAll(() => {
  const head = phantomVolume();
  const c = gridCentreMm(gridOf(head));
  const n = head.data.length;
  const data = new Float32Array(n * POSES.length);
  const rng = createRng(31);
  POSES.forEach((p, t) => {
    const moved = resampleVolume(head, { kernel: 'cubic', transform: invertAffine(motionParametersAffine(p, c)), mode: 'nearest' });
    for (let i = 0; i < n; i++) data[t * n + i] = moved.data[i] + rng.normal(0, 20);
  });
  run = makeVolume({ dims: [head.dims[0], head.dims[1], head.dims[2], POSES.length], spacingMm: head.spacingMm, trSec: 2, affine: head.affine, data });
});
afterAll(async () => { await closeSharedWorkerPools(); });

/** Largest difference between estimated rows and the poses relative to volume `ref`. */
function rowError(rows: { shiftXMm: number; shiftYMm: number; shiftZMm: number; rotXDeg: number; rotYDeg: number; rotZDeg: number }[], ref: number): number {
  const c = gridCentreMm(gridOf(run));
  const back = invertAffine(motionParametersAffine(POSES[ref], c));
  let worst = 0;
  rows.forEach((r, t) => {
    const truth = affineMotionParameters(composeAffine(motionParametersAffine(POSES[t], c), back), c, 'rigid');
    [r.shiftXMm, r.shiftYMm, r.shiftZMm, r.rotXDeg, r.rotYDeg, r.rotZDeg].forEach((v, i) => { worst = Math.max(worst, Math.abs(v - truth[i])); });
  });
  return worst;
}

describe('estimateRunMotion', () => {
  it('recovers every pose relative to the first volume, on worker threads (0.1 mm / 0.1 degree, as registerImagePair)', async () => {
    expect(run.data.length).toBeGreaterThan(RUN_MOTION_IN_THREAD_BELOW);
    const m = await estimateRunMotion(run, { reference: 'first', workers: 2 });
    expect(m.referenceIndex).toBe(0);
    expect(m.rows).toHaveLength(14);
    expect(Array.from(m.transforms[0])).toEqual(Array.from(motionParametersAffine([0, 0, 0, 0, 0, 0], m.centreMm)));
    expect(rowError(m.rows, 0)).toBeLessThan(0.1);
    // the rows are a motion table: written and read back with the same numbers
    expect(parseMotionTable(motionTableToTsv(m.rows))).toEqual(m.rows);
  });
  it('middle and a given index register to that volume; in the calling thread too', async () => {
    const mid = await estimateRunMotion(run, { reference: 'middle', workers: 1 });
    expect(mid.referenceIndex).toBe(7);
    expect(rowError(mid.rows, 7)).toBeLessThan(0.1);
    const at = await estimateRunMotion(run, { reference: 11, workers: 2 });
    expect(at.referenceIndex).toBe(11);
    expect(rowError(at.rows, 11)).toBeLessThan(0.1);
  });
  it('least-moving picks the volume with the least summed displacement to the others', async () => {
    const m = await estimateRunMotion(run, { reference: 'least-moving', workers: 2 });
    const np = POSES.flat();
    expect(m.referenceIndex).toBe(leastMovingVolume(Float64Array.from(np), 6));
    expect(rowError(m.rows, m.referenceIndex as number)).toBeLessThan(0.1);
  });
  it('the affine model writes a 12-column motion table', async () => {
    const m = await estimateRunMotion(run, { reference: 'first', model: 'affine', workers: 2 });
    const tsv = motionTableToTsv(m.rows);
    expect(tsv.split('\n')[0]).toBe('shiftXMm\tshiftYMm\tshiftZMm\trotXDeg\trotYDeg\trotZDeg\tscaleX\tscaleY\tscaleZ\tshearXY\tshearXZ\tshearYZ');
    expect(parseMotionTable(tsv)).toEqual(m.rows);
    // no scaling or shearing in the poses: scales within 0.002 of 1 (0.1 mm at 50 mm)
    for (const r of m.rows) for (const k of ['scaleX', 'scaleY', 'scaleZ'] as const) expect(Math.abs((r as Record<string, number>)[k] - 1)).toBeLessThan(0.002);
  });
  it('bad input: one volume, a reference out of range or unknown, NaN in the run', async () => {
    const one = makeVolume({ dims: [run.dims[0], run.dims[1], run.dims[2], 1], spacingMm: run.spacingMm, trSec: 2, affine: run.affine, data: run.data.slice(0, run.dims[0] * run.dims[1] * run.dims[2]) });
    await expect(estimateRunMotion(one)).rejects.toMatchObject({ code: 'TOO_FEW_VOLUMES' });
    await expect(estimateRunMotion(run, { reference: 14 })).rejects.toMatchObject({ code: 'MOTION_REFERENCE_INVALID', message: expect.stringMatching(/outside 0\.\.13/) });
    await expect(estimateRunMotion(run, { reference: 'last' as never })).rejects.toMatchObject({ code: 'MOTION_REFERENCE_INVALID' });
    const bad = makeVolume({ ...run, data: run.data.slice() });
    bad.data[run.data.length - 5] = NaN;
    await expect(estimateRunMotion(bad)).rejects.toMatchObject({ code: 'NON_FINITE_VOXELS', message: expect.stringMatching(/volume 13/) });
  });
});
