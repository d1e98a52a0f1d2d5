import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { nelderMead } from '../../src/register/nelder-mead.js';
import { normalisedCorrelation } from '../../src/register/normalised-correlation.js';
import { normalisedMutualInformation } from '../../src/register/normalised-mutual-information.js';
import { parzenJointHistogram } from '../../src/register/parzen-joint-histogram.js';
import { solveLinearSystem } from '../../src/register/solve-linear-system.js';

// numpy on the same pair with the same binning: test/reference/make_similarity_fixture.py
const fx = JSON.parse(readFileSync(new URL('../reference/similarity_fixture.json', import.meta.url), 'utf8')) as {
  fixed: number[]; moving: number[]; weights: number[]; correlation: number; correlationWeighted: number;
  cases: { bins: number; weighted: boolean; fixedRange: [number, number]; movingRange: [number, number]; nmiBox: number; nmiParzen: number }[];
};
const fixed = Float32Array.from(fx.fixed);
const moving = Float32Array.from(fx.moving);
const weights = Float32Array.from(fx.weights);

describe('costs against numpy (make_similarity_fixture.py)', () => {
  it('normalised correlation, plain and weighted', () => {
    // 3000 float32 samples summed in double: agreement to 1e-12 is rounding
    expect(normalisedCorrelation(fixed, moving, null)).toBeCloseTo(fx.correlation, 12);
    expect(normalisedCorrelation(fixed, moving, weights)).toBeCloseTo(fx.correlationWeighted, 12);
  });
  it.each(fx.cases.map((c) => [c.bins, c.weighted, c] as const))('normalised mutual information (Studholme et al. 1999), %i bins, weighted %s', (bins, weighted, c) => {
    const w = weighted ? weights : null;
    // box bins = numpy.histogram2d; cubic B-spline Parzen window (Mattes et al. 2003) written out in numpy;
    // entropies of B^2 bins in double: 1e-10 is rounding
    expect(normalisedMutualInformation(fixed, moving, w, { bins, fixedRange: c.fixedRange, movingRange: c.movingRange, window: 'box' })).toBeCloseTo(c.nmiBox, 10);
    expect(normalisedMutualInformation(fixed, moving, w, { bins, fixedRange: c.fixedRange, movingRange: c.movingRange, window: 'cubic-bspline' })).toBeCloseTo(c.nmiParzen, 10);
  });
  it('the Parzen window spreads each sample\'s whole weight (the cubic B-spline is a partition of unity)', () => {
    const h = parzenJointHistogram(fixed, moving, weights, { bins: 32, fixedRange: fx.cases[0].fixedRange, movingRange: fx.cases[0].movingRange });
    const total = h.reduce((a, b) => a + b, 0);
    const w = weights.reduce((a, b) => a + b, 0);
    expect(total).toBeCloseTo(w, 6);
  });
  it('identical images: correlation 1 and NMI 2 (box bins); bad input is a typed error', () => {
    expect(normalisedCorrelation(fixed, fixed, null)).toBeCloseTo(1, 12);
    expect(normalisedMutualInformation(fixed, fixed, null, { bins: 16, fixedRange: fx.cases[0].fixedRange, movingRange: fx.cases[0].fixedRange, window: 'box' })).toBeCloseTo(2, 12);
    expect(() => normalisedCorrelation(fixed, moving.subarray(1), null)).toThrow(expect.objectContaining({ code: 'INVALID_ARGUMENT' }));
    expect(() => normalisedCorrelation(new Float32Array(10).fill(3), moving.subarray(0, 10), null)).toThrow(expect.objectContaining({ code: 'CONSTANT_DATA' }));
    expect(() => parzenJointHistogram(fixed, moving, null, { bins: 4, fixedRange: [0, 1], movingRange: [0, 1] })).toThrow(expect.objectContaining({ code: 'INVALID_ARGUMENT' }));
  });
});

describe('optimiser and solver', () => {
  it('nelderMead finds the minimum of the Rosenbrock function (1, 1) and reports the iteration cap', () => {
    // Rosenbrock (1960, Comput J 3:175-184): minimum 0 at (1, 1), a curved valley
    const rosen = (x: Float64Array) => 100 * (x[1] - x[0] ** 2) ** 2 + (1 - x[0]) ** 2;
    const r = nelderMead(rosen, [-1.2, 1], { step: 0.5, xTolerance: 1e-8, maxIterations: 5000 });
    expect(r.converged).toBe(true);
    // xTolerance 1e-8 on the simplex: the point is within 1e-6 of the minimum
    expect(r.x[0]).toBeCloseTo(1, 6);
    expect(r.x[1]).toBeCloseTo(1, 6);
    expect(nelderMead(rosen, [-1.2, 1], { maxIterations: 10 }).converged).toBe(false);
  });
  it('solveLinearSystem solves a pivoting case and refuses a singular matrix', () => {
    const x = solveLinearSystem([0, 2, 1, 1], [4, 3]) as Float64Array;
    expect(Array.from(x)).toEqual([1, 2]);
    expect(solveLinearSystem([1, 2, 2, 4], [1, 2])).toBeNull();
  });
});
