import { describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { sliceOrderTiming } from '../../src/acquire/slice-order-timing.js';
import { applyStep, describeStep, getStep, parseStepParams } from '../../src/steps/registry.js';
import { sliceTimeStep } from '../../src/steps/slice-time-step.js';
import type { StepContext } from '../../src/steps/step-types.js';

const [NX, NY, NZ, NT] = [2, 2, 4, 60];
const TR = 2;

/** Each slice k samples the same slow signal s(t) = sin(2 pi 0.02 t) at n TR + times[k]. */
function timedRun(times: number[], trSec = TR): Volume {
  const nvox = NX * NY * NZ;
  const data = new Float32Array(nvox * NT);
  for (let t = 0; t < NT; t++) for (let v = 0; v < nvox; v++) {
    const k = Math.floor(v / (NX * NY));
    data[t * nvox + v] = 100 + 10 * Math.sin(2 * Math.PI * 0.02 * (t * trSec + times[k]));
  }
  return makeVolume({ dims: [NX, NY, NZ, NT], spacingMm: [3, 3, 3], trSec, affine: identityAffine(), data });
}

function codeOf(f: () => unknown): string {
  try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : `other: ${String(e)}`; }
  return 'none';
}

describe('slice-time step', () => {
  const times = sliceOrderTiming(NZ, TR, 'interleaved-odd-first'); // [0, 1, 0.5, 1.5]
  const ctx: StepContext = { sidecar: { RepetitionTime: TR, SliceTiming: times }, events: null, mask: null, sliceTimesSec: Float64Array.from(times) };

  it('brings every slice to the reference time (middle of the TR by default) and hands on aligned slice times', async () => {
    for (const method of ['linear', 'cubic', 'fourier'] as const) {
      const run = timedRun(times);
      const before = Float32Array.from(run.data);
      const r = await applyStep('slice-time', run, { method }, ctx);
      expect(Array.from(run.data)).toEqual(Array.from(before)); // input not modified
      expect(Array.from(r.context!.sliceTimesSec!)).toEqual([1, 1, 1, 1]);
      expect(r.note.params.referenceSlice === undefined && r.note.params.referenceSec === undefined).toBe(true);
      // each slice now holds s(n TR + 1 s): away from the run's ends, every method is close
      // (a 0.02 Hz sine at TR 2 s: 0.04 cycles per sample, linear keeps cos(0.02 pi) of a 10-unit amplitude)
      const nvox = NX * NY * NZ;
      let worst = 0;
      for (let t = 3; t < NT - 3; t++) for (let v = 0; v < nvox; v++) {
        worst = Math.max(worst, Math.abs(r.volume.data[t * nvox + v] - (100 + 10 * Math.sin(2 * Math.PI * 0.02 * (t * TR + 1)))));
      }
      expect(worst).toBeLessThan(method === 'linear' ? 0.1 : 0.01); // linear: 10 (1 - cos(0.02 pi)) = 0.02 plus float32
      expect(r.note.methodsText).toMatch(/middle of the TR \(1 s\)/);
    }
  });
  it('reference as a slice index or a time in seconds (scalars, so a sweep can vary them)', async () => {
    const r = await applyStep('slice-time', timedRun(times), { method: 'cubic', referenceSlice: 1 }, ctx);
    expect(Array.from(r.context!.sliceTimesSec!)).toEqual([1, 1, 1, 1]);
    const r2 = await applyStep('slice-time', timedRun(times), { method: 'cubic', referenceSec: 0.25 }, ctx);
    expect(r2.note.diagnostics.referenceSec).toBe(0.25);
    // slice 0 (read at 0 s) moves by 0.125 volumes
    expect(r2.note.diagnostics.largestShiftSec).toBeCloseTo(1.25, 12);
  });
  it('method model leaves the data as acquired and marks the context for per-slice designs', async () => {
    const run = timedRun(times);
    const r = await applyStep('slice-time', run, { method: 'model' }, ctx);
    expect(r.volume.data).toBe(run.data);
    expect(r.context!.modelAtSliceTimes).toBe(true);
    expect(Array.from(r.context!.sliceTimesSec!)).toEqual(times);
  });
  it('generates the slice times from an order when asked (multiband)', async () => {
    const r = await applyStep('slice-time', timedRun([0, 1, 0, 1]), { method: 'linear', order: 'ascending', multibandFactor: 2 }, { sidecar: null, events: null, mask: null });
    expect(r.note.diagnostics.sliceTimesSource).toBe('generated (ascending, multiband factor 2)');
    expect(r.note.diagnostics.largestShiftSec).toBe(1);
  });
  it('the note carries the guidance: advised against at long TR, aliased rhythms named', async () => {
    const long = timedRun(sliceOrderTiming(NZ, 5, 'ascending'), 5);
    const r = await applyStep('slice-time', long, { method: 'fourier' }, { sidecar: null, events: null, mask: null, sliceTimesSec: Float64Array.from(sliceOrderTiming(NZ, 5, 'ascending')) });
    expect(r.note.diagnostics.shiftAdvisedAgainst).toBe(true);
    expect(r.note.diagnostics.advisedMethod).toBe('model');
    expect(r.note.summary).toMatch(/advised against at TR 5 s/);
    expect(r.note.diagnostics.respirationAliasedHz).toBeCloseTo(0.1, 12); // 0.3 Hz at fs 0.2 Hz: 0.3 - 0.2
    const short = await applyStep('slice-time', timedRun(times), { method: 'fourier' }, ctx);
    expect(short.note.diagnostics.shiftAdvisedAgainst).toBe(false);
    expect(String(short.note.diagnostics.guidance)).toMatch(/cardiac fluctuations near 1 Hz appear at 0 Hz/);
  });
  it('is registered: temporal, version 1, sweepable method, simplicity model < linear < cubic < fourier', () => {
    const def = getStep('slice-time');
    expect(def.kind).toBe('temporal');
    expect(def.version).toBe(1);
    expect(parseStepParams('slice-time', {})).toEqual({ method: 'fourier', multibandFactor: 1 });
    const s = ['model', 'linear', 'cubic', 'fourier'].map((m) => def.simplicity!(parseStepParams('slice-time', { method: m }) as never));
    expect(s).toEqual([0, 1, 2, 3]);
    expect(describeStep('slice-time', { method: 'cubic', referenceSlice: 3 })).toBe('slice-time cubic to slice 3');
    expect(codeOf(() => parseStepParams('slice-time', { method: 'quintic' }))).not.toBe('none');
  });
});

describe('slice-time bad input: typed errors that name the sidecar field', () => {
  const run = timedRun([0, 1, 0.5, 1.5]);
  const base: StepContext = { sidecar: null, events: null, mask: null };
  const msg = (f: () => unknown): string => { try { f(); } catch (e) { return String((e as Error).message); } return ''; };
  it('no slice times at all: SLICE_TIMING_MISSING naming SliceTiming', () => {
    expect(codeOf(() => sliceTimeStep(run, { method: 'fourier' }, base))).toBe('SLICE_TIMING_MISSING');
    expect(msg(() => sliceTimeStep(run, { method: 'fourier' }, base))).toMatch(/SliceTiming/);
  });
  it('a time at or beyond the TR, or negative: SLICE_TIMING_INVALID naming SliceTiming', () => {
    const late = { ...base, sidecar: { RepetitionTime: TR, SliceTiming: [0, 1, 2, 1.5] } };
    expect(codeOf(() => sliceTimeStep(run, {}, late))).toBe('SLICE_TIMING_INVALID');
    expect(msg(() => sliceTimeStep(run, {}, late))).toMatch(/SliceTiming\[2\]/);
    const ms = { ...base, sliceTimesSec: Float64Array.of(0, 1000, 500, 1500) };
    expect(msg(() => sliceTimeStep(run, {}, ms))).toMatch(/milliseconds/);
    const negative = { ...base, sliceTimesSec: Float64Array.of(0, -0.5, 0.5, 1) };
    expect(codeOf(() => sliceTimeStep(run, {}, negative))).toBe('SLICE_TIMING_INVALID');
  });
  it('another count than the slices: SLICE_TIMING_LENGTH naming SliceTiming', () => {
    const short = { ...base, sidecar: { RepetitionTime: TR, SliceTiming: [0, 1, 0.5] } };
    expect(codeOf(() => sliceTimeStep(run, {}, short))).toBe('SLICE_TIMING_LENGTH');
    expect(msg(() => sliceTimeStep(run, {}, short))).toMatch(/SliceTiming/);
  });
  it('slices along another axis: SLICE_AXIS_UNSUPPORTED; a reversed direction k- reads SliceTiming from the last slice', async () => {
    const times = [0, 1, 0.5, 1.5];
    const along = (dir: string) => ({ ...base, sidecar: { RepetitionTime: TR, SliceTiming: times, SliceEncodingDirection: dir } });
    expect(codeOf(() => sliceTimeStep(run, {}, along('j')))).toBe('SLICE_AXIS_UNSUPPORTED');
    expect(msg(() => sliceTimeStep(run, {}, along('i-')))).toMatch(/SliceEncodingDirection/);
    const r = await applyStep('slice-time', run, { method: 'model' }, along('k-'));
    expect(Array.from(r.context!.sliceTimesSec!)).toEqual([...times].reverse());
  });
  it('a reference outside the run, a multiband factor that does not divide, a resampled grid', () => {
    const ctx = { ...base, sliceTimesSec: Float64Array.of(0, 1, 0.5, 1.5) };
    expect(codeOf(() => sliceTimeStep(run, { referenceSlice: 4 }, ctx))).toBe('SLICE_TIME_REFERENCE_INVALID');
    expect(codeOf(() => sliceTimeStep(run, { referenceSec: 2 }, ctx))).toBe('SLICE_TIME_REFERENCE_INVALID');
    expect(codeOf(() => sliceTimeStep(run, { referenceSec: 0.5, referenceSlice: 1 }, ctx))).toBe('SLICE_TIME_REFERENCE_INVALID');
    expect(codeOf(() => sliceTimeStep(run, { order: 'ascending', multibandFactor: 3 }, base))).toBe('SLICE_TIMING_MULTIBAND');
    const target = { ...ctx, frame: { kind: 'target' as const, grid: { dims: [NX, NY, NZ] as [number, number, number], affine: identityAffine() } } };
    expect(codeOf(() => sliceTimeStep(run, {}, target))).toBe('INVALID_ARGUMENT');
    expect(codeOf(() => sliceTimeStep(makeVolume({ ...run, trSec: 0 }), {}, ctx))).toBe('TR_MISSING');
  });
});
