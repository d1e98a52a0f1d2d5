import { afterAll, describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume } from '../../src/core/volume.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { smoothRun } from '../../src/filter/smooth-run.js';
import type { StepContext } from '../../src/steps/step-types.js';
import { packVolumewise } from '../../src/sweep/pack-volumewise.js';

afterAll(async () => { await closeSharedWorkerPools(); });

const [nx, ny, nz, nt] = [11, 9, 8, 6];
const n = nx * ny * nz;
const data = new Float32Array(n * nt);
createRng(3).fillNormal(data, 100, 8);
const run = makeVolume({ dims: [nx, ny, nz, nt], spacingMm: [3, 3, 4], trSec: 2, affine: identityAffine(), data });
const { data: _d, ...geometry } = run;
const source = { geometry, volumeAt: (t: number, into: Float32Array) => into.set(data.subarray(t * n, (t + 1) * n)) };
const mask = new Uint8Array(n);
for (let v = 0; v < n; v++) mask[v] = v % 5 !== 0 ? 1 : 0;
const index = Int32Array.from([...mask.keys()].filter((v) => mask[v]));
const context: StepContext = { sidecar: null, events: null, mask, frame: { kind: 'raw' } };

describe('packVolumewise', () => {
  it('keeps the mask\'s voxels of the steps\' output on the whole run, byte for byte, with the whole run\'s notes', async () => {
    const steps = [{ step: 'smooth', params: { fwhmMm: 7 } }, { step: 'smooth', params: { fwhmMm: 4, withinMask: true } }];
    const m = index.length;
    const out = new Float32Array(m * nt);
    const { notes, context: after } = await packVolumewise(source, steps, [undefined, undefined], context, index, out);
    const once = await smoothRun(run, { fwhmMm: 7, workers: 1 });
    const twice = await smoothRun(once, { fwhmMm: 4, mask, workers: 1 });
    let differing = 0;
    for (let t = 0; t < nt; t++) for (let j = 0; j < m; j++) if (!Object.is(out[t * m + j], twice.data[t * n + index[j]])) differing++;
    expect(differing).toBe(0);
    expect(notes.map((s) => s.params)).toEqual([{ fwhmMm: 7, mode: 'reflect', withinMask: false }, { fwhmMm: 4, mode: 'reflect', withinMask: true }]);
    expect(after.frame).toEqual({ kind: 'raw' });
    expect('outputBuffer' in after).toBe(false);
  });
  it('refuses a step that is not volume-wise and an output of the wrong length', async () => {
    const code = async (p: Promise<unknown>): Promise<string> => { try { await p; } catch (e) { if (isBoldsweepError(e)) return e.code; throw e; } return 'none'; };
    expect(await code(packVolumewise(source, [{ step: 'grand-mean-scale', params: {} }], [undefined], context, index, new Float32Array(index.length * nt)))).toBe('INVALID_ARGUMENT');
    expect(await code(packVolumewise(source, [{ step: 'smooth', params: { fwhmMm: 4 } }], [undefined], context, index, new Float32Array(3)))).toBe('INVALID_ARGUMENT');
  });
});
