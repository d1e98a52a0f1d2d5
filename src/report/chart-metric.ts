import type { TopLevelSpec } from 'vega-lite';
import type { Scorecard } from '../sweep/scorecard.js';
import { chartPoints } from './chart-data.js';
import { axisTitle, metricLabel, metricRange, parameterLabel } from './chart-labels.js';
import { CHART_CONFIG, CHART_HEIGHT, CHART_WIDTH, SIZE_SCHEME } from './chart-style.js';

/** Options of {@link metricChart}. */
export interface MetricChartOptions {
  /** Varied key on the x axis. __Default value:__ the first varied key */
  x?: string;
  /** Chart title. __Default value:__ "<metric> vs <parameter>" */
  title?: string;
  /** Subtitle line(s). */
  subtitle?: string | string[];
  /** x value to mark with a vertical rule (e.g. the recommended setting). */
  mark?: number | string | boolean | null;
  /** Fix the y range, e.g. [0, 1] for rates. */
  yDomain?: [number, number];
  width?: number;
  height?: number;
}

/**
 * A chart of one scorecard metric against any varied parameter: the mean across repeats as a line
 * per plant condition (viridis colours), its 95 % interval as a shaded band and error bars. Other
 * varied parameters become side-by-side panels.
 * @param card - the scorecard
 * @param metric - the metric column
 * @param options - axis, title, highlighted value
 * @returns a vega-lite spec with inline data (render with renderSvg)
 * @example const svg = await renderSvg(metricChart(card, 'hitRate', { mark: 8 }))
 */
export function metricChart(card: Scorecard, metric: string, options: MetricChartOptions = {}): TopLevelSpec {
  const key = options.x ?? card.varied[0];
  // intervals are drawn cut at the metric's possible range and at a fixed y range (a rate's
  // t-interval can pass 1, a count's can pass 0)
  const [rlo, rhi] = metricRange(metric);
  const lo = Math.max(rlo, options.yDomain ? options.yDomain[0] : -Infinity);
  const hi = Math.min(rhi, options.yDomain ? options.yDomain[1] : Infinity);
  const cut = (v: number | null) => (v === null ? v : Math.min(hi, Math.max(lo, v)));
  const points = chartPoints(card, metric, key).map((p) => ({ ...p, low: cut(p.low), high: cut(p.high) }));
  const numeric = points.every((p) => typeof p.x === 'number');
  const xTitle = key ? parameterLabel(key) : 'recipe';
  const x = numeric
    ? { field: 'x', type: 'quantitative' as const, title: xTitle, scale: { zero: false } }
    : { field: 'x', type: 'ordinal' as const, title: xTitle, sort: { field: 'order' } };
  // a flat metric (say no false alarm anywhere) would leave an axis with a single tick: give it a unit range
  const ys = points.flatMap((p) => [p.mean, p.low, p.high]).filter((v): v is number => typeof v === 'number' && Number.isFinite(v));
  const flat = !options.yDomain && ys.length > 0 && Math.max(...ys) - Math.min(...ys) < 1e-9;
  const flatLow = flat ? Math.max(lo, ys[0] - 0.5) : 0;
  const yDomain: [number, number] | undefined = options.yDomain ?? (flat ? [flatLow, flatLow + 1] : undefined);
  const y = { field: 'mean', type: 'quantitative' as const, title: axisTitle(metricLabel(metric)), ...(yDomain ? { scale: { domain: yDomain } } : {}) };
  const color = { field: 'plant', type: 'ordinal' as const, title: 'Planted', sort: { field: 'plantSizeMm' }, scale: { scheme: { name: SIZE_SCHEME, extent: [0.05, 0.8] } } };
  const layers: object[] = [];
  if (numeric) layers.push({ mark: { type: 'area', opacity: 0.15, clip: true }, encoding: { x, y: { field: 'low', type: 'quantitative' }, y2: { field: 'high' }, color } });
  layers.push({ mark: { type: 'rule', strokeWidth: 1.5, clip: true }, encoding: { x, y: { field: 'low', type: 'quantitative', title: axisTitle(metricLabel(metric)) }, y2: { field: 'high' }, color } });
  layers.push({
    mark: { type: 'line', point: { filled: true, size: 40 }, strokeWidth: 2 },
    encoding: {
      x, y, color,
      tooltip: [{ field: 'x', title: xTitle }, { field: 'plant', title: 'planted' }, { field: 'mean', format: '.3f' }, { field: 'low', format: '.3f' }, { field: 'high', format: '.3f' }, { field: 'n', title: 'repeats' }],
    },
  });
  if (options.mark !== undefined) {
    layers.push({ data: { values: [{ x: options.mark, label: 'recommended' }] }, mark: { type: 'rule', strokeDash: [4, 3], color: '#333' }, encoding: { x: { field: 'x', type: x.type } } });
    layers.push({ data: { values: [{ x: options.mark, label: 'recommended' }] }, mark: { type: 'text', align: 'right', dx: -4, dy: 4, baseline: 'top', color: '#333', fontSize: 10 }, encoding: { x: { field: 'x', type: x.type }, y: { value: 0 }, text: { field: 'label' } } });
  }
  const title = { text: options.title ?? `${metricLabel(metric).replace(/ \(.*\)$/, '')} vs ${xTitle}`, ...(options.subtitle ? { subtitle: options.subtitle } : { subtitle: 'mean across repeats; bars and band: 95 % t-interval' }) };
  const panel = { width: options.width ?? CHART_WIDTH, height: options.height ?? CHART_HEIGHT, layer: layers };
  const faceted = points.some((p) => p.others !== '');
  const spec = faceted
    ? { data: { values: points }, facet: { column: { field: 'others', type: 'nominal', title: null } }, spec: panel, title, config: CHART_CONFIG }
    : { data: { values: points }, ...panel, title, config: CHART_CONFIG };
  return { $schema: 'https://vega.github.io/schema/vega-lite/v5.json', ...spec } as TopLevelSpec;
}
