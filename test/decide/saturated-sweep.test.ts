import { describe, expect, it } from 'vitest';
import { recommendSetting } from '../../src/decide/recommend-setting.js';
import { runSweep } from '../../src/sweep/runner.js';
import { gaussianNullRun } from '../sweep/sweep-test-runs.js';

/*
 * Detection at its ceiling: 12 mm Gaussian blobs at 4 % in nearly white noise (1 % per volume, 1 mm FWHM on
 * 3 mm voxels, 100 volumes) are found whole at every kernel width, so the hit rate cannot rank the widths.
 * The statistic at the blob centres still can, and by the matched-filter principle (Rosenfeld A & Kak AC 1982,
 * Digital Picture Processing, 2nd ed., ch. 9) it peaks where the kernel matches the blob: the choice must say
 * 'saturated', fall back to that statistic and land at the blob width, not at the widest kernel.
 */
describe('a sweep at the ceiling of detection', () => {
  it('is saturated, falls back to the centre statistic and chooses the matched width', async () => {
    const run = gaussianNullRun({ fwhmMm: 1, seed: 5 });
    const result = await runSweep({ volume: run.volume, events: null, sidecar: null }, {
      recipe: [{ step: 'smooth', params: { fwhmMm: 0 } }],
      vary: { 'smooth.fwhmMm': [4, 8, 12, 16, 20] },
      plant: { sizesFwhmMm: [12], amplitudesPct: [4], count: 2 },
      repeats: 4, threshold: { kind: 'fwe-rft' }, model: { ar1: false },
      events: { kind: 'random-blocks', onSec: 20, offMinSec: 10, offMaxSec: 40 }, seed: 12,
    }, { workers: 2, brainMask: run.mask });
    const rec = recommendSetting(result.scorecard);
    const c = rec.choice;
    console.log(c.evidence.map((e) => `${e.label}: centre t ${e.detection.mean.toFixed(2)} (SE ${e.detection.se.toFixed(2)})`).join('; '), '| at ceiling:', c.atCeiling.join(', '));
    expect(c.status).toBe('saturated');
    expect(c.fallback?.to).toBe('centreStatisticMean');
    expect(c.best.setting['smooth.fwhmMm']).toBe(12);
    expect(c.chosen.setting['smooth.fwhmMm']).toBe(12);
    expect(rec.summary).not.toMatch(/^Use /);
  }, 300_000);
});
