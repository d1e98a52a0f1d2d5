import type { TopLevelSpec } from 'vega-lite';
import type { CurveTable } from '../score/curve-table.js';
import type { Scorecard } from '../sweep/scorecard.js';
import { plantLabel } from './chart-data.js';
import { axisTitle, parameterLabel } from './chart-labels.js';
import { CHART_CONFIG, CHART_HEIGHT, CHART_WIDTH, SETTING_SCHEME } from './chart-style.js';
import { settingLabel } from '../sweep/settings-grid.js';
import { rowSetting } from '../sweep/scorecard.js';

/**
 * ROC curves per setting: the true-positive rate at each false-positive rate, averaged across
 * repeats (vertical averaging), one line per setting coloured along the varied parameter (cividis),
 * one panel per planted condition. The x axis is logarithmic because useful voxelwise false-positive
 * rates are small.
 * @param card - the scorecard (for each cell's setting and planting)
 * @param curves - the sweep's curve table
 * @param options - title override
 * @returns a vega-lite spec
 * @example await renderSvg(rocChart(result.scorecard, result.curves))
 */
export function rocChart(card: Scorecard, curves: CurveTable, options: { title?: string; width?: number; height?: number } = {}): TopLevelSpec {
  const byCell = new Map(card.rows.map((r) => [r.cell as number, r]));
  const acc = new Map<string, { setting: string; order: number; plant: string; size: number; sums: number[]; n: number[] }>();
  for (const row of curves.rows) {
    const r = byCell.get(row.cell);
    if (!r) continue;
    const plant = plantLabel(r.plantSizeMm as number, r.plantAmplitudePct as number);
    const setting = card.varied.length === 1 ? String(r[card.varied[0]]) : settingLabel(rowSetting(card, r));
    const key = `${plant}\u0000${r.settingIndex}`;
    let a = acc.get(key);
    if (!a) acc.set(key, (a = { setting, order: r.settingIndex as number, plant, size: r.plantSizeMm as number, sums: curves.fprGrid.map(() => 0), n: curves.fprGrid.map(() => 0) }));
    row.tpr.forEach((t, i) => { if (Number.isFinite(t)) { a!.sums[i] += t; a!.n[i]++; } });
  }
  const values: object[] = [];
  for (const a of acc.values()) {
    curves.fprGrid.forEach((f, i) => { if (a.n[i] > 0) values.push({ fpr: f, tpr: a.sums[i] / a.n[i], setting: a.setting, order: a.order, plant: a.plant, size: a.size, parity: `${a.order % 2}` }); });
  }
  const legend = card.varied.length === 1 ? parameterLabel(card.varied[0]) : 'setting';
  const panel = {
    width: options.width ?? CHART_WIDTH, height: options.height ?? CHART_HEIGHT,
    mark: { type: 'line', point: { size: 18 }, strokeWidth: 1.6 },
    encoding: {
      x: { field: 'fpr', type: 'quantitative', scale: { type: 'log' }, title: 'False-positive rate (fraction of non-planted voxels, log scale)' },
      y: { field: 'tpr', type: 'quantitative', scale: { domain: [0, 1] }, title: axisTitle('True-positive rate (fraction of planted voxels)') },
      color: { field: 'setting', type: 'ordinal', sort: { field: 'order' }, title: legend, scale: { scheme: { name: SETTING_SCHEME, extent: [0, 0.85] } } },
      // neighbouring settings sit close on a sequential scale: alternate solid and dashed lines as well
      strokeDash: { field: 'parity', type: 'nominal', legend: null, scale: { domain: ['0', '1'], range: [[1, 0], [5, 3]] } },
      detail: { field: 'setting' },
      tooltip: [{ field: 'setting', title: legend }, { field: 'fpr', format: '.4f' }, { field: 'tpr', format: '.3f' }],
    },
  };
  const title = { text: options.title ?? 'ROC curves per setting (voxelwise, averaged across repeats)', subtitle: 'threshold-free: every threshold of the statistic map; higher and further left is better' };
  const plants = new Set(values.map((v) => (v as { plant: string }).plant));
  const spec = plants.size > 1
    ? { data: { values }, facet: { column: { field: 'plant', type: 'ordinal', sort: { field: 'size' }, title: 'Planted' } }, spec: panel, title, config: CHART_CONFIG }
    : { data: { values }, ...panel, title, config: CHART_CONFIG };
  return { $schema: 'https://vega.github.io/schema/vega-lite/v5.json', ...spec } as TopLevelSpec;
}
