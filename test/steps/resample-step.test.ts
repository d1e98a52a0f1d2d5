import { afterAll, describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { makeVolume } from '../../src/core/volume.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { createRng } from '../../src/core/random.js';
import { getStep, parseStepParams, describeStep, applyStep } from '../../src/steps/registry.js';
import type { ResampleStepParams } from '../../src/steps/resample-step.js';
import type { StepContext } from '../../src/steps/step-types.js';
import { applyAffine, invertAffine } from '../../src/core/affine.js';
import { maskOnGrid } from '../../src/resample/mask-on-grid.js';

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
  it('onto 2 mm voxels: a target frame on the new grid, as outputFrame predicts; the context passes through with its mask on the new grid', async () => {
    const res = await applyStep('resample', run, { kernel: 'cubic', voxelSizeMm: 2 }, context);
    expect(res.volume.dims).toEqual([30, 27, 18, 4]);
    expect(res.volume.spacingMm).toEqual([2, 2, 2]);
    expect(res.frame?.kind).toBe('target');
    const predicted = getStep('resample').outputFrame!({ kernel: 'cubic', voxelSizeMm: 2, mode: 'constant' } as never, { kind: 'reference' }, { ...context, grid: { dims: [20, 18, 12], affine: run.affine } });
    expect(predicted).toEqual(res.frame);
    expect(res.context?.frame).toEqual(res.frame);
    // the all-ones mask on the target grid: in wherever a target voxel centre lies at least half
    // inside the source grid's voxel centres (trilinear of 0/1 with zeros outside, kept at >= 0.5)
    expect(res.context?.mask?.length).toBe(30 * 27 * 18);
    expect(Array.from(res.context!.mask!)).toEqual(Array.from(maskOnGrid(mask, { dims: [20, 18, 12], affine: run.affine }, (res.frame as { grid: never }).grid)));
    expect(mask.length).toBe(20 * 18 * 12);
    expect(res.note.methodsText).toMatch(/2 x 2 x 2 mm grid \(30 x 27 x 18 voxels.*cubic B-spline.*zeros outside/);
    expect(res.note.citations[0]).toMatch(/Unser M \(1999\)/);
    // the central voxel of the target sits between source voxels; its value lies within the data's range
    expect(res.volume.data.every(Number.isFinite)).toBe(true);
  });
  it('carries a brain mask onto the target grid, so smoothing within the mask runs after it', async () => {
    // a box mask: source voxels 4..15 x 4..13 x 3..8 (world mm: 3 x index + origin)
    const box = new Uint8Array(20 * 18 * 12);
    for (let k = 3; k <= 8; k++) for (let j = 4; j <= 13; j++) for (let i = 4; i <= 15; i++) box[i + 20 * (j + 18 * k)] = 1;
    const res = await applyStep('resample', run, { kernel: 'linear', voxelSizeMm: 2 }, { ...context, mask: box });
    const grid = (res.frame as { kind: 'target'; grid: { dims: [number, number, number]; affine: Float64Array } }).grid;
    const carried = res.context!.mask!;
    expect(carried.length).toBe(30 * 27 * 18);
    // a target voxel whose centre lies among the box's voxel centres is in; one more than half a source
    // voxel outside the box on some axis is out (its trilinear box weight is below 0.5)
    expect(Array.from(carried)).toEqual(Array.from(maskOnGrid(box, { dims: [20, 18, 12], affine: run.affine }, grid)));
    const srcOf = (i: number, j: number, k: number) => applyAffine(invertAffine(run.affine), applyAffine(grid.affine, [i, j, k]));
    let inside = 0;
    for (let k = 0; k < 18; k++) for (let j = 0; j < 27; j++) for (let i = 0; i < 30; i++) {
      const [x, y, z] = srcOf(i, j, k);
      const deep = x >= 4 && x <= 15 && y >= 4 && y <= 13 && z >= 3 && z <= 8;
      const far = x < 3.5 || x > 15.5 || y < 3.5 || y > 13.5 || z < 2.5 || z > 8.5;
      if (deep) { expect(carried[i + 30 * (j + 27 * k)]).toBe(1); inside++; }
      if (far) expect(carried[i + 30 * (j + 27 * k)]).toBe(0);
    }
    expect(inside).toBeGreaterThan(0);
    // smoothing within the mask on the target grid: zero outside the carried mask
    const smoothed = await applyStep('smooth', res.volume, { fwhmMm: 4, withinMask: true }, res.context!);
    expect(smoothed.volume.dims).toEqual(res.volume.dims);
    for (let t = 0; t < 4; t++) for (let v = 0; v < carried.length; v++) if (!carried[v]) expect(smoothed.volume.data[t * carried.length + v]).toBe(0);
    const psc = await applyStep('percent-signal-change', res.volume, {}, res.context!);
    expect(psc.volume.dims).toEqual(res.volume.dims);
    // a mask on another grid than the input is refused, before any resampling
    await expect(applyStep('resample', run, { kernel: 'linear', voxelSizeMm: 2 }, { ...context, mask: new Uint8Array(7) })).rejects.toMatchObject({ code: 'GRID_MISMATCH' });
  });
  it("for the run's own voxel size: nothing moves, the frame stays the input's", async () => {
    const res = await applyStep('resample', run, { kernel: 'lanczos3', voxelSizeMm: 3 }, context);
    expect(Buffer.from(res.volume.data.buffer).equals(Buffer.from(run.data.buffer))).toBe(true);
    expect(res.frame).toEqual({ kind: 'reference' });
    expect(res.note.citations).toEqual([]);
  });
});
