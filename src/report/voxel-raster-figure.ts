import type { LookResult } from '../look/look-at-run.js';
import type { VoxelRasterRows } from '../look/voxel-raster-rows.js';
import { colourTable } from './colour-map.js';
import { svgColourBar, svgDocument, svgImage, svgText } from './figure-svg.js';
import { formatValue } from './plane-panel.js';
import { createRgbImage, encodeRgbPng, type RgbImage } from './rgb-image.js';
import { LOOK_COLOURS } from './look-charts.js';

/** z-score shown at the ends of the raster colour map. */
export const RASTER_Z_LIMIT = 3;

/**
 * The voxel raster as an image: one row per voxel, one column per volume, colour = the row's z-score
 * on the diverging map clipped at +-3 (one pixel per cell; scale it when showing it).
 * @param rows - from voxelRasterRows
 * @returns the image, rows.nt pixels wide and rows.rows tall
 * @example encodeRgbPng(voxelRasterImage(voxelRasterRows(run.volume, look.mask.mask)))
 */
export function voxelRasterImage(rows: VoxelRasterRows): RgbImage {
  const img = createRgbImage(rows.nt, rows.rows, [0, 0, 0]);
  const table = colourTable('diverging');
  for (let r = 0; r < rows.rows; r++) for (let t = 0; t < rows.nt; t++) {
    const z = rows.values[r * rows.nt + t];
    const i = Math.max(0, Math.min(255, Math.round(((z + RASTER_Z_LIMIT) / (2 * RASTER_Z_LIMIT)) * 255)));
    const o = 3 * (r * rows.nt + t);
    img.data[o] = table[3 * i]; img.data[o + 1] = table[3 * i + 1]; img.data[o + 2] = table[3 * i + 2];
  }
  return img;
}

/**
 * The voxel raster as PNG bytes (see {@link voxelRasterImage}).
 * @param rows - from voxelRasterRows
 * @returns PNG bytes
 * @example writeFileSync('raster.png', voxelRasterPng(rows))
 */
export function voxelRasterPng(rows: VoxelRasterRows): Uint8Array {
  return encodeRgbPng(voxelRasterImage(rows));
}

/**
 * The voxel raster figure as one SVG, our own layout: every sampled voxel's time course (rows, z-scored
 * per row) ordered by depth below the mask surface, with a millimetre depth axis on the left (the band
 * outside the mask at the top, above the 0 mm line); fused to the raster's top edge, two thin strips
 * on the same volume columns: standardised DVARS (1 = the null level) and the global mean. Dropped
 * volumes are shaded, volumes to censor ticked across the strips; the time axis is in volumes with
 * seconds as a second label row. All text is vector text.
 * @param look - the look
 * @param rows - raster rows from voxelRasterRows
 * @param options - width of the raster in pixels (default 640), rasterHeight (default 380)
 * @returns SVG markup
 * @example tslab.display.html(await voxelRasterSvg(look, voxelRasterRows(run.volume, look.mask.mask)))
 */
export async function voxelRasterSvg(look: LookResult, rows: VoxelRasterRows, options: { width?: number; rasterHeight?: number } = {}): Promise<string> {
  const W = options.width ?? 640, H = options.rasterHeight ?? 380;
  const left = 96, top = 44, stripH = 34;
  const nt = rows.nt, colW = W / nt;
  const xOf = (t: number) => left + (t + 0.5) * colW;
  const parts: string[] = [
    svgText(12, 18, `Voxel raster: ${rows.rows} voxel time courses by depth below the brain-mask surface`, { size: 15, weight: 'bold' }),
    svgText(12, 34, 'rows z-scored each; thin strips above share the volume columns', { size: 11, fill: '#555' }),
  ];
  const drop = look.recommendation.dropInitialVolumes;
  const strips: Array<{ label: string; values: ArrayLike<number>; unit: string }> = [
    { label: 'DVARS / null', values: look.series.dvarsStandardised, unit: '' },
    { label: 'global mean', values: look.series.globalMean, unit: '' },
  ];
  let y = top;
  for (const s of strips) {
    const vals = Array.from(s.values).slice(drop).filter(Number.isFinite);
    const lo = Math.min(...vals), hi = Math.max(...vals);
    const span = hi > lo ? hi - lo : 1;
    parts.push(`<rect x="${left}" y="${y}" width="${W}" height="${stripH}" fill="#f7f7f7"/>`);
    if (drop > 0) parts.push(`<rect x="${left}" y="${y}" width="${(drop * colW).toFixed(1)}" height="${stripH}" fill="${LOOK_COLOURS.dropped}" fill-opacity="0.6"/>`);
    const pts: string[] = [];
    for (let t = drop; t < nt; t++) {
      const v = s.values[t];
      if (!Number.isFinite(v)) continue;
      const yy = y + stripH - 3 - ((Math.min(Math.max(v, lo), hi) - lo) / span) * (stripH - 6);
      pts.push(`${xOf(t).toFixed(1)},${yy.toFixed(1)}`);
    }
    parts.push(`<polyline points="${pts.join(' ')}" fill="none" stroke="${LOOK_COLOURS.trace}" stroke-width="1"/>`);
    parts.push(svgText(left - 6, y + stripH / 2 + 1, s.label, { size: 10, anchor: 'end' }));
    parts.push(svgText(left - 6, y + stripH / 2 + 12, `${formatValue(lo)}-${formatValue(hi)}`, { size: 9, anchor: 'end', fill: '#666' }));
    y += stripH;
  }
  for (const t of look.recommendation.censorVolumes) {
    parts.push(`<rect x="${(left + t * colW).toFixed(1)}" y="${top}" width="${Math.max(1.5, colW).toFixed(1)}" height="${y - top}" fill="${LOOK_COLOURS.censored}" fill-opacity="0.55"/>`);
  }
  const rasterTop = y;
  parts.push(svgImage(voxelRasterImage(rows), left, rasterTop, W, H));
  // depth axis: ticks where the rows' depth crosses round millimetre values
  const rowOf = (d: number) => { let r = 0; while (r < rows.rows && rows.depthMm[r] < d) r++; return r; };
  const maxD = rows.rows ? rows.depthMm[rows.rows - 1] : 0, minD = rows.rows ? rows.depthMm[0] : 0;
  const step = maxD > 40 ? 10 : 5;
  const ticks = [0];
  for (let d = step; d <= maxD; d += step) ticks.push(d);
  for (let d = -5; d >= minD; d -= 5) ticks.push(d);
  for (const d of ticks.sort((a, b) => a - b)) {
    const r = rowOf(d);
    if (r >= rows.rows) continue;
    const ty = rasterTop + (r / rows.rows) * H;
    parts.push(`<line x1="${left - 4}" x2="${left}" y1="${ty.toFixed(1)}" y2="${ty.toFixed(1)}" stroke="#333"/>`);
    parts.push(svgText(left - 6, ty + 4, `${d} mm`, { size: 10, anchor: 'end' }));
    if (d === 0) {
      parts.push(`<line x1="${left}" x2="${left + W}" y1="${ty.toFixed(1)}" y2="${ty.toFixed(1)}" stroke="black" stroke-width="1" stroke-dasharray="4 3"/>`);
      if (r > 0) parts.push(svgText(left + W + 4, rasterTop + (r / rows.rows) * H / 2 + 4, 'outside', { size: 9, fill: '#555' }));
      parts.push(svgText(left + W + 4, ty + 12, 'inside', { size: 9, fill: '#555' }));
    }
  }
  parts.push(`<text transform="translate(16 ${(rasterTop + H / 2).toFixed(1)}) rotate(-90)" text-anchor="middle" font-family="'DejaVu Sans', Helvetica, Arial, sans-serif" font-size="11">depth below the mask surface</text>`);
  // time axis: volumes, seconds under them
  const bottom = rasterTop + H;
  const vStep = nt > 200 ? 50 : nt > 80 ? 20 : 10;
  for (let t = 0; t < nt; t += vStep) {
    parts.push(`<line x1="${xOf(t).toFixed(1)}" x2="${xOf(t).toFixed(1)}" y1="${bottom}" y2="${bottom + 4}" stroke="#333"/>`);
    parts.push(svgText(xOf(t), bottom + 15, String(t), { size: 10, anchor: 'middle' }));
    if (look.trSec > 0) parts.push(svgText(xOf(t), bottom + 27, `${Math.round(t * look.trSec)} s`, { size: 9, anchor: 'middle', fill: '#666' }));
  }
  parts.push(svgText(left + W / 2, bottom + 42, `volume${look.trSec > 0 ? ` (seconds below, TR ${look.trSec} s)` : ''}; grey: dropped start; coloured columns: volumes to censor`, { size: 11, anchor: 'middle' }));
  parts.push(svgColourBar(left, bottom + 52, 220, { min: -RASTER_Z_LIMIT, max: RASTER_Z_LIMIT, colourMap: 'diverging' }, 'z-score within each row'));
  return svgDocument(left + W + 48, bottom + 100, parts);
}
