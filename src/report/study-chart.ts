import type { TopLevelSpec } from 'vega-lite';
import type { StudyOptima } from '../decide/study-optima.js';
import { axisTitle, metricLabel, parameterLabel } from './chart-labels.js';
import { CHART_CONFIG, CHART_HEIGHT, CHART_WIDTH } from './chart-style.js';
import { COLOUR_TABLES_HEX } from './colour-tables.js';

/**
 * Detection against the smoothing width for each misregistration level of a study (the group map,
 * one colour per level, viridis), with the single-run curve (the first subject's own run) dashed in
 * grey; each curve's optimum is marked by a point on a bar spanning its 95 % bootstrap interval,
 * drawn under the plot at the curve's colour.
 * @param optima - a study's optima (studyOptima)
 * @returns a vega-lite spec with inline data (render with renderSvg)
 * @example const svg = await renderSvg(studyWidthChart(studyOptima(card)!))
 */
export function studyWidthChart(optima: StudyOptima): TopLevelSpec {
  const single = 'single run';
  const label = (m: number) => `group, ${m} mm misregistration`;
  const curves = [
    ...optima.widths.map((w, i) => ({ width: w, value: optima.singleRun.curve[i], series: single, order: -1 })),
    ...optima.levels.flatMap((l, li) => optima.widths.map((w, i) => ({ width: w, value: l.curve[i], series: label(l.levelMm), order: li }))),
  ].filter((p) => Number.isFinite(p.value));
  const optimaRows = [
    { series: single, order: -1, value: optima.singleRun.optimum.value, low: optima.singleRun.optimum.low, high: optima.singleRun.optimum.high, y: -0.04 },
    ...optima.levels.map((l, li) => ({ series: label(l.levelMm), order: li, value: l.optimum.value, low: l.optimum.low, high: l.optimum.high, y: -0.08 - 0.04 * li })),
  ].filter((r) => Number.isFinite(r.value));
  const names = [single, ...optima.levels.map((l) => label(l.levelMm))];
  // grey for the single run, viridis for the levels (ordered by misregistration)
  const colours = ['#777777', ...optima.levels.map((_, i) => viridisAt(optima.levels.length === 1 ? 0.3 : 0.05 + (0.75 * i) / (optima.levels.length - 1)))];
  const color = { field: 'series', type: 'nominal' as const, title: null, sort: names, scale: { domain: names, range: colours }, legend: { labelLimit: 260 } };
  const x = { field: 'width', type: 'quantitative' as const, title: parameterLabel(optima.key), scale: { zero: false } };
  const rate = /Rate$/.test(optima.metric);
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v5.json',
    width: CHART_WIDTH, height: CHART_HEIGHT,
    title: {
      text: `Best width for one run and for the group, by misregistration`,
      subtitle: [`${metricLabel(optima.metric)}; mean of ${optima.repeats} repeats; planted ${optima.plantSizeMm} mm at ${optima.plantAmplitudePct} %`, 'bars under the curves: each optimum with its 95 % bootstrap interval'],
    },
    layer: [
      {
        data: { values: curves },
        mark: { type: 'line', point: { filled: true, size: 36 }, strokeWidth: 2 },
        encoding: {
          x, y: { field: 'value', type: 'quantitative', title: axisTitle(metricLabel(optima.metric)), ...(rate ? { scale: { domain: [-0.04 * (optima.levels.length + 2), 1] } } : {}) },
          color, strokeDash: { condition: { test: `datum.series === '${single}'`, value: [5, 3] }, value: [1, 0] },
          tooltip: [{ field: 'series' }, { field: 'width' }, { field: 'value', format: '.3f' }],
        },
      },
      ...(rate ? [
        { data: { values: optimaRows }, mark: { type: 'rule', strokeWidth: 2 }, encoding: { x: { field: 'low', type: 'quantitative' }, x2: { field: 'high' }, y: { field: 'y', type: 'quantitative' }, color } },
        { data: { values: optimaRows }, mark: { type: 'point', filled: true, size: 50, shape: 'diamond' }, encoding: { x: { field: 'value', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' }, color, tooltip: [{ field: 'series' }, { field: 'value', format: '.1f', title: 'optimum' }, { field: 'low', format: '.1f' }, { field: 'high', format: '.1f' }] } },
      ] : []),
    ],
    config: CHART_CONFIG,
  } as unknown as TopLevelSpec;
}

/** The entry of the published viridis table (colour-tables.ts) nearest to t in [0, 1], as '#rrggbb'. */
function viridisAt(t: number): string {
  const k = Math.round(Math.min(1, Math.max(0, t)) * 255);
  return `#${COLOUR_TABLES_HEX.viridis.slice(6 * k, 6 * k + 6)}`;
}
