import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/random.js';
import { rocArea } from '../../src/score/roc-area.js';
import { rocCurve } from '../../src/score/roc-curve.js';
import { isBoldsweepError } from '../../src/core/errors.js';

interface RocCase { name: string; positives: number[]; negatives: number[]; u: number; auc: number }
const fixture = JSON.parse(readFileSync(new URL('../reference/roc_fixture.json', import.meta.url), 'utf8')) as { cases: RocCase[] };

/** Lay out two samples as a statistic map with a truth mask (positives first). */
function asMaps(pos: number[], neg: number[]) {
  return { stat: Float64Array.from([...pos, ...neg]), truth: Uint8Array.from([...pos.map(() => 1), ...neg.map(() => 0)]) };
}

describe('rocCurve / rocArea', () => {
  // Hanley & McNeil (1982) Radiology 143:29-36: area = U / (n1 n2), U from scipy.stats.mannwhitneyu
  // (test/reference/make_roc_fixture.py). Tolerance 1e-12: both sides are sums of at most a few
  // thousand exact rationals in double precision.
  for (const c of fixture.cases) {
    it(`area equals Mann-Whitney U / (n1 n2) for '${c.name}'`, () => {
      const { stat, truth } = asMaps(c.positives, c.negatives);
      const auc = rocArea(rocCurve(stat, truth));
      expect(Math.abs(auc - c.auc), `auc ${auc} vs scipy ${c.auc}`).toBeLessThan(1e-12);
    });
  }

  it('a perfect separation has area 1 and a reversed one area 0', () => {
    // definition of the ROC curve: every positive above every negative reaches TPR 1 at FPR 0
    const { stat, truth } = asMaps([5, 6, 7], [1, 2, 3, 4]);
    expect(rocArea(rocCurve(stat, truth))).toBe(1);
    const r = asMaps([1, 2], [5, 6, 7]);
    expect(rocArea(rocCurve(r.stat, r.truth))).toBe(0);
  });

  it('identical distributions give an area near 0.5', () => {
    // two independent N(0,1) samples of 5000: the area's standard error is about
    // sqrt((n1 + n2 + 1) / (12 n1 n2)) = 0.0058 (Mann-Whitney null variance); allow 4 SE
    const rng = createRng(11);
    const pos = Array.from({ length: 5000 }, () => rng.normal());
    const neg = Array.from({ length: 5000 }, () => rng.normal());
    const { stat, truth } = asMaps(pos, neg);
    expect(Math.abs(rocArea(rocCurve(stat, truth)) - 0.5)).toBeLessThan(4 * 0.0058);
  });

  it('all-tied statistics give the chance diagonal, area exactly 0.5', () => {
    const { stat, truth } = asMaps([2, 2, 2], [2, 2]);
    const roc = rocCurve(stat, truth);
    expect(Array.from(roc.fpr)).toEqual([0, 1, 1]);
    expect(Array.from(roc.tpr)).toEqual([0, 1, 1]);
    expect(rocArea(roc)).toBe(0.5);
  });

  it('curve starts at (0,0), ends at (1,1) and never decreases', () => {
    const c = fixture.cases[1];
    const { stat, truth } = asMaps(c.positives, c.negatives);
    for (const roc of [rocCurve(stat, truth), rocCurve(stat, truth, undefined, 25), rocCurve(stat, truth, undefined, [0.5, -1, 2, 0])]) {
      const m = roc.tpr.length;
      expect([roc.tpr[0], roc.fpr[0], roc.tpr[m - 1], roc.fpr[m - 1]]).toEqual([0, 0, 1, 1]);
      for (let k = 1; k < m; k++) {
        expect(roc.tpr[k]).toBeGreaterThanOrEqual(roc.tpr[k - 1]);
        expect(roc.fpr[k]).toBeGreaterThanOrEqual(roc.fpr[k - 1]);
        expect(roc.thresholds[k]).toBeLessThan(roc.thresholds[k - 1]);
      }
    }
  });

  it('a coarse threshold grid approximates the exact area from below for a concave curve', () => {
    // trapezoids under a concave curve lie below it; with 200 thresholds the gap is small.
    // Tolerance 0.02: 200 evenly spaced thresholds over ~6 SD of range, chords between them.
    const c = fixture.cases[1];
    const { stat, truth } = asMaps(c.positives, c.negatives);
    const exact = rocArea(rocCurve(stat, truth));
    const coarse = rocArea(rocCurve(stat, truth, undefined, 200));
    expect(Math.abs(coarse - exact)).toBeLessThan(0.02);
  });

  it('counts only voxels inside the region, and NaN statistics as never detected', () => {
    const stat = [5, 6, NaN, 1, 2, 100];
    const truth = [1, 1, 1, 0, 0, 0];
    const within = [1, 1, 1, 1, 1, 0];
    const roc = rocCurve(stat, truth, within);
    expect([roc.positives, roc.negatives]).toEqual([3, 2]);
    // pairs: 5 and 6 beat both negatives (4 pairs), NaN loses to both: U = 4 of 6
    expect(rocArea(roc)).toBeCloseTo(4 / 6, 14);
  });

  it('refuses masks without positives or negatives, and mismatched lengths', () => {
    const codeOf = (f: () => unknown) => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; } return 'none'; };
    expect(codeOf(() => rocCurve([1, 2], [1, 1]))).toBe('INVALID_ARGUMENT');
    expect(codeOf(() => rocCurve([1, 2], [1]))).toBe('INVALID_ARGUMENT');
    expect(codeOf(() => rocArea({ tpr: new Float64Array(1), fpr: new Float64Array(1) }))).toBe('INVALID_ARGUMENT');
  });
});
