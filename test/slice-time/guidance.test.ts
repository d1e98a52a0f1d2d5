import { describe, expect, it } from 'vitest';
import { aliasedFrequencyHz } from '../../src/model/aliased-frequency.js';
import { sliceTimingGuidance } from '../../src/model/slice-timing-guidance.js';

// The sampling theorem (Shannon 1949, Proc. IRE 37:10-21): sampled every TR seconds, a sinusoid of
// f Hz gives the same samples as one of |f - k/TR| Hz for every integer k, so it shows at the one in
// [0, 1/(2 TR)].
describe('aliased frequency (sampling theorem), worked examples', () => {
  it('1.1 Hz at TR 2 s (fs 0.5 Hz) aliases to |1.1 - 2 x 0.5| = 0.1 Hz', () => {
    expect(aliasedFrequencyHz(1.1, 2)).toBeCloseTo(0.1, 12); // float64 rounding of 1.1 - 1
    // the samples themselves agree: sin(2 pi 1.1 n TR) = sin(2 pi 0.1 n TR) at every n
    for (let n = 0; n < 20; n++) expect(Math.sin(2 * Math.PI * 1.1 * n * 2)).toBeCloseTo(Math.sin(2 * Math.PI * 0.1 * n * 2), 9); // rounding of large phase arguments
  });
  it('folds the upper half of each band back: 0.4 Hz at TR 2 s shows at 0.1 Hz; below Nyquist unchanged', () => {
    expect(aliasedFrequencyHz(0.4, 2)).toBeCloseTo(0.1, 12); // 0.5 - 0.4
    expect(aliasedFrequencyHz(0.2, 2)).toBeCloseTo(0.2, 12);
    expect(aliasedFrequencyHz(1, 2)).toBe(0); // an exact multiple of fs: a constant
    expect(aliasedFrequencyHz(0.3, 0.8)).toBeCloseTo(0.3, 12); // Nyquist 0.625 Hz
    expect(aliasedFrequencyHz(1, 0.8)).toBeCloseTo(0.25, 12); // fs 1.25: 1.25 - 1
  });
});

describe('slice-timing guidance for a run\'s TR', () => {
  it('TR 2 s: shifting reasonable; cardiac (1 Hz) and respiration (0.3 Hz) both alias, named with their frequencies', () => {
    const g = sliceTimingGuidance(2);
    expect(g.longTr).toBe(false);
    expect(g.advised).toBe('shift');
    expect(g.nyquistHz).toBe(0.25);
    const cardiac = g.rhythms.find((r) => r.name === 'cardiac')!;
    const resp = g.rhythms.find((r) => r.name === 'respiration')!;
    expect(cardiac.aliases && resp.aliases).toBe(true);
    expect(cardiac.aliasedHz).toBe(0);
    expect(resp.aliasedHz).toBeCloseTo(0.2, 12); // 0.5 - 0.3
    expect(g.lines.join(' ')).toMatch(/respiration fluctuations near 0\.3 Hz appear at 0\.2 Hz/);
  });
  it('TR 4 s and above: shifting advised against, the model-based alternative offered', () => {
    for (const tr of [4, 6]) {
      const g = sliceTimingGuidance(tr);
      expect(g.longTr).toBe(true);
      expect(g.advised).toBe('model');
      expect(g.lines[0]).toMatch(/advised against/);
      expect(g.lines[0]).toMatch(/method 'model'/);
    }
    expect(sliceTimingGuidance(3.9).advised).toBe('shift');
  });
  it('a fast TR (0.4 s, Nyquist 1.25 Hz) samples both rhythms without aliasing', () => {
    const g = sliceTimingGuidance(0.4);
    expect(g.rhythms.every((r) => !r.aliases)).toBe(true);
    expect(g.rhythms.map((r) => r.aliasedHz)).toEqual([1, 0.3]);
    expect(g.lines[1]).toMatch(/without aliasing/);
  });
});
