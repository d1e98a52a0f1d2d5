import { describe, expect, it } from 'vitest';
import { applyUnwarp } from '../../src/acquire/apply-unwarp.js';
import { planUnwarp } from '../../src/acquire/plan-unwarp.js';
import { shiftMapVoxels } from '../../src/acquire/shift-map-voxels.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume } from '../../src/core/volume.js';
import { demoPhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { describeStep, getStep, parseStepParams } from '../../src/steps/registry.js';
import type { StepContext } from '../../src/steps/step-types.js';
import { unwarpEstimate, unwarpStep, type UnwarpEstimate, type UnwarpStepParams } from '../../src/steps/unwarp-step.js';
import { readCacheJson, writeCacheJson } from '../../src/sweep/stage-cache.js';
import { runRecipeStep } from '../../src/sweep/recipe-step.js';

// the demo head, noise-free, 3 volumes, distorted along j by its sinus field, and the same with 'j-'
const base = { ...demoPhantomSpec(), nVolumes: 3, thermalNoiseSd: 0, rician: false, physio: null, drift: null, smoothNoise: null, motion: null, spikes: [], dropouts: [], activation: null, design: null };
const b0 = { susceptibilityDifferencePpm: 9.4, dephasing: true, distortion: true };
const run = simulatePhantomRun({ ...base, b0 });
const reversed = simulatePhantomRun({ ...base, b0, acquisition: { ...base.acquisition, phaseEncodingDirection: 'j-' } });
const n = run.truth.fieldMapHz.data.length;
const brain = Uint8Array.from(run.truth.tissueLabels.data, (l) => (l === 3 || l === 4 ? 1 : 0));
const context = (over: Partial<StepContext> = {}): StepContext => ({ sidecar: run.sidecar, events: null, mask: brain, frame: { kind: 'raw' }, ...over });

async function codeOf(f: () => unknown): Promise<string> {
  try { await f(); } catch (e) { return isBoldsweepError(e) ? e.code : `other: ${String(e)}`; }
  return 'none';
}

describe('unwarp step', () => {
  it('is registered as a geometric step with defaults linear and Jacobian on', () => {
    const def = getStep('unwarp');
    expect(def.kind).toBe('geometric');
    expect(def.version).toBe(1);
    expect(parseStepParams('unwarp', { method: 'field-map' })).toEqual({ method: 'field-map', kernel: 'linear', jacobian: true });
    expect(describeStep('unwarp', { method: 'reversed-pe', kernel: 'cubic' })).toBe('unwarp reversed-pe cubic');
    expect(describeStep('unwarp', { method: 'none' })).toBe('no unwarping');
    expect(def.simplicity!(parseStepParams('unwarp', { method: 'none' }))).toBeLessThan(def.simplicity!(parseStepParams('unwarp', { method: 'field-map' })));
  });

  it('field-map: applies the shift map of the sidecar readout to every volume, keeps the frame, and its estimate survives the cache', async () => {
    const fieldMapHz = run.truth.fieldMapHz.data;
    const r = await runRecipeStep({ step: 'unwarp', params: { method: 'field-map' } }, run.volume, context({ fieldMapHz }));
    const shift = shiftMapVoxels(fieldMapHz, { totalReadoutTimeSec: run.sidecar.TotalReadoutTime!, sign: 1 });
    const expected = applyUnwarp(run.volume.data, planUnwarp(shift, [44, 52, 34], 1, { kernel: 'linear', jacobian: true }), new Float32Array(run.volume.data.length));
    expect(Array.from(r.volume.data)).toEqual(Array.from(expected));
    expect(r.frame).toEqual({ kind: 'raw' });
    expect(r.note.citations[0]).toMatch(/Jezzard/);
    // the demo's sinus field moves signal by up to 12 voxels (707 Hz x 17.85 ms) and dephases some brain
    expect(r.note.diagnostics.maxAbsShiftVoxels as number).toBeGreaterThan(1);
    expect(r.note.diagnostics.lostVoxelsInMask as number).toBeGreaterThan(0);
    const e = unwarpEstimate(run.volume, { method: 'field-map' }, context({ fieldMapHz }));
    const back = readCacheJson<UnwarpEstimate>(writeCacheJson(e));
    expect(Array.from(back.shiftVoxels!)).toEqual(Array.from(e.shiftVoxels!));
    // the input is not modified; written into a handed-over input buffer it gives the same values
    const copy = Float32Array.from(run.volume.data);
    const own = makeVolume({ ...run.volume, data: copy });
    const inPlace = await unwarpStep(own, { method: 'field-map' }, { ...context({ fieldMapHz }), outputBuffer: () => copy }, e);
    expect(inPlace.volume.data).toBe(copy);
    expect(Array.from(inPlace.volume.data)).toEqual(Array.from(expected));
  });

  it('reversed-pe: estimates the field from the pair, reports the pair\'s agreement before and after', async () => {
    const mean = (v: typeof run.volume) => { const m = new Float32Array(n); for (let t = 0; t < v.dims[3]; t++) for (let i = 0; i < n; i++) m[i] += v.data[t * n + i] / v.dims[3]; return m; };
    const phaseEncodePair = { imageA: mean(run.volume), imageB: mean(reversed.volume), directionA: 'j', directionB: 'j-', totalReadoutTimeSec: run.sidecar.TotalReadoutTime! };
    const e = unwarpEstimate(run.volume, { method: 'reversed-pe' }, context({ phaseEncodePair }));
    const d = e.diagnostics;
    // measured on the noise-free pair: correlation 0.94 -> 0.99 in the brain
    expect(d.pairCorrelationAfter).toBeGreaterThan(d.pairCorrelationBefore);
    expect(d.pairMeanAbsDifferenceAfter).toBeLessThan(d.pairMeanAbsDifferenceBefore);
    // the field it found is close to the true one in the brain outside the lost voxels (3 Hz: see test/acquire/unwarp.test.ts)
    let se = 0, k = 0;
    for (let v = 0; v < n; v++) if (brain[v] && Math.abs(run.truth.fieldMapHz.data[v]) < 60) { se += (e.fieldHz![v] - run.truth.fieldMapHz.data[v]) ** 2; k++; }
    expect(Math.sqrt(se / k)).toBeLessThan(3);
    // swapped pair: the run's direction is B's, so the same field gives the same shift
    const swapped = unwarpEstimate(run.volume, { method: 'reversed-pe' }, context({ phaseEncodePair: { ...phaseEncodePair, imageA: phaseEncodePair.imageB, imageB: phaseEncodePair.imageA, directionA: 'j-', directionB: 'j' } }));
    let diff = 0;
    for (let v = 0; v < n; v++) if (brain[v]) diff = Math.max(diff, Math.abs(swapped.shiftVoxels![v] - e.shiftVoxels![v]));
    // the matching is symmetric up to the background threshold and the half-voxel level grid: 0.05 voxel
    expect(diff).toBeLessThan(0.05);
  });

  it('none copies the run; missing inputs and sidecar fields stop with typed errors', async () => {
    const r = await unwarpStep(run.volume, { method: 'none' }, context());
    expect(Array.from(r.volume.data)).toEqual(Array.from(run.volume.data));
    expect(r.note.methodsText).toMatch(/not corrected/);
    expect(await codeOf(() => unwarpStep(run.volume, { method: 'field-map' }, context()))).toBe('UNWARP_INPUT_MISSING');
    expect(await codeOf(() => unwarpStep(run.volume, { method: 'reversed-pe' }, context()))).toBe('UNWARP_INPUT_MISSING');
    const noReadout = { ...run.sidecar };
    delete noReadout.TotalReadoutTime; delete noReadout.EffectiveEchoSpacing;
    expect(await codeOf(() => unwarpStep(run.volume, { method: 'field-map' }, context({ sidecar: noReadout, fieldMapHz: run.truth.fieldMapHz.data })))).toBe('READOUT_TIME_MISSING');
    const noDirection = { ...run.sidecar };
    delete noDirection.PhaseEncodingDirection;
    expect(await codeOf(() => unwarpStep(run.volume, { method: 'field-map' }, context({ sidecar: noDirection, fieldMapHz: run.truth.fieldMapHz.data })))).toBe('PHASE_ENCODE_MISSING');
    expect(await codeOf(() => unwarpStep(run.volume, { method: 'field-map' }, context({ fieldMapHz: new Float32Array(10) })))).toBe('GRID_MISMATCH');
    const pair = { imageA: new Float32Array(n), imageB: new Float32Array(n), directionA: 'j', directionB: 'i-', totalReadoutTimeSec: 0.02 };
    expect(await codeOf(() => unwarpStep(run.volume, { method: 'reversed-pe' } as UnwarpStepParams, context({ phaseEncodePair: pair })))).toBe('PHASE_ENCODE_PAIR_INVALID');
    expect(await codeOf(() => parseStepParams('unwarp', { method: 'warp-both' }))).toBe('INVALID_ARGUMENT');
  });
});
