import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gridCentreMm } from '../../src/acquire/grid-centre-mm.js';
import { invertAffine } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { motionParametersAffine } from '../../src/register/motion-parameters-affine.js';
import { resampleVolume } from '../../src/resample/resample-volume.js';
import { resampleRun } from '../../src/resample/resample-run.js';
import { fdSummary, type MotionEstimate } from '../../src/steps/motion-correct-step.js';
import { applyStep, describeStep, getStep, parseStepParams } from '../../src/steps/registry.js';
import type { StepContext } from '../../src/steps/step-types.js';
import { gridOf, phantomVolume } from '../register/phantom-pair.js';

const POSES = [[0, 0, 0, 0, 0, 0], [0.8, -0.5, 0.3, 0.7, -0.4, 1.0], [1.5, 0.4, -0.6, -1.0, 0.8, 1.6], [-0.7, 1.1, 0.5, 1.4, 0.3, -0.9]];
let run: Volume;
let head: Volume;
const context: StepContext = { sidecar: null, events: null, mask: null };

beforeAll(() => {
  head = phantomVolume();
  const c = gridCentreMm(gridOf(head));
  const n = head.data.length;
  const data = new Float32Array(n * POSES.length);
  const rng = createRng(41);
  POSES.forEach((p, t) => {
    const moved = resampleVolume(head, { kernel: 'cubic', transform: invertAffine(motionParametersAffine(p, c)), mode: 'nearest' });
    for (let i = 0; i < n; i++) data[t * n + i] = moved.data[i] + rng.normal(0, 20);
  });
  run = makeVolume({ dims: [head.dims[0], head.dims[1], head.dims[2], POSES.length], spacingMm: head.spacingMm, trSec: 2, affine: head.affine, data });
});
afterAll(async () => { await closeSharedWorkerPools(); });

/** Root mean square difference from the noise-free head over voxels inside the field of view in every volume. */
function rmsFromHead(v: Volume): number[] {
  const n = head.data.length;
  let peak = 0;
  for (const x of head.data) peak = Math.max(peak, x);
  return POSES.map((_, t) => {
    let s = 0, m = 0;
    for (let i = 0; i < n; i++) if (head.data[i] > 0.2 * peak) { s += (v.data[t * n + i] - head.data[i]) ** 2; m++; }
    return Math.sqrt(s / m);
  });
}

describe('fdSummary (framewise displacement, Power et al. 2012, NeuroImage 59:2142-2154)', () => {
  it('mean, largest and count above 0.5 mm on a worked example', () => {
    // FD_1 = 1 mm (shift x); FD_2 = |0.2| mm + 0.5 deg x pi/180 x 50 mm = 0.2 + 0.43633 = 0.63633 mm
    const s = fdSummary([[0, 0, 0, 0, 0, 0], [1, 0, 0, 0, 0, 0], [1.2, 0, 0, 0, 0, 0.5]]);
    expect(s.maxMm).toBe(1);
    expect(s.meanMm).toBeCloseTo((0 + 1 + 0.2 + 0.5 * Math.PI / 180 * 50) / 3, 12);
    expect(s.above05).toBe(2);
  });
});

describe('motion-correct step', () => {
  it('is registered as a geometric step with its defaults, labels and a short description', () => {
    const def = getStep('motion-correct');
    expect(def.kind).toBe('geometric');
    expect(def.version).toBe(2);
    expect(typeof def.estimate).toBe('function');
    expect(parseStepParams('motion-correct', {})).toEqual({ model: 'rigid', cost: 'least-squares', reference: 'first', kernel: 'linear', mode: 'constant', levels: [4, 2, 1], withinMask: false });
    expect(describeStep('motion-correct', { model: 'affine', kernel: 'cubic', reference: 'mean' })).toBe('motion-correct affine least-squares to mean, cubic');
    expect(() => parseStepParams('motion-correct', { model: 'elastic' })).toThrow(/model/);
    expect(() => parseStepParams('motion-correct', { reference: -1 })).toThrow();
    expect(def.outputFrame?.({}, { kind: 'raw' }, context)).toEqual({ kind: 'reference' });
    expect((def.simplicity as (p: unknown) => number)(parseStepParams('motion-correct', { model: 'affine' }))).toBeGreaterThan((def.simplicity as (p: unknown) => number)(parseStepParams('motion-correct', {})));
  });
  it('estimate once, apply: the corrected run is back in the first volume\'s position, in the reference frame', async () => {
    const def = getStep('motion-correct');
    const params = parseStepParams('motion-correct', { kernel: 'cubic' });
    const estimate = await def.estimate?.(run, params, context) as MotionEstimate;
    expect(estimate.parameters).toHaveLength(4);
    // framewise displacement before (the estimate) and after (the corrected run registered again):
    // the true poses give FD 3.43, 5.55, 8.71 mm at volumes 1-3 (Power et al. 2012, 50 mm sphere; by
    // the definition: |shift differences| + |rotation differences| x pi/180 x 50); after correction
    // the head stands still up to the estimate's error (about 0.04 mm and 0.04 deg per volume, so FD
    // of a few hundredths of a mm; 0.1 mm leaves room for the coarse levels of the check)
    const fd = estimate.framewiseDisplacement;
    expect(fd.before.maxMm).toBeGreaterThan(5);
    expect(fd.before.above05).toBe(3);
    expect(fd.after).not.toBeNull();
    expect(fd.after!.maxMm).toBeLessThan(0.1);
    expect(fd.after!.above05).toBe(0);
    // the estimate survives the sweep's JSON cache
    const cached = JSON.parse(JSON.stringify(estimate)) as MotionEstimate;
    const out = await applyStep('motion-correct', run, { kernel: 'cubic' }, context, cached);
    expect(out.frame).toEqual({ kind: 'reference' });
    expect(out.context?.frame).toEqual({ kind: 'reference' });
    expect(out.volume.dims).toEqual(run.dims);
    expect(out.note.methodsText).toMatch(/rigid \(6-parameter\).*least squares.*cubic B-spline/);
    const before = rmsFromHead(run);
    const after = rmsFromHead(out.volume);
    // the floor: the same resampling with the true poses (noise and two interpolations of the edges remain)
    const c = gridCentreMm(gridOf(head));
    const known = await resampleRun(run, { kernel: 'cubic', mode: 'constant', perVolume: POSES.map((p) => motionParametersAffine(p, c)), workers: 1 });
    const floor = rmsFromHead(known);
    // measured: before 125-211, after 40-50, floor within 2 % of after; 10 % leaves room for the
    // estimate's 0.04 mm / 0.04 degree errors on another noise seed
    for (let t = 1; t < POSES.length; t++) {
      expect(before[t]).toBeGreaterThan(2.5 * after[t]);
      expect(after[t]).toBeLessThan(1.1 * floor[t]);
    }
    // the same estimate gives the same bytes with or without the JSON trip
    const direct = await applyStep('motion-correct', run, { kernel: 'cubic' }, context, estimate);
    expect(Buffer.from(direct.volume.data.buffer, direct.volume.data.byteOffset, direct.volume.data.byteLength).equals(Buffer.from(out.volume.data.buffer, out.volume.data.byteOffset, out.volume.data.byteLength))).toBe(true);
  });
  it('a reference other than the first still puts the output in the first volume\'s position (T_t T_0^-1)', async () => {
    const first = await applyStep('motion-correct', run, { kernel: 'cubic' }, context);
    const third = await applyStep('motion-correct', run, { kernel: 'cubic', reference: 2 }, context);
    const a = rmsFromHead(first.volume), b = rmsFromHead(third.volume);
    // two routes to the same position: each volume's distance from the head within 10 % of the other's
    for (let t = 0; t < POSES.length; t++) expect(Math.abs(a[t] - b[t])).toBeLessThan(0.1 * a[t]);
  });
  it('bad input: an estimate of another run length, withinMask without a mask, a reference beyond the run', async () => {
    const estimate = { model: 'rigid', cost: 'least-squares', referenceIndex: 0, centreMm: [0, 0, 0], parameters: [[0, 0, 0, 0, 0, 0]], costs: [0] };
    await expect(applyStep('motion-correct', run, {}, context, estimate)).rejects.toMatchObject({ code: 'MOTION_TABLE_LENGTH' });
    await expect(applyStep('motion-correct', run, { withinMask: true }, context)).rejects.toMatchObject({ code: 'INVALID_ARGUMENT' });
    await expect(applyStep('motion-correct', run, { reference: 9 }, context)).rejects.toMatchObject({ code: 'MOTION_REFERENCE_INVALID' });
  });
});
