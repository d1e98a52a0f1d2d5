import type { TopLevelSpec } from 'vega-lite';
import type { TheoryBesideSimulation } from '../decide/theory-beside-simulation.js';
import { CHART_CONFIG, CHART_HEIGHT, CHART_WIDTH, SIZE_SCHEME } from './chart-style.js';

/**
 * The statistic at the planted centres against the smoothing width: the simulation's mean with its 95 %
 * interval (points and bars) beside the matched-filter prediction (dashed line), one colour per planted
 * condition.
 * @param theory - theoryBesideSimulation's result
 * @returns a vega-lite spec with inline data
 * @example await renderSvg(theoryChart(theory))
 */
export function theoryChart(theory: TheoryBesideSimulation): TopLevelSpec {
  const values = theory.rows.map((r) => ({
    x: r.kernelFwhmMm, plant: `${r.plantSizeMm} mm, ${r.plantAmplitudePct} %`, plantSizeMm: r.plantSizeMm,
    simulated: r.simulatedPeakT.mean, low: Number.isFinite(r.simulatedPeakT.low) ? r.simulatedPeakT.low : null, high: Number.isFinite(r.simulatedPeakT.high) ? r.simulatedPeakT.high : null,
    predicted: r.predictedPeakT,
  }));
  const x = { field: 'x', type: 'quantitative' as const, title: 'smoothing FWHM (mm)', scale: { zero: false } };
  const color = { field: 'plant', type: 'ordinal' as const, title: 'Planted', sort: { field: 'plantSizeMm' }, scale: { scheme: { name: SIZE_SCHEME, extent: [0.05, 0.8] } } };
  const yTitle = ['Statistic at planted centres', '(t; points: simulated, dashes: theory)'];
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v5.json',
    data: { values }, width: CHART_WIDTH, height: CHART_HEIGHT,
    title: { text: 'Theory beside simulation', subtitle: 'simulated mean with 95 % t-interval; dashed: matched-filter prediction from the run\'s noise level and smoothness' },
    layer: [
      { mark: { type: 'line', strokeDash: [5, 3], strokeWidth: 1.5 }, encoding: { x, y: { field: 'predicted', type: 'quantitative', title: yTitle }, color } },
      { mark: { type: 'rule', strokeWidth: 1.5 }, encoding: { x, y: { field: 'low', type: 'quantitative' }, y2: { field: 'high' }, color } },
      { mark: { type: 'point', filled: true, size: 45 }, encoding: { x, y: { field: 'simulated', type: 'quantitative' }, color } },
    ],
    config: CHART_CONFIG,
  } as TopLevelSpec;
}
