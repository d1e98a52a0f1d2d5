import type { TopLevelSpec } from 'vega-lite';
import type { RepeatedResamplingResult } from '../resample/repeated-resampling.js';
import { CHART_CONFIG, CHART_HEIGHT, CHART_WIDTH, SETTING_SCHEME } from './chart-style.js';

/** Which measure of the repeated-resampling study a chart shows. */
export type ResamplingMeasure = 'correlation' | 'addedFwhmMm' | 'highFrequencyLost';

const MEASURE_TEXT: Record<ResamplingMeasure, { title: string; axis: string; note: string }> = {
  correlation: { title: 'Correlation with the original', axis: 'correlation (Pearson)', note: 'higher is better; after one return resampling, inside the region that stays in view' },
  addedFwhmMm: { title: 'Smoothness added by resampling', axis: 'added FWHM (mm)', note: 'the same route on white noise, FWHM over the return-only reference in quadrature; lower is better' },
  highFrequencyLost: { title: 'High-frequency energy lost', axis: 'share of energy above half Nyquist lost', note: 'separable DFT inside the region; lower is better' },
};

/**
 * Bar chart of one measure of the repeated-resampling study: one group per kernel, one bar for the
 * chain of resamplings and one for the single concatenated resampling.
 * @param study - the result of repeatedResampling
 * @param measure - correlation, addedFwhmMm or highFrequencyLost
 * @returns a vega-lite spec
 * @example await renderSvg(repeatedResamplingChart(study, 'addedFwhmMm'))
 */
export function repeatedResamplingChart(study: RepeatedResamplingResult, measure: ResamplingMeasure): TopLevelSpec {
  const text = MEASURE_TEXT[measure];
  const route = (r: string) => (r === 'chain' ? `${study.steps} steps of ${(study.totalDeg / study.steps).toFixed(2)} deg` : `one step of ${study.totalDeg} deg`);
  const values = study.rows.map((r) => ({ kernel: r.kernel, route: route(r.route), value: r[measure] }));
  const kernels = [...new Set(study.rows.map((r) => r.kernel))];
  const correlations = study.rows.map((r) => r.correlation);
  const yScale = measure === 'correlation' ? { zero: false, domain: [Math.min(...correlations) - 0.002, 1] } : { zero: true };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v5.json',
    title: { text: `${text.title}: ${study.totalDeg} deg about ${study.axis}`, subtitle: text.note },
    width: CHART_WIDTH,
    height: CHART_HEIGHT,
    config: CHART_CONFIG,
    data: { values },
    mark: { type: 'bar', clip: true },
    encoding: {
      x: { field: 'kernel', type: 'nominal', sort: kernels, title: 'interpolation kernel', axis: { labelAngle: 0 } },
      xOffset: { field: 'route', type: 'nominal' },
      y: { field: 'value', type: 'quantitative', title: text.axis, scale: yScale },
      color: { field: 'route', type: 'nominal', title: 'route', scale: { scheme: SETTING_SCHEME }, legend: { orient: 'bottom' } },
      tooltip: [{ field: 'kernel' }, { field: 'route' }, { field: 'value', format: '.4f' }],
    },
  } as TopLevelSpec;
}
