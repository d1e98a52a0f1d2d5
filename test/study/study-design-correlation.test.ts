import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/random.js';
import { parseSweepSpec } from '../../src/sweep/parse-sweep-spec.js';
import { studyDesignCorrelation } from '../../src/sweep/study-design-correlation.js';
import { buildDesign } from '../../src/model/design.js';
import { designPseudoInverse } from '../../src/model/design-matrix.js';
import { randomBlockEvents } from '../../src/sweep/random-block-events.js';

const spec = parseSweepSpec({
  recipe: [{ step: 'smooth', params: { fwhmMm: 0 } }], plant: { sizesFwhmMm: [6], amplitudesPct: [1], count: 1 }, repeats: 1,
  threshold: { kind: 'fwe-rft' }, model: { ar1: false, highpassCutoffSec: 128 }, study: { subjects: 5 }, seed: 1,
});

describe('correlation of the noise projections of subjects who share a run', () => {
  it('the same design twice correlates 1; subjects on different runs form no pair', () => {
    const same = studyDesignCorrelation(spec, 1, 200, 2, [[7, 7]]);
    expect(same.pairs).toBe(1);
    // identical projector rows: 1 up to rounding
    expect(Math.abs(same.mean - 1)).toBeLessThan(1e-12);
    expect(studyDesignCorrelation(spec, 2, 200, 2, [[7, 8]]).pairs).toBe(0);
  });
  it('matches the correlation of the two subjects\' OLS effect estimates over 4000 white-noise series (Monte Carlo)', () => {
    // Var(c'y) = sigma^2 |c|^2 for white noise (common practice, no source): the sample correlation of
    // the estimates over many noise draws converges to c_i.c_j / (|c_i||c_j|)
    const nt = 200, tr = 2;
    const r = studyDesignCorrelation(spec, 1, nt, tr, [[21, 22]]);
    const rows = [21, 22].map((seed) => {
      const x = buildDesign(randomBlockEvents(seed, nt * tr, { onSec: 20, offMinSec: 10, offMaxSec: 40, trialType: 'task' }), { nt, trSec: tr, drift: { kind: 'dct', cutoffSec: 128 } });
      return designPseudoInverse(x).pinv.subarray(0, nt);
    });
    const rng = createRng(3);
    const y = new Float64Array(nt);
    let sa = 0, sb = 0, sab = 0, saa = 0, sbb = 0;
    const draws = 4000;
    for (let k = 0; k < draws; k++) {
      rng.fillNormal(y);
      let a = 0, b = 0;
      for (let t = 0; t < nt; t++) { a += rows[0][t] * y[t]; b += rows[1][t] * y[t]; }
      sa += a; sb += b; sab += a * b; saa += a * a; sbb += b * b;
    }
    const cov = sab / draws - (sa / draws) * (sb / draws);
    const mc = cov / Math.sqrt((saa / draws - (sa / draws) ** 2) * (sbb / draws - (sb / draws) ** 2));
    // the sample correlation's SD is about (1 - r^2) / sqrt(n) < 0.016 at n = 4000: 4 SD
    expect(Math.abs(mc - r.mean)).toBeLessThan(0.064);
    expect(Math.abs(r.mean)).toBeLessThan(1);
  });
});
