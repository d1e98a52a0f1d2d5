import type { TopLevelSpec } from 'vega-lite';
import type { Volume } from '../core/volume.js';
import { voxelsPerVolume } from '../core/volume.js';
import type { LookResult } from '../look/look-at-run.js';
import { mapHex } from './colour-map.js';
import { FIGURE_FONT } from './figure-svg.js';

/** Colours shared by the look charts, taken from our published maps so charts match the images. */
export const LOOK_COLOURS = {
  trace: mapHex('cividis', 0.15),
  censored: mapHex('magma', 0.62),
  dropped: '#bdbdbd',
  spike: mapHex('magma', 0.85),
} as const;

/** Options shared by the per-volume trace charts. */
export interface TraceChartOptions {
  /** Plot width in pixels (default 640). */
  width?: number;
  /** Plot height in pixels (default 80). */
  height?: number;
  /** Left padding in pixels, fixed so the plot lines up with a raster below (default 80). */
  paddingLeft?: number;
}

/**
 * One per-volume trace as a single-view vega-lite chart with a fixed frame (autosize none), so
 * several can be stacked and aligned with a voxel raster: x is the volume index with domain
 * [-0.5, nt - 0.5] (volume t centred on column t), censored volumes are marked with rules and
 * dropped volumes shaded.
 * @param values - one value per volume (NaN allowed)
 * @param look - the look (for dropped and censored volumes)
 * @param title - what the trace shows
 * @param yTitle - y-axis title with unit
 * @param options - frame size
 * @returns a vega-lite spec
 * @example await renderSvg(traceChartSpec(look.series.dvarsStandardised, look, 'DVARS / null level', 'ratio'))
 */
export function traceChartSpec(values: ArrayLike<number>, look: Pick<LookResult, 'recommendation' | 'trSec'>, title: string, yTitle: string, options: TraceChartOptions = {}): TopLevelSpec {
  const nt = values.length;
  const width = options.width ?? 640, height = options.height ?? 80, left = options.paddingLeft ?? 80;
  const rows = Array.from({ length: nt }, (_, t) => ({ volume: t, value: Number.isFinite(values[t]) ? values[t] : null }));
  const drop = look.recommendation.dropInitialVolumes;
  const x = { field: 'volume', type: 'quantitative' as const, ...volumeAxis(look.trSec), scale: { domain: [-0.5, nt - 0.5], nice: false, zero: false } };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v5.json',
    config: { font: FIGURE_FONT },
    title: { text: title, anchor: 'start', fontSize: 12 },
    width, height, autosize: { type: 'none' }, padding: { left, right: 20, top: 34, bottom: 34 },
    layer: [
      ...(drop > 0 ? [{ data: { values: [{ from: -0.5, to: drop - 0.5 }] }, mark: { type: 'rect' as const, color: LOOK_COLOURS.dropped, opacity: 0.5 }, encoding: { x: { ...x, field: 'from'}, x2: { field: 'to' } } }] : []),
      ...(look.recommendation.censorVolumes.length ? [{ data: { values: look.recommendation.censorVolumes.map((v) => ({ volume: v })) }, mark: { type: 'rule' as const, color: LOOK_COLOURS.censored, strokeWidth: 1.5 }, encoding: { x } }] : []),
      { data: { values: rows }, mark: { type: 'line' as const, color: LOOK_COLOURS.trace, strokeWidth: 1 }, encoding: { x, y: { field: 'value', type: 'quantitative' as const, title: yTitle, scale: { zero: false } } } },
    ],
  } as unknown as TopLevelSpec;
}

/**
 * The look's per-volume traces stacked: global mean (signal units), standardised DVARS (1 = null
 * level) and DVARS in % of the global mean, dropped volumes shaded, censored volumes marked.
 * @param look - the look
 * @param options - width (default 640)
 * @returns a vega-lite vconcat spec
 * @example tslab.display.html(await renderSvg(lookTracesSpec(look)))
 */
export function lookTracesSpec(look: LookResult, options: { width?: number } = {}): TopLevelSpec {
  const width = options.width ?? 640;
  const part = (values: ArrayLike<number>, title: string, yTitle: string) => {
    const s = traceChartSpec(values, look, title, yTitle, { width }) as unknown as Record<string, unknown>;
    const { $schema: _s, autosize: _a, padding: _p, config: _c, ...rest } = s;
    return rest;
  };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v5.json',
    config: { font: FIGURE_FONT },
    title: { text: 'Per-volume traces in the brain mask (grey: dropped start; marks: volumes to censor)', anchor: 'start' },
    vconcat: [
      part(look.series.globalMean, 'Global mean signal', 'signal units'),
      part(look.series.dvarsStandardised, 'Standardised DVARS (Afyouni & Nichols 2018)', 'DVARS / null level'),
      part(look.series.dvarsPercent, 'DVARS (Power et al. 2012)', '% of global mean'),
    ],
  } as unknown as TopLevelSpec;
}

/**
 * Time courses of chosen voxels as a vega-lite line chart, in % signal change from each voxel's
 * mean over the kept volumes, x in volumes with seconds on a second axis above (like every per-volume
 * figure), censored volumes marked and dropped ones shaded; the legend sits below, never cut off.
 * @param run - the run
 * @param look - its look
 * @param voxels - voxels as (i, j, k) with a label each
 * @param options - width (default 640), height (default 220)
 * @returns a vega-lite spec
 * @example voxelTimeCourseSpec(run.volume, look, [{ ijk: [30, 22, 17], label: 'spike voxel' }])
 */
export function voxelTimeCourseSpec(run: Volume, look: Pick<LookResult, 'recommendation' | 'trSec'>, voxels: Array<{ ijk: [number, number, number]; label: string }>, options: { width?: number; height?: number } = {}): TopLevelSpec {
  const [nx, ny, , nt] = run.dims;
  const n = voxelsPerVolume(run);
  const drop = look.recommendation.dropInitialVolumes;
  const rows: Array<{ volume: number; percent: number | null; voxel: string }> = [];
  for (const { ijk, label } of voxels) {
    const v = ijk[0] + nx * (ijk[1] + ny * ijk[2]);
    let s = 0;
    for (let t = drop; t < nt; t++) s += run.data[t * n + v];
    const m = s / (nt - drop);
    const name = `${label} (${ijk.join(', ')})`;
    for (let t = 0; t < nt; t++) {
      const y = run.data[t * n + v];
      rows.push({ volume: t, percent: m !== 0 && Number.isFinite(y) ? (100 * (y - m)) / Math.abs(m) : null, voxel: name });
    }
  }
  const x = { field: 'volume', type: 'quantitative' as const, ...volumeAxis(look.trSec), scale: { domain: [-0.5, nt - 0.5], nice: false, zero: false } };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v5.json',
    config: { font: FIGURE_FONT },
    title: { text: 'Voxel time courses: % signal change from each voxel\'s mean (grey: dropped start; marks: volumes to censor)', anchor: 'start' },
    width: options.width ?? 640, height: options.height ?? 220,
    layer: [
      ...(drop > 0 ? [{ data: { values: [{ from: -0.5, to: drop - 0.5 }] }, mark: { type: 'rect' as const, color: LOOK_COLOURS.dropped, opacity: 0.5 }, encoding: { x: { ...x, field: 'from'}, x2: { field: 'to' } } }] : []),
      ...(look.recommendation.censorVolumes.length ? [{ data: { values: look.recommendation.censorVolumes.map((t) => ({ volume: t })) }, mark: { type: 'rule' as const, color: LOOK_COLOURS.censored, strokeDash: [3, 2] }, encoding: { x } }] : []),
      {
        data: { values: rows }, mark: { type: 'line' as const, strokeWidth: 1 },
        encoding: {
          x, y: { field: 'percent', type: 'quantitative' as const, title: '% signal change' },
          color: { field: 'voxel', type: 'nominal' as const, title: 'voxel (i, j, k)', legend: { orient: 'bottom', direction: 'vertical', labelLimit: 0 }, scale: { range: [mapHex('viridis', 0.1), mapHex('magma', 0.6), mapHex('viridis', 0.6), mapHex('cividis', 0.9)] } },
        },
      },
    ],
  } as unknown as TopLevelSpec;
}

/**
 * The time axis of every per-volume chart: volumes, with each label's time in seconds on a second line
 * under it (volume t at t x TR), so all per-volume figures share one axis.
 * @param trSec - repetition time (seconds line left out when unknown)
 * @returns the x encoding's title and axis
 * @example x: { field: 'volume', type: 'quantitative', ...volumeAxis(2) }
 */
export function volumeAxis(trSec: number): { title: string; axis: Record<string, unknown> } {
  if (!(trSec > 0)) return { title: 'volume', axis: { format: 'd' } };
  return { title: `volume (time in s under each, TR ${trSec} s)`, axis: { labelExpr: `[format(datum.value, 'd'), format(datum.value * ${trSec}, 'd') + ' s']`, labelLineHeight: 12 } };
}
