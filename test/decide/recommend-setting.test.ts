import { describe, expect, it } from 'vitest';
import { recommendSetting } from '../../src/decide/recommend-setting.js';
import type { Scorecard, ScorecardRow } from '../../src/sweep/scorecard.js';

/** A scorecard with given hit rates per setting (rows = repeats), one plant condition per size. */
function card(values: Record<number, Record<number, number[]>>, centre?: Record<number, number[]>): Scorecard {
  const rows: ScorecardRow[] = [];
  let cell = 0;
  for (const [size, bySetting] of Object.entries(values)) {
    Object.entries(bySetting).forEach(([fwhm, hits], s) => {
      hits.forEach((h, r) => rows.push({
        cell: cell++, group: r, settingIndex: s, 'smooth.fwhmMm': Number(fwhm),
        plantShape: 'gaussian', plantSizeMm: Number(size), plantAmplitudePct: 1, plantCount: 4, repeat: r, plantSeed: r,
        hitRate: h, falseClusters: 0, ...(centre ? { centreStatisticMean: centre[Number(fwhm)][r] } : {}),
      }));
    });
  }
  return { sweepKey: 'k', varied: ['smooth.fwhmMm'], metrics: centre ? ['hitRate', 'falseClusters', 'centreStatisticMean'] : ['hitRate', 'falseClusters'], rows, seconds: rows.map(() => 1) };
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

describe('the status of a choice', () => {
  it('is no-detection when the best mean is at the floor, and says what to change instead of "Use"', () => {
    // best mean 0.005 < 0.02 (2 % of the hit rate's range): nothing was found at any width
    const rec = recommendSetting(card({ 8: { 0: [0, 0, 0], 4: [0, 0.01, 0.005], 8: [0, 0, 0.01] } }));
    expect(rec.choice.status).toBe('no-detection');
    expect(rec.summary).not.toMatch(/Use /);
    expect(rec.summary).not.toMatch(/simplest/);
    expect(rec.choice.advice).toMatch(/amplitude/);
  });

  it('is saturated when two or more settings are at the ceiling, and falls back to the centre statistic', () => {
    // hit rate 1 at 8, 12 and 16 mm; the centre statistic peaks at 12 mm (the matched width): means
    // 4 mm 6.0, 8 mm 8.0, 12 mm 9.0 (SE 0.1 from 8.9, 9.0, 9.1), 16 mm 8.5. Cutoff 9.0 - 0.1 = 8.9, so
    // only 12 mm qualifies, where the one-SE rule on hit rate would take 8 mm.
    const c = card(
      { 12: { 4: [0.9, 0.8, 0.85], 8: [1, 1, 1], 12: [1, 1, 1], 16: [1, 1, 0.99] } },
      { 4: [6, 6, 6], 8: [8, 8, 8], 12: [8.9, 9.0, 9.1], 16: [8.5, 8.5, 8.5] },
    );
    const rec = recommendSetting(c);
    expect(rec.choice.status).toBe('saturated');
    expect(rec.choice.atCeiling).toHaveLength(3);
    expect(rec.choice.fallback?.to).toBe('centreStatisticMean');
    expect(rec.choice.metric).toBe('centreStatisticMean');
    expect(rec.choice.chosen.setting['smooth.fwhmMm']).toBe(12);
    expect(rec.choice.cutoff).toBeCloseTo(9.0 - 0.1 / Math.sqrt(3), 12);
    expect(rec.summary).toMatch(/statistic at the planted centres/);
    expect(rec.summary).not.toMatch(/^Use /);
  });

  it('is tied when every setting is within one SE of the best', () => {
    // best 8 mm 0.5 with SE 0.2/sqrt(3) = 0.11547 (values 0.3, 0.5, 0.7): cutoff 0.3845; all others above
    const rec = recommendSetting(card({ 8: { 0: [0.45, 0.45, 0.45], 4: [0.48, 0.48, 0.48], 8: [0.3, 0.5, 0.7] } }));
    expect(rec.choice.status).toBe('tied');
    expect(rec.choice.chosen.setting['smooth.fwhmMm']).toBe(0);
    expect(rec.choice.advice).toMatch(/repeats/);
    expect(rec.summary).not.toMatch(/^Use /);
  });

  it('is chosen when a setting separates, and says "smallest" only when the best is the smallest qualifying one', () => {
    const rec = recommendSetting(card({ 8: { 0: [0.3, 0.3, 0.3], 4: [0.6, 0.6, 0.6], 8: [0.6, 0.7, 0.8], 12: [0.66, 0.66, 0.66] } }));
    expect(rec.choice.status).toBe('chosen');
    expect(rec.summary).toMatch(/^Use smoothing FWHM 8 mm/);
    expect(rec.summary).toMatch(/the best is also the smallest of them/);
    // one repeat with no spread: no interval is printed as if it were one
    const one = recommendSetting(card({ 8: { 0: [0.2], 4: [0.7], 8: [0.5] } }));
    expect(one.summary).not.toMatch(/interval/);
    expect(one.summary).toMatch(/no other setting comes within one standard error/);
  });
});

describe('named values ranked by the steps\' simplicity order, not alphabetically', () => {
  /** A scorecard varying a named parameter (the slice-timing method), equal hit rates everywhere. */
  function namedCard(methods: string[]): Scorecard {
    const rows: ScorecardRow[] = [];
    methods.forEach((m, s) => [0.5, 0.6, 0.7].forEach((h, r) => rows.push({
      cell: rows.length, group: r, settingIndex: s, 'slice-time.method': m,
      plantShape: 'gaussian', plantSizeMm: 8, plantAmplitudePct: 1, plantCount: 4, repeat: r, plantSeed: r, hitRate: h, falseClusters: 0,
    })));
    return { sweepKey: 'k', varied: ['slice-time.method'], metrics: ['hitRate', 'falseClusters'], rows, seconds: rows.map(() => 1) };
  }
  // a step's own order (lower = simpler): the model option changes no data, linear is the plainest shift
  const order: Record<string, number> = { model: 0, linear: 1, cubic: 2, fourier: 3 };
  const simplicity = (s: Record<string, unknown>) => [order[String(s['slice-time.method'])]];

  it('a tie names the simplest method by the order the step gives', () => {
    const c = namedCard(['cubic', 'fourier', 'linear', 'model']);
    expect(recommendSetting(c).choice.chosen.setting['slice-time.method']).toBe('cubic'); // alphabetical without the order
    const rec = recommendSetting(c, { simplicity });
    expect(rec.choice.status).toBe('tied');
    expect(rec.choice.chosen.setting['slice-time.method']).toBe('model');
    expect(rec.rule).toContain('choose the simplest');
    expect(rec.summary).toContain('The simplest setting, slice-timing method model');
  });

  it('keeps the value order (and its word) when an order is missing for a setting or agrees with the values', () => {
    const c = namedCard(['cubic', 'linear', 'other']);
    const rec = recommendSetting(c, { simplicity });
    expect(rec.choice.chosen.setting['slice-time.method']).toBe('cubic');
    expect(rec.rule).toContain('choose the smallest');
    const agreeing = recommendSetting(card({ 8: { 0: [0.5, 0.6], 4: [0.5, 0.6] } }), { simplicity: (s) => [Number(s['smooth.fwhmMm'])] });
    expect(agreeing.rule).toContain('choose the smallest');
    expect(agreeing.choice.chosen.setting['smooth.fwhmMm']).toBe(0);
  });
});
