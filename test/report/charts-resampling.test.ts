import { describe, expect, it } from 'vitest';
import { repeatedResamplingChart } from '../../src/report/charts-resampling.js';
import { renderSvg } from '../../src/report/render-svg.js';
import type { RepeatedResamplingResult } from '../../src/resample/repeated-resampling.js';

const study: RepeatedResamplingResult = {
  rows: [
    { kernel: 'linear', route: 'chain', resamplings: 36, correlation: 0.9924, fwhmMm: 20, addedFwhmMm: 4.35, highFrequencyLost: 0.372 },
    { kernel: 'linear', route: 'one-step', resamplings: 1, correlation: 0.999, fwhmMm: 19, addedFwhmMm: 1.8, highFrequencyLost: 0.163 },
    { kernel: 'cubic', route: 'chain', resamplings: 36, correlation: 0.999, fwhmMm: 18, addedFwhmMm: 0.51, highFrequencyLost: 0.043 },
    { kernel: 'cubic', route: 'one-step', resamplings: 1, correlation: 0.9998, fwhmMm: 18, addedFwhmMm: 0, highFrequencyLost: 0.042 },
  ],
  totalDeg: 9, steps: 36, axis: 'z', mode: 'nearest', returnKernel: 'cubic', regionVoxels: 1000,
  originalFwhmMm: 18, referenceFwhmMm: 18, originalHighFrequencyFraction: 0.1, referenceNoiseFwhmMm: 3.6,
};

describe('repeated-resampling charts', () => {
  for (const measure of ['correlation', 'addedFwhmMm', 'highFrequencyLost'] as const) {
    it(`${measure}: one bar per kernel and route, titled, rendered to SVG`, async () => {
      const spec = repeatedResamplingChart(study, measure);
      expect((spec as { data: { values: unknown[] } }).data.values).toHaveLength(4);
      const svg = await renderSvg(spec);
      expect(svg).toContain('<svg');
      expect(svg).toContain('36 steps of 0.25 deg');
      expect(svg).toContain('one step of 9 deg');
      expect(svg).toContain('cubic');
    });
  }
});
