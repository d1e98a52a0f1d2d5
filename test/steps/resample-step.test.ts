import { afterAll, describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { makeVolume } from '../../src/core/volume.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { createRng } from '../../src/core/random.js';
import { getStep, parseStepParams, describeStep, applyStep } from '../../src/steps/registry.js';
import type { ResampleStepParams } from '../../src/steps/resample-step.js';
import type { StepContext } from '../../src/steps/step-types.js';

afterAll(() => closeSharedWorkerPools());

const rng = createRng(11);
const data = Float32Array.from({ length: 20 * 18 * 12 * 4 }, () => 100 + 5 * rng.normal());
const run = makeVolume({ dims: [20, 18, 12, 4], spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3], [-30, -27, -18]), data });
const mask = new Uint8Array(20 * 18 * 12).fill(1);
const context: StepContext = { sidecar: null, events: null, mask, frame: { kind: 'reference' } };

describe("the 'resample' step", () => {
  it('is registered with its contract: version, kind, labels, defaults', () => {
    const def = getStep('resample');
    expect(def.version).toBe(1);
    expect(def.kind).toBe('geometric');
    expect(def.labels.kernel).toEqual({ name: 'interpolation kernel', unit: '' });
    expect(def.labels.voxelSizeMm).toEqual({ name: 'target voxel size', unit: 'mm' });
    expect(parseStepParams('resample', { kernel: 'cubic' })).toEqual({ kernel: 'cubic', mode: 'constant' });
    expect(describeStep('resample', { kernel: 'linear', voxelSizeMm: 2 })).toBe('resample linear 2 mm');
    expect(() => parseStepParams('resample', { kernel: 'sinc' })).toThrow(/kernel/);
    expect(() => parseStepParams('resample', { kernel: 'linear', voxelSizeMm: 0 })).toThrow(/voxelSizeMm/);
  });
  it('orders kernels by simplicity: nearest < linear < cubic < lanczos3', () => {
    const s = getStep('resample').simplicity!;
    const order = ['lanczos3', 'nearest', 'cubic', 'linear'].sort((a, b) => s({ kernel: a } as ResampleStepParams as never) - s({ kernel: b } as never));
    expect(order).toEqual(['nearest', 'linear', 'cubic', 'lanczos3']);
  });
  it('onto 2 mm voxels: a target frame on the new grid, as outputFrame predicts; the context passes through', async () => {
    const res = await applyStep('resample', run, { kernel: 'cubic', voxelSizeMm: 2 }, context);
    expect(res.volume.dims).toEqual([30, 27, 18, 4]);
    expect(res.volume.spacingMm).toEqual([2, 2, 2]);
    expect(res.frame?.kind).toBe('target');
    const predicted = getStep('resample').outputFrame!({ kernel: 'cubic', voxelSizeMm: 2, mode: 'constant' } as never, { kind: 'reference' }, { ...context, grid: { dims: [20, 18, 12], affine: run.affine } });
    expect(predicted).toEqual(res.frame);
    expect(res.context?.frame).toEqual(res.frame);
    expect(res.context?.mask).toBe(mask);
    expect(res.note.methodsText).toMatch(/2 x 2 x 2 mm grid \(30 x 27 x 18 voxels.*cubic B-spline.*zeros outside/);
    expect(res.note.citations[0]).toMatch(/Unser M \(1999\)/);
    // the central voxel of the target sits between source voxels; its value lies within the data's range
    expect(res.volume.data.every(Number.isFinite)).toBe(true);
  });
  it("for the run's own voxel size: nothing moves, the frame stays the input's", async () => {
    const res = await applyStep('resample', run, { kernel: 'lanczos3', voxelSizeMm: 3 }, context);
    expect(Buffer.from(res.volume.data.buffer).equals(Buffer.from(run.data.buffer))).toBe(true);
    expect(res.frame).toEqual({ kind: 'reference' });
    expect(res.note.citations).toEqual([]);
  });
});
