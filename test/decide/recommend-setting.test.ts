import { describe, expect, it } from 'vitest';
import { recommendSetting } from '../../src/decide/recommend-setting.js';
import type { Scorecard, ScorecardRow } from '../../src/sweep/scorecard.js';

/** A scorecard with given hit rates per setting (rows = repeats), one plant condition per size. */
function card(values: Record<number, Record<number, number[]>>): Scorecard {
  const rows: ScorecardRow[] = [];
  let cell = 0;
  for (const [size, bySetting] of Object.entries(values)) {
    Object.entries(bySetting).forEach(([fwhm, hits], s) => {
      hits.forEach((h, r) => rows.push({
        cell: cell++, group: r, settingIndex: s, 'smooth.fwhmMm': Number(fwhm),
        plantShape: 'gaussian', plantSizeMm: Number(size), plantAmplitudePct: 1, plantCount: 4, repeat: r, plantSeed: r,
        hitRate: h, falseClusters: 0,
      }));
    });
  }
  return { sweepKey: 'k', varied: ['smooth.fwhmMm'], metrics: ['hitRate', 'falseClusters'], rows, seconds: rows.map(() => 1) };
}

describe('one-standard-error rule (Breiman et al. 1984; Hastie, Tibshirani & Friedman 2009 sec. 7.10)', () => {
  it('takes the smallest setting whose mean is within one SE of the best, worked by hand', () => {
    // means: 0 mm 0.30; 4 mm 0.60; 8 mm 0.70 (best); 12 mm 0.66
    // SE of the best: values 0.6, 0.7, 0.8 -> sd 0.1, se 0.1/sqrt(3) = 0.057735; cutoff 0.642265
    // 4 mm (0.60) is below the cutoff, 12 mm (0.66) above: the smallest qualifying width is 8 mm
    const c = card({ 8: { 0: [0.3, 0.3, 0.3], 4: [0.6, 0.6, 0.6], 8: [0.6, 0.7, 0.8], 12: [0.66, 0.66, 0.66] } });
    const rec = recommendSetting(c);
    expect(rec.choice.best.setting['smooth.fwhmMm']).toBe(8);
    expect(rec.choice.cutoff).toBeCloseTo(0.7 - 0.1 / Math.sqrt(3), 12);
    expect(rec.choice.chosen.setting['smooth.fwhmMm']).toBe(8);
    expect(rec.choice.evidence.map((e) => e.withinOneSe)).toEqual([false, false, true, true]);
    // 'largest' prefers the other end among the qualifying settings
    expect(recommendSetting(c, { prefer: 'largest' }).choice.chosen.setting['smooth.fwhmMm']).toBe(12);
  });

  it('chooses a smaller width when it is within noise of the best', () => {
    // best 8 mm mean 0.70 with SE 0.1 (values 0.5, 0.7, 0.9: sd 0.2, se 0.11547); 4 mm at 0.62 qualifies
    const c = card({ 8: { 0: [0.2, 0.2, 0.2], 4: [0.62, 0.62, 0.62], 8: [0.5, 0.7, 0.9] } });
    const rec = recommendSetting(c);
    expect(rec.choice.chosen.setting['smooth.fwhmMm']).toBe(4);
    expect(rec.summary).toContain('Use smoothing FWHM 4 mm');
    expect(rec.rule).toContain('one standard error');
    expect(rec.caveats.some((x) => x.includes('Eklund'))).toBe(true);
  });

  it('makes one choice per planted size and picks the median size as the target', () => {
    const c = card({
      6: { 0: [0.2, 0.3], 4: [0.8, 0.82], 8: [0.7, 0.72] },
      8: { 0: [0.1, 0.1], 4: [0.5, 0.52], 8: [0.8, 0.81] },
      12: { 0: [0.05, 0.05], 4: [0.3, 0.3], 8: [0.6, 0.62] },
    });
    const rec = recommendSetting(c);
    expect(rec.perPlant.map((p) => [p.plantSizeMm, p.chosen.setting['smooth.fwhmMm']])).toEqual([[6, 4], [8, 8], [12, 8]]);
    expect(rec.choice.plantSizeMm).toBe(8);
    expect(recommendSetting(c, { targetSizeMm: 6 }).choice.chosen.setting['smooth.fwhmMm']).toBe(4);
  });

  it('refuses a metric that is not in the scorecard', () => {
    expect(() => recommendSetting(card({ 8: { 0: [0.1] } }), { metric: 'colour' })).toThrow(/not a scorecard column/);
  });
});
