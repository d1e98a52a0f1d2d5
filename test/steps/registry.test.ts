import { z } from 'zod';
import { afterAll, describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError, type BoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume } from '../../src/core/volume.js';
import { closeSharedWorkerPools } from '../../src/core/worker-pool.js';
import { applyStep, describeStep, getStep, listSteps, parseStepParams, registerStep } from '../../src/steps/registry.js';
import { smoothRun } from '../../src/filter/smooth-run.js';
import type { StepContext } from '../../src/steps/step-types.js';

afterAll(async () => { await closeSharedWorkerPools(); });

function caught(f: () => unknown): BoldsweepError {
  try { f(); } catch (e) { if (isBoldsweepError(e)) return e; throw e; }
  throw new Error('expected a BoldsweepError');
}

describe('step registry', () => {
  it('registers the built-in steps', () => {
    expect(listSteps()).toEqual(expect.arrayContaining(['smooth', 'percent-signal-change', 'grand-mean-scale', 'highpass', 'detrend', 'drop-initial-volumes']));
  });
  it('fails with UNKNOWN_STEP listing the names', () => {
    const e = caught(() => getStep('blur'));
    expect(e.code).toBe('UNKNOWN_STEP');
    expect(e.message).toContain('smooth');
    expect(e.message).toContain('drop-initial-volumes');
  });
  it('fills defaults and rejects unknown parameters and bad values', () => {
    expect(parseStepParams('smooth', { fwhmMm: 6 })).toEqual({ fwhmMm: 6, mode: 'reflect', withinMask: false });
    expect(parseStepParams('highpass', {})).toEqual({ cutoffSec: 128 });
    const unknown = caught(() => parseStepParams('smooth', { fwhm: 6 }));
    expect(unknown.code).toBe('UNKNOWN_PARAMETER');
    expect(unknown.message).toContain('fwhmMm');
    expect(caught(() => parseStepParams('smooth', { fwhmMm: -1 })).code).toBe('INVALID_ARGUMENT');
    expect(caught(() => parseStepParams('smooth', { fwhmMm: 6, mode: 'mirrored' })).code).toBe('INVALID_ARGUMENT');
    expect(caught(() => parseStepParams('drop-initial-volumes', { count: 1.5 })).code).toBe('INVALID_ARGUMENT');
    expect(caught(() => parseStepParams('drop-initial-volumes', {})).code).toBe('INVALID_ARGUMENT');
  });
  it('describes settings and refuses duplicate or malformed names', () => {
    expect(describeStep('smooth', { fwhmMm: 8 })).toBe('smooth 8 mm');
    expect(caught(() => registerStep('smooth', getStep('smooth'))).code).toBe('INVALID_ARGUMENT');
    expect(caught(() => registerStep('Bad Name', getStep('smooth'))).code).toBe('INVALID_ARGUMENT');
  });
  it('takes volumewise only for spatial filters', () => {
    // a step over all volumes (a temporal filter) cannot be run one volume at a time
    expect(caught(() => registerStep('smooth-over-time', { ...getStep('highpass'), volumewise: true })).code).toBe('INVALID_ARGUMENT');
    expect(caught(() => registerStep('smooth-maybe', { ...getStep('smooth'), volumewise: 'yes' as unknown as boolean })).code).toBe('INVALID_ARGUMENT');
    expect(getStep('smooth').volumewise).toBe(true);
    expect(getStep('grand-mean-scale').volumewise).toBeFalsy();
  });
  it('applies a registered step with validated parameters (same result as calling smoothRun)', async () => {
    const data = new Float32Array(8 * 7 * 6 * 3);
    createRng(5).fillNormal(data, 100, 10);
    const run = makeVolume({ dims: [8, 7, 6, 3], spacingMm: [3, 3, 3], trSec: 2, affine: identityAffine(), data });
    const ctx: StepContext = { sidecar: null, events: null, mask: null };
    const res = await applyStep('smooth', run, { fwhmMm: 6 }, ctx);
    const ref = await smoothRun(run, { fwhmMm: 6 });
    expect(Array.from(res.volume.data)).toEqual(Array.from(ref.data));
    expect(res.note.params).toEqual({ fwhmMm: 6, mode: 'reflect', withinMask: false });
  });
  it('accepts a new step defined by its schema', async () => {
    registerStep('scale-by', {
      schema: z.object({ factor: z.number().positive() }).strict(),
      version: 1,
      kind: 'spatial-filter',
      labels: { factor: { name: 'scale factor', unit: '' } },
      apply: (v, p) => ({ volume: { ...v, data: v.data.map((x) => x * p.factor) }, note: { step: 'scale-by', params: { ...p }, summary: '', diagnostics: {}, methodsText: '', citations: [] } }),
      describe: (p) => `scale by ${p.factor}`,
    }, { replace: true });
    const run = makeVolume({ dims: [1, 1, 1, 2], spacingMm: [1, 1, 1], trSec: 1, affine: identityAffine(), data: Float32Array.of(1, 2) });
    const res = await applyStep('scale-by', run, { factor: 3 }, { sidecar: null, events: null, mask: null });
    expect(Array.from(res.volume.data)).toEqual([3, 6]);
  });
});
