import { describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { contrastMaps } from '../../src/model/contrast.js';
import { buildDesign } from '../../src/model/design.js';
import { fitGlmAr1 } from '../../src/model/glm-ar1.js';
import { fitGlm } from '../../src/model/glm-ols.js';
import { fitGlmBySliceTime } from '../../src/model/fit-glm-by-slice-time.js';
import type { BoldEvent } from '../../src/io/run-types.js';

const [NX, NY, NZ, NT, TR] = [4, 3, 4, 80, 2.5];
const events: BoldEvent[] = [0, 40, 80, 120, 160].map((onset) => ({ onsetSec: onset, durationSec: 15, trialType: 'task', modulation: 1 }));
const designAt = (sampleTimeSec: number) => buildDesign(events, { nt: NT, trSec: TR, sampleTimeSec, drift: { kind: 'dct', cutoffSec: 100 } });

/** Noise with some lag-1 correlation plus a response sampled at each slice's time. */
function run(times: number[]): Volume {
  const rng = createRng(7);
  const nvox = NX * NY * NZ;
  const data = new Float32Array(nvox * NT);
  const designs = times.map((t) => designAt(t));
  for (let v = 0; v < nvox; v++) {
    const k = Math.floor(v / (NX * NY));
    const d = designs[k];
    let e = 0;
    for (let t = 0; t < NT; t++) {
      e = 0.3 * e + rng.normal();
      data[t * nvox + v] = 500 + 3 * d.x[t * d.p] + e;
    }
  }
  return makeVolume({ dims: [NX, NY, NZ, NT], spacingMm: [3, 3, 3], trSec: TR, affine: identityAffine(), data });
}

const sliceMask = (slices: number[]): Uint8Array => Uint8Array.from({ length: NX * NY * NZ }, (_, v) => (slices.includes(Math.floor(v / (NX * NY))) ? 1 : 0));

describe('GLM with a design per slice time (the model-based slice-timing alternative)', () => {
  const times = [0, 1.25, 0, 1.25]; // two slice times (a multiband pair)
  const designs = [designAt(0), designAt(1.25)];
  const ofSlice = [0, 1, 0, 1];

  it('one design everywhere: the same fit as fitGlm and fitGlmAr1', () => {
    const r = run(times);
    const d = designAt(1);
    const a = fitGlm(r, d, { keepResiduals: true });
    const b = fitGlmBySliceTime(r, [d], [0, 0, 0, 0], { keepResiduals: true });
    expect(Array.from(b.betas)).toEqual(Array.from(a.betas));
    expect(Array.from(b.sigma2)).toEqual(Array.from(a.sigma2));
    expect(Array.from(b.residuals!.data)).toEqual(Array.from(a.residuals!.data));
    const a1 = fitGlmAr1(r, d);
    const b1 = fitGlmBySliceTime(r, [d], [0, 0, 0, 0], { ar1: true });
    expect(Array.from(contrastMaps(b1, { task: 1 }).t.data)).toEqual(Array.from(contrastMaps(a1, { task: 1 }).t.data));
  });
  it('each slice group gets exactly what fitGlm gives it alone with its own design (OLS), also in place', () => {
    const r = run(times);
    const merged = contrastMaps(fitGlmBySliceTime(r, designs, ofSlice), { task: 1 });
    for (const c of [0, 1]) {
      const mask = sliceMask([0, 1, 2, 3].filter((k) => ofSlice[k] === c));
      const alone = contrastMaps(fitGlm(r, designs[c], { mask }), { task: 1 });
      for (let v = 0; v < mask.length; v++) if (mask[v]) {
        expect(merged.t.data[v]).toBe(alone.t.data[v]);
        expect(merged.effect.data[v]).toBe(alone.effect.data[v]);
      }
    }
    const copy = Float32Array.from(r.data);
    const inPlace = fitGlmBySliceTime(makeVolume({ ...r, data: copy }), designs, ofSlice, { residualsOut: copy });
    const separate = fitGlmBySliceTime(r, designs, ofSlice, { keepResiduals: true });
    expect(Array.from(inPlace.betas)).toEqual(Array.from(separate.betas));
    expect(Array.from(copy)).toEqual(Array.from(separate.residuals!.data));
  });
  it('AR(1) without smoothing: each slice group as fitGlmAr1 on its own voxels with its design', () => {
    const r = run(times);
    const merged = contrastMaps(fitGlmBySliceTime(r, designs, ofSlice, { ar1: true, ar1SmoothFwhmMm: 0 }), { task: 1 });
    for (const c of [0, 1]) {
      const mask = sliceMask([0, 1, 2, 3].filter((k) => ofSlice[k] === c));
      const alone = contrastMaps(fitGlmAr1(r, designs[c], { mask, ar1SmoothFwhmMm: 0 }), { task: 1 });
      for (let v = 0; v < mask.length; v++) if (mask[v]) expect(merged.t.data[v]).toBe(alone.t.data[v]);
    }
  });
  it('the right design per slice fits better than one mid-TR design: larger t where the timing differs', () => {
    const r = run([0, 2.4, 0, 2.4]);
    const ds = [designAt(0), designAt(2.4)];
    const perSlice = contrastMaps(fitGlmBySliceTime(r, ds, ofSlice), { task: 1 });
    const one = contrastMaps(fitGlm(r, designAt(1.2)), { task: 1 });
    let sumPer = 0, sumOne = 0;
    for (let v = 0; v < perSlice.t.data.length; v++) { sumPer += perSlice.t.data[v]; sumOne += one.t.data[v]; }
    expect(sumPer).toBeGreaterThan(sumOne);
  });
  it('refuses designs with other columns and slices without a design', () => {
    const r = run(times);
    const other = buildDesign(events, { nt: NT, trSec: TR, drift: { kind: 'none' } });
    expect(() => fitGlmBySliceTime(r, [designs[0], other], ofSlice)).toThrow(/same columns/);
    expect(() => fitGlmBySliceTime(r, designs, [0, 1, 2, 0])).toThrow(/names design 2/);
  });
});
