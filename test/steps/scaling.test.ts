import { describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { grandMeanScale, grandMeanScaleStep } from '../../src/steps/grand-mean-scale.js';
import { percentSignalChange, percentSignalChangeStep } from '../../src/steps/percent-signal-change.js';
import type { StepContext, StepResult } from '../../src/steps/step-types.js';

/** A run of nv voxels in a row, voxel v holding series[v]. */
function rowRun(series: number[][]): Volume {
  const nv = series.length, nt = series[0].length;
  const data = new Float32Array(nv * nt);
  for (let t = 0; t < nt; t++) for (let v = 0; v < nv; v++) data[t * nv + v] = series[v][t];
  return makeVolume({ dims: [nv, 1, 1, nt], spacingMm: [3, 3, 3], trSec: 2, affine: identityAffine(), data });
}
const seriesOf = (v: Volume, i: number): number[] => Array.from({ length: v.dims[3] }, (_, t) => v.data[t * v.dims[0] + i]);

describe('percent signal change', () => {
  // a known series: mean 200, so 100 y / mean = y / 2 (arithmetic, no source needed)
  const known = [190, 200, 210, 220, 180];
  const run = rowRun([known, [1000, 1010, 990, 1000, 1000], [5, 5, 5, 5, 5], [1e-30, 0, 0, 0, 0], [400, 400, 400, 400, 400]]);
  const mask = Uint8Array.of(1, 1, 1, 1, 0);

  it('gives 100 y / mean for a known series, and 100 (y - mean) / mean when centred', () => {
    const r = percentSignalChange(run, mask, {});
    // tolerance: Float32 storage of values near 100 (ulp 7.6e-6)
    seriesOf(r.volume, 0).forEach((v, t) => expect(Math.abs(v - known[t] / 2)).toBeLessThan(1e-5));
    const c = percentSignalChange(run, mask, { centred: true });
    seriesOf(c.volume, 0).forEach((v, t) => expect(Math.abs(v - (known[t] - 200) / 2)).toBeLessThan(1e-5));
  });
  it('excludes and counts voxels whose mean is below the fraction of the robust brain mean, never dividing', () => {
    const r = percentSignalChange(run, mask, { minMeanFraction: 0.1 });
    // in-mask temporal means: 200, 1000, 5, 2e-31 -> median (5 + 200) / 2 = 102.5; limit 10.25
    expect(r.robustBrainMean).toBeCloseTo(102.5, 10);
    expect(r.excludedVoxels).toBe(2);
    expect(r.scaledVoxels).toBe(2);
    for (const i of [2, 3, 4]) for (const v of seriesOf(r.volume, i)) expect(v).toBe(0); // excluded x2, outside mask
    expect(r.volume.data.every(Number.isFinite)).toBe(true);
  });
  it('writes a step note with the counts and needs a mask of the run grid', () => {
    const ctx: StepContext = { sidecar: null, events: null, mask };
    const res = percentSignalChangeStep(run, {}, ctx) as StepResult;
    expect(res.note.diagnostics.excludedVoxels).toBe(2);
    expect(res.note.methodsText).toContain('100 y / m');
    try { percentSignalChangeStep(run, {}, { ...ctx, mask: null }); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'INVALID_ARGUMENT')).toBe(true); }
    try { percentSignalChangeStep(run, {}, { ...ctx, mask: new Uint8Array(4).fill(1) }); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'GRID_MISMATCH')).toBe(true); }
  });
  it('does not modify its input', () => {
    const before = Float32Array.from(run.data);
    percentSignalChange(run, mask, {});
    expect(Array.from(run.data)).toEqual(Array.from(before));
  });
});

describe('grand-mean scaling', () => {
  it('scales the whole run so the in-mask mean of the temporal mean is the target (default 10000)', () => {
    const run = rowRun([[100, 300], [500, 700], [9, 9]]); // temporal means 200, 600, 9
    const mask = Uint8Array.of(1, 1, 0);
    const r = grandMeanScale(run, mask);
    expect(r.grandMean).toBe(400);
    expect(r.factor).toBe(25);
    expect(seriesOf(r.volume, 0)).toEqual([2500, 7500]);
    expect(seriesOf(r.volume, 2)).toEqual([225, 225]); // outside the mask scaled by the same factor
    const res = grandMeanScaleStep(run, { target: 100 }, { sidecar: null, events: null, mask }) as StepResult;
    expect(res.note.diagnostics.factor).toBe(0.25);
    expect(res.note.params).toEqual({ target: 100 });
  });
  it('rejects a non-positive target or grand mean', () => {
    const run = rowRun([[-1, -3], [0, 0]]);
    try { grandMeanScale(run, Uint8Array.of(1, 1)); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'INVALID_ARGUMENT')).toBe(true); }
    try { grandMeanScale(rowRun([[1, 2]]), Uint8Array.of(1), 0); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'INVALID_ARGUMENT')).toBe(true); }
  });
});
