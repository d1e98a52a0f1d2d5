import { afterAll, describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume } from '../../src/core/volume.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { smoothVolume3d } from '../../src/filter/gaussian-smooth.js';
import { maxFwhmMm, smoothStep } from '../../src/steps/smooth-step.js';
import type { StepContext } from '../../src/steps/step-types.js';
import { getStep } from '../../src/steps/registry.js';

afterAll(async () => { await closeSharedWorkerPools(); });

const data = new Float32Array(10 * 9 * 8 * 2);
createRng(11).fillNormal(data, 100, 5);
const run = makeVolume({ dims: [10, 9, 8, 2], spacingMm: [3, 3, 4], trSec: 2, affine: identityAffine(), data });
const ctx: StepContext = { sidecar: null, events: null, mask: null };

async function code(p: Promise<unknown>): Promise<string> {
  try { await p; } catch (e) { if (isBoldsweepError(e)) return e.code; throw e; }
  return 'no error';
}

describe('smooth step', () => {
  it('smooths each volume and writes a note with the methods sentence', async () => {
    const { volume, note } = await smoothStep(run, { fwhmMm: 6 }, ctx);
    const ref = smoothVolume3d(run.data.subarray(0, 720), [10, 9, 8], [3, 3, 4], 6);
    expect(Array.from(volume.data.subarray(0, 720))).toEqual(Array.from(ref));
    expect(note.step).toBe('smooth');
    expect(note.methodsText).toContain('3D Gaussian kernel of 6 mm FWHM');
    expect(note.diagnostics.kernelTaps).toEqual([7, 7, 7]); // sigma 0.849, 0.849, 0.637 voxels -> int(4 sigma + 0.5) = 3, 3, 3
    expect(note.params).toEqual({ fwhmMm: 6, mode: 'reflect', withinMask: false });
  });
  it('FWHM 0 copies the run', async () => {
    const { volume, note } = await smoothStep(run, { fwhmMm: 0 }, ctx);
    expect(Array.from(volume.data)).toEqual(Array.from(run.data));
    expect(note.methodsText).toBe('Images were not spatially smoothed.');
  });
  it('limits FWHM to min(50 mm, 10x the field of view) and rejects negative or NaN', async () => {
    expect(maxFwhmMm(run)).toBe(50); // FOV 32 mm -> 320 mm; 50 mm wins
    const tiny = makeVolume({ dims: [2, 2, 2, 1], spacingMm: [1, 1, 1], trSec: 0, affine: identityAffine(), data: new Float32Array(8) });
    expect(maxFwhmMm(tiny)).toBe(20);
    expect(await code(Promise.resolve(smoothStep(tiny, { fwhmMm: 25 }, ctx)))).toBe('INVALID_ARGUMENT');
    for (const fwhmMm of [-1, Number.NaN, 51, Infinity]) expect(await code(Promise.resolve(smoothStep(run, { fwhmMm }, ctx)))).toBe('INVALID_ARGUMENT');
  });
  it('withinMask needs a mask on the run grid', async () => {
    expect(await code(Promise.resolve(smoothStep(run, { fwhmMm: 6, withinMask: true }, ctx)))).toBe('INVALID_ARGUMENT');
    expect(await code(Promise.resolve(smoothStep(run, { fwhmMm: 6, withinMask: true }, { ...ctx, mask: new Uint8Array(10).fill(1) })))).toBe('GRID_MISMATCH');
    const mask = new Uint8Array(720).fill(1);
    mask[0] = 0;
    const { volume, note } = await smoothStep(run, { fwhmMm: 6, withinMask: true }, { ...ctx, mask });
    expect(volume.data[0]).toBe(0);
    expect(note.diagnostics.maskVoxels).toBe(719);
    expect(note.methodsText).toContain('normalised convolution');
  });
  it('writes into the array the context offers: the same bytes, in place or into a separate array', async () => {
    const ref = await smoothStep(run, { fwhmMm: 6 }, ctx);
    const separate = new Float32Array(run.data.length);
    const asked: number[] = [];
    const a = await smoothStep(run, { fwhmMm: 6 }, { ...ctx, outputBuffer: (length) => { asked.push(length); return separate; } });
    expect(asked).toEqual([run.data.length]);
    expect(a.volume.data).toBe(separate);
    expect(Array.from(separate)).toEqual(Array.from(ref.volume.data));
    const own = makeVolume({ ...run, data: Float32Array.from(run.data) });
    const b = await smoothStep(own, { fwhmMm: 6 }, { ...ctx, outputBuffer: () => own.data });
    expect(b.volume.data).toBe(own.data);
    expect(Array.from(own.data)).toEqual(Array.from(ref.volume.data));
  });
  it('is volume-wise, as its definition declares: each volume alone gives the whole run\'s bytes and note', async () => {
    expect(getStep('smooth').volumewise).toBe(true);
    const mask = new Uint8Array(720);
    for (let v = 0; v < 720; v++) mask[v] = v % 7 < 5 ? 1 : 0;
    for (const params of [{ fwhmMm: 6 }, { fwhmMm: 0 }, { fwhmMm: 8, mode: 'constant' as const }, { fwhmMm: 6, withinMask: true }]) {
      const c = { ...ctx, mask };
      const whole = await smoothStep(run, params, c);
      for (let t = 0; t < 2; t++) {
        const one = makeVolume({ ...run, dims: [10, 9, 8, 1], data: run.data.slice(t * 720, (t + 1) * 720) });
        const alone = await smoothStep(one, params, c);
        expect(Array.from(alone.volume.data)).toEqual(Array.from(whole.volume.data.subarray(t * 720, (t + 1) * 720)));
        expect(alone.note).toEqual(whole.note);
      }
    }
  });
});
