import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { histogramOf, otsuFromHistogram, otsuThreshold } from '../../src/look/otsu-threshold.js';
import { isBoldsweepError } from '../../src/core/errors.js';

// Fixture: test/reference/make_otsu_fixture.py, an independent numpy implementation written from
// Otsu N (1979) IEEE Trans Syst Man Cybern 9(1):62-66 (eq. 18), cross-checked there against
// scikit-image's threshold_otsu (Debian python3-skimage 0.19).
const fixture = JSON.parse(readFileSync(new URL('../reference/otsu_fixture.json', import.meta.url), 'utf8'));

describe('Otsu threshold', () => {
  for (const [name, c] of Object.entries<any>(fixture.cases)) {
    it(`matches the numpy reference on '${name}'`, () => {
      const values = Float32Array.from(c.values as number[]);
      const { counts, edges } = histogramOf(values, fixture.bins);
      expect(Array.from(counts)).toEqual(c.counts);
      // edges: same formula as numpy.histogram; differences only in the last bits of a double
      edges.forEach((e, i) => expect(Math.abs(e - c.edges[i])).toBeLessThan(1e-9 * Math.max(1, Math.abs(c.edges[i]))));
      const r = otsuThreshold(values, fixture.bins);
      expect(r.binIndex).toBe(c.binIndex);
      expect(Math.abs(r.betweenClassVariance / c.betweenClassVariance - 1)).toBeLessThan(1e-9); // summation order only
      expect(Math.abs(r.separability - c.separability)).toBeLessThan(1e-9);
      if (c.skimageThreshold !== undefined) expect(Math.abs(r.binCentre - c.skimageThreshold)).toBeLessThan(1e-9 * Math.max(1, Math.abs(c.skimageThreshold)));
    });
  }

  it('splits the small hand-checkable histogram after bin 1', () => {
    const r = otsuFromHistogram(fixture.small.counts, fixture.small.edges);
    expect(r.binIndex).toBe(fixture.small.binIndex);
    expect(r.betweenClassVariance).toBeCloseTo(fixture.small.betweenClassVariance, 12);
    expect(r.threshold).toBe(2);
  });

  it('refuses an image with one value (no threshold exists) with a typed error', () => {
    try {
      otsuThreshold(new Float32Array(100).fill(5));
      expect.unreachable();
    } catch (e) {
      expect(isBoldsweepError(e, 'CONSTANT_DATA')).toBe(true);
    }
  });
});
