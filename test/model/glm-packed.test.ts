import { describe, expect, it } from 'vitest';
import { identityAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume } from '../../src/core/volume.js';
import { buildDesign } from '../../src/model/design.js';
import { fitGlmAr1 } from '../../src/model/glm-ar1.js';
import { fitGlm } from '../../src/model/glm-ols.js';
import { estimateSmoothness } from '../../src/model/smoothness.js';

// A packed run is the same numbers read from another place: every result must keep its bytes. The
// methods themselves are checked against numpy/scipy fixtures in glm-ols.test.ts, ar1.test.ts and
// smoothness.test.ts.
const [nx, ny, nz, nt] = [9, 8, 7, 40];
const n = nx * ny * nz;
const data = new Float32Array(n * nt);
createRng(5).fillNormal(data, 100, 3);
// a slow drift and some spatial correlation along x, so AR(1) bins and smoothness are not trivial
for (let t = 0; t < nt; t++) for (let v = 1; v < n; v++) data[t * n + v] = 0.6 * data[t * n + v - 1] + 0.4 * data[t * n + v] + 0.05 * t;
const run = makeVolume({ dims: [nx, ny, nz, nt], spacingMm: [3, 3, 3.5], trSec: 2, affine: identityAffine(), data });
const mask = new Uint8Array(n);
for (let v = 0; v < n; v++) mask[v] = (v * 7919) % 10 < 7 ? 1 : 0;
const index = Int32Array.from([...mask.keys()].filter((v) => mask[v]));
const m = index.length;
const packed = new Float32Array(m * nt);
for (let t = 0; t < nt; t++) for (let j = 0; j < m; j++) packed[t * m + j] = data[t * n + index[j]];
const events = [{ onsetSec: 10, durationSec: 20, trialType: 'a', modulation: 1 }, { onsetSec: 50, durationSec: 20, trialType: 'a', modulation: 1 }];
const design = buildDesign(events, { nt, trSec: 2, drift: { kind: 'dct', cutoffSec: 60 } });
const bytes = (a: ArrayLike<number> | null | undefined): number[] => Array.from(a ?? []);

describe('GLM fits of a packed run (the mask\'s voxels only)', () => {
  for (const [name, fit] of [['OLS', fitGlm], ['AR(1)', fitGlmAr1]] as const) {
    it(`${name}: the grid fit's betas, variances, rho and residuals, byte for byte`, () => {
      const grid = fit(run, design, { mask, keepResiduals: true });
      const inPlace = Float32Array.from(packed);
      const p = fit(run, design, { mask, packed: inPlace, residualsOut: inPlace });
      expect(bytes(p.voxels)).toEqual(bytes(grid.voxels));
      expect(bytes(p.betas)).toEqual(bytes(grid.betas));
      expect(bytes(p.sigma2)).toEqual(bytes(grid.sigma2));
      expect(bytes(p.rho)).toEqual(bytes(grid.rho));
      expect(bytes(p.group)).toEqual(bytes(grid.group));
      expect(p.residuals).toBeNull();
      expect(p.packedResiduals).toBe(inPlace);
      const r = grid.residuals!.data;
      const expected = new Float32Array(m * nt);
      for (let t = 0; t < nt; t++) for (let j = 0; j < m; j++) expected[t * m + j] = r[t * n + index[j]];
      expect(bytes(inPlace)).toEqual(bytes(expected));
      // and the residual smoothness read from them
      const a = estimateSmoothness(r, run.dims, mask, run.spacingMm, { dof: grid.dof });
      const b = estimateSmoothness(inPlace, run.dims, mask, run.spacingMm, { dof: grid.dof, packed: true });
      expect(b).toEqual(a);
    });
  }
  it('rejects a packed array of the wrong length', () => {
    let code = '';
    try { fitGlm(run, design, { mask, packed: new Float32Array(m * nt - 1) }); } catch (e) { if (isBoldsweepError(e)) code = e.code; }
    expect(code).toBe('INVALID_ARGUMENT');
    code = '';
    try { estimateSmoothness(new Float32Array(m * nt + 1), run.dims, mask, run.spacingMm, { packed: true }); } catch (e) { if (isBoldsweepError(e)) code = e.code; }
    expect(code).toBe('INVALID_ARGUMENT');
  });
});
