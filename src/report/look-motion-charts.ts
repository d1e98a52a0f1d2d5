import type { TopLevelSpec } from 'vega-lite';
import type { LookResult } from '../look/look-at-run.js';
import { mapHex } from './colour-map.js';
import { FIGURE_FONT } from './figure-svg.js';
import { LOOK_COLOURS, traceChartSpec, volumeAxis } from './look-charts.js';

/** One colour per axis (x/i, y/j, z/k), from our published maps, the same in every motion chart. */
const AXIS_COLOURS = [mapHex('viridis', 0.15), mapHex('magma', 0.6), mapHex('viridis', 0.75)];

type LookForMotion = Pick<LookResult, 'recommendation' | 'trSec' | 'motion' | 'dims'>;

/** The shared parts of a per-volume chart with one line per axis. */
function axisLines(rows: Array<{ volume: number; value: number | null; axis: string }>, look: LookForMotion, title: string, yTitle: string, width: number, height: number, legendTitle: string, extra: unknown[] = []): Record<string, unknown> {
  const nt = look.dims[3];
  const drop = look.recommendation.dropInitialVolumes;
  const x = { field: 'volume', type: 'quantitative' as const, ...volumeAxis(look.trSec), scale: { domain: [-0.5, nt - 0.5], nice: false, zero: false } };
  const names = [...new Set(rows.map((r) => r.axis))];
  return {
    title: { text: title, anchor: 'start', fontSize: 12 },
    width, height,
    layer: [
      ...(drop > 0 ? [{ data: { values: [{ from: -0.5, to: drop - 0.5 }] }, mark: { type: 'rect', color: LOOK_COLOURS.dropped, opacity: 0.5 }, encoding: { x: { ...x, field: 'from' }, x2: { field: 'to' } } }] : []),
      ...extra,
      {
        data: { values: rows }, mark: { type: 'line', strokeWidth: 1 },
        encoding: {
          x, y: { field: 'value', type: 'quantitative', title: yTitle },
          color: { field: 'axis', type: 'nominal', title: legendTitle, sort: names, scale: { domain: names, range: AXIS_COLOURS }, legend: { orient: 'right' } },
        },
      },
    ],
  };
}

/**
 * The motion table against volume: shifts (mm) in one panel, rotations (degrees) in the other, one
 * line per axis, dropped volumes shaded; the time axis of every per-volume chart.
 * @param look - a look with a motion table (look.motion.table)
 * @param options - width of each panel (default 640)
 * @returns a vega-lite vconcat spec
 * @throws Error when the look has no motion table
 * @example await renderSvg(motionTableSpec(look))
 */
export function motionTableSpec(look: LookForMotion, options: { width?: number } = {}): TopLevelSpec {
  const table = look.motion.table;
  if (!table) throw new Error('motionTableSpec needs a look with a motion table');
  const width = options.width ?? 640;
  const shifts = table.flatMap((r, t) => [['x', r.shiftXMm], ['y', r.shiftYMm], ['z', r.shiftZMm]].map(([axis, value]) => ({ volume: t, value: value as number, axis: axis as string })));
  const turns = table.flatMap((r, t) => [['about x', r.rotXDeg], ['about y', r.rotYDeg], ['about z', r.rotZDeg]].map(([axis, value]) => ({ volume: t, value: value as number, axis: axis as string })));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v5.json',
    config: { font: FIGURE_FONT },
    title: { text: `Motion table (${look.motion.source === 'estimated' ? 'estimated: ' : ''}${look.motion.method}): the head's position relative to its reference`, anchor: 'start' },
    vconcat: [
      axisLines(shifts, look, 'Shifts', 'shift, mm', width, 110, 'shift along'),
      axisLines(turns, look, 'Rotations', 'rotation, degrees', width, 110, 'rotation'),
    ],
    resolve: { scale: { color: 'independent' } },
  } as unknown as TopLevelSpec;
}

/**
 * Framewise displacement against volume (Power et al. 2012: shifts plus rotations as arc length on a
 * 50 mm sphere), with the threshold as a dashed line and the volumes above it marked.
 * @param look - a look with a motion table
 * @param options - width (default 640)
 * @returns a vega-lite spec
 * @throws Error when the look has no framewise displacement
 * @example await renderSvg(fdTraceSpec(look))
 */
export function fdTraceSpec(look: LookForMotion, options: { width?: number } = {}): TopLevelSpec {
  const fd = look.motion.fdMm;
  if (!fd) throw new Error('fdTraceSpec needs a look with a motion table');
  const thr = look.motion.fdThresholdMm;
  const base = traceChartSpec(fd, look, `Framewise displacement (Power et al. 2012, 50 mm sphere); dashed: ${thr} mm`, 'FD, mm', { width: options.width ?? 640, height: 110 }) as unknown as { layer: unknown[] } & Record<string, unknown>;
  const nt = look.dims[3];
  const x = { field: 'volume', type: 'quantitative' as const, ...volumeAxis(look.trSec), scale: { domain: [-0.5, nt - 0.5], nice: false, zero: false } };
  const layer = [
    ...base.layer,
    { data: { values: [{ threshold: thr }] }, mark: { type: 'rule', color: LOOK_COLOURS.censored, strokeDash: [5, 3], strokeWidth: 1.2 }, encoding: { y: { field: 'threshold', type: 'quantitative' } } },
    ...(look.motion.aboveThreshold.length ? [{ data: { values: look.motion.aboveThreshold.map((t) => ({ volume: t, value: fd[t] })) }, mark: { type: 'point', filled: true, size: 22, color: LOOK_COLOURS.spike }, encoding: { x, y: { field: 'value', type: 'quantitative' } } }] : []),
  ];
  return { ...base, layer } as unknown as TopLevelSpec;
}

/**
 * The motion edge signature against volume, one line per voxel axis: the mean % change from the
 * volume before at the mask's edge facing + minus that facing - (see motionEdgeSignature). Motion
 * makes it swing away from 0 on the axis it moves along; a global change leaves it at 0.
 * @param look - a look (its edge signature)
 * @param options - width (default 640), title (default says "before correction")
 * @returns a vega-lite spec
 * @throws Error when the look has no edge signature
 * @example await renderSvg(edgeSignatureSpec(look))
 */
export function edgeSignatureSpec(look: LookForMotion, options: { width?: number; title?: string } = {}): TopLevelSpec {
  const sig = look.motion.edgeSignature;
  if (!sig) throw new Error('edgeSignatureSpec needs a look with an edge signature');
  const names = ['i', 'j', 'k'];
  const rows = sig.axes.flatMap((a, ax) => Array.from(a, (value, t) => ({ volume: t, value: Number.isFinite(value) ? value : null, axis: `${names[ax]} (RMS ${sig.rmsPct[ax].toFixed(2)} %)` })));
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v5.json',
    config: { font: FIGURE_FONT },
    ...axisLines(rows, look, options.title ?? 'Motion edge signature, before correction: change at the + edge minus the - edge of the brain mask, per voxel axis', '% change, + edge minus - edge', options.width ?? 640, 130, 'voxel axis'),
  } as unknown as TopLevelSpec;
}
