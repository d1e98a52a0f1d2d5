import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { parameterTradeoff } from '../../src/decide/parameter-tradeoff.js';
import type { Scorecard, ScorecardRow } from '../../src/sweep/scorecard.js';

// A hand-made scorecard: kernel x voxel size, two repeats each; means worked out by hand below.
function card(): Scorecard {
  const rows: ScorecardRow[] = [];
  const hit: Record<string, number[]> = { 'nearest/2': [0.5, 0.7], 'linear/2': [0.8, 0.6], 'nearest/4': [0.4, 0.4], 'linear/4': [0.3, 0.3] };
  const blur: Record<string, number[]> = { 'nearest/2': [6, 6.2], 'linear/2': [7, 7.2], 'nearest/4': [9, 9], 'linear/4': [8, 8.4] };
  let cell = 0;
  for (const size of [2, 4]) for (const kernel of ['nearest', 'linear']) for (const repeat of [0, 1]) {
    const k = `${kernel}/${size}`;
    rows.push({ cell: cell++, group: repeat, settingIndex: 0, 'resample.voxelSizeMm': size, 'resample.kernel': kernel, plantSizeMm: 8, plantAmplitudePct: 1, repeat, hitRate: hit[k][repeat], smoothnessFwhmMm: blur[k][repeat] });
  }
  return { sweepKey: 'k', varied: ['resample.voxelSizeMm', 'resample.kernel'], metrics: ['hitRate', 'smoothnessFwhmMm'], rows, seconds: rows.map(() => 1) };
}

describe('parameterTradeoff', () => {
  it('names the value that detects best and the one that blurs least at each setting of the others, with numbers', () => {
    const groups = parameterTradeoff(card(), 'resample.kernel');
    expect(groups.map((g) => g.others)).toEqual([{ 'resample.voxelSizeMm': 2 }, { 'resample.voxelSizeMm': 4 }]);
    // 2 mm: hit rate nearest 0.6, linear 0.7; smoothness nearest 6.1, linear 7.1
    expect(groups[0].detectsBest.value).toBe('linear');
    expect(groups[0].detectsBest.detection.mean).toBeCloseTo(0.7, 12);
    expect(groups[0].blursLeast.value).toBe('nearest');
    expect(groups[0].blursLeast.blur.mean).toBeCloseTo(6.1, 12);
    // SE of [0.8, 0.6]: sd 0.1414..., / sqrt(2) = 0.1
    expect(groups[0].detectsBest.detection.se).toBeCloseTo(0.1, 12);
    // 4 mm: nearest detects best (0.4 against 0.3), linear blurs least (8.2 against 9)
    expect(groups[1].detectsBest.value).toBe('nearest');
    expect(groups[1].blursLeast.value).toBe('linear');
    expect(groups[0].text).toContain('linear detects best and nearest blurs least');
    expect(groups[0].text).toContain('0.700 (SE 0.100)');
    expect(groups[0].text).toContain('nearest 6.10');
  });

  it('says the values do not differ when every value gives the same means (nothing resampled), instead of naming a best one', () => {
    // at the run's own voxel size (3.5 mm here) the resample step copies the data: every kernel's cell
    // is the same, so every kernel has the same mean hit rate and smoothness
    const rows: ScorecardRow[] = [];
    let cell = 0;
    for (const size of [2, 3.5]) for (const kernel of ['nearest', 'linear', 'cubic']) for (const repeat of [0, 1]) {
      const differs = size === 2 ? { nearest: 0.1, linear: 0, cubic: -0.1 }[kernel]! : 0;
      rows.push({ cell: cell++, group: repeat, settingIndex: 0, 'resample.voxelSizeMm': size, 'resample.kernel': kernel, plantSizeMm: 8, plantAmplitudePct: 1, repeat, hitRate: 0.5 + 0.2 * repeat + differs, smoothnessFwhmMm: 6 + repeat + (size === 2 ? 0 : 1) });
    }
    const groups = parameterTradeoff({ sweepKey: 'k', varied: ['resample.voxelSizeMm', 'resample.kernel'], metrics: ['hitRate', 'smoothnessFwhmMm'], rows, seconds: rows.map(() => 1) }, 'resample.kernel');
    expect(groups).toHaveLength(2);
    // 3.5 mm: all equal
    expect(groups[1].same).toEqual({ detection: true, blur: true });
    expect(groups[1].text).not.toMatch(/detects best|blurs least/);
    expect(groups[1].text).toContain('none differs from the others');
    expect(groups[1].text).toContain('0.600 (SE 0.100) and residual smoothness FWHM (mm) 7.50');
    expect(groups[1].text).toContain("resampling at the run's own voxel size");
    // 2 mm: the hit rates differ (nearest 0.7, linear 0.6, cubic 0.5), the smoothness does not
    expect(groups[0].same).toEqual({ detection: false, blur: true });
    expect(groups[0].detectsBest.value).toBe('nearest');
    expect(groups[0].text).toContain('nearest detects best and none blurs less than the others');
    // the first test's card: nothing equal, the sentence as before
    expect(parameterTradeoff(card(), 'resample.kernel')[0].same).toEqual({ detection: false, blur: false });
  });

  it('refuses a key that is not varied or a metric that is not a column', () => {
    const code = (f: () => unknown) => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : String(e); } return undefined; };
    expect(code(() => parameterTradeoff(card(), 'smooth.fwhmMm'))).toBe('INVALID_ARGUMENT');
    expect(code(() => parameterTradeoff(card(), 'resample.kernel', { metric: 'dice' }))).toBe('INVALID_ARGUMENT');
  });
});
