import type { LookResult } from '../look/look-at-run.js';
import type { VoxelRasterRows } from '../look/voxel-raster-rows.js';
import { colourTable } from './colour-map.js';
import { colourBar } from './plane-panel.js';
import { renderSvg } from './render-svg.js';
import { createRgbImage, encodeRgbPng } from './rgb-image.js';
import { LOOK_COLOURS, traceChartSpec } from './look-charts.js';

/** z-score shown at the ends of the raster colour map. */
export const RASTER_Z_LIMIT = 3;

/**
 * The voxel raster as a PNG: one row per voxel, one column per volume, colour = the row's z-score
 * on the diverging map clipped at +-3 (one pixel per cell; scale it when showing it).
 * @param rows - from voxelRasterRows
 * @returns PNG bytes, rows.nt pixels wide and rows.rows tall
 * @example writeFileSync('raster.png', voxelRasterPng(voxelRasterRows(run.volume, look.mask.mask)))
 */
export function voxelRasterPng(rows: VoxelRasterRows): Uint8Array {
  const img = createRgbImage(rows.nt, rows.rows, [0, 0, 0]);
  const table = colourTable('diverging');
  for (let r = 0; r < rows.rows; r++) for (let t = 0; t < rows.nt; t++) {
    const z = rows.values[r * rows.nt + t];
    const i = Math.max(0, Math.min(255, Math.round(((z + RASTER_Z_LIMIT) / (2 * RASTER_Z_LIMIT)) * 255)));
    const o = 3 * (r * rows.nt + t);
    img.data[o] = table[3 * i]; img.data[o + 1] = table[3 * i + 1]; img.data[o + 2] = table[3 * i + 2];
  }
  return encodeRgbPng(img);
}

/**
 * The voxel raster figure as one SVG: the global mean and standardised DVARS traces (vega-lite) on
 * top, the raster below on the same volume axis, row groups labelled on the left, censored volumes
 * marked over the raster, dropped volumes shaded, and a colour bar for the z-scores.
 * @param look - the look
 * @param rows - raster rows from voxelRasterRows
 * @param options - width of the plot area in pixels (default 640), rasterHeight (default 360)
 * @returns SVG markup
 * @example tslab.display.html(await voxelRasterSvg(look, voxelRasterRows(run.volume, look.mask.mask)))
 */
export async function voxelRasterSvg(look: LookResult, rows: VoxelRasterRows, options: { width?: number; rasterHeight?: number } = {}): Promise<string> {
  const width = options.width ?? 640, left = 80, rasterH = options.rasterHeight ?? 360;
  const charts = await Promise.all([
    renderSvg(traceChartSpec(look.series.globalMean, look, 'Global mean signal in the mask', 'signal units', { width, paddingLeft: left })),
    renderSvg(traceChartSpec(look.series.dvarsStandardised, look, 'Standardised DVARS', 'DVARS / null', { width, paddingLeft: left })),
  ]);
  const heights = charts.map((s) => Number(/height="([\d.]+)"/.exec(s)?.[1] ?? 140));
  const totalW = width + left + 20;
  let y = 30;
  const parts: string[] = [];
  parts.push(`<text x="8" y="18" font-family="sans-serif" font-size="14" font-weight="bold">Voxel raster: ${rows.rows} voxel time courses (rows, z-scored per row) under the per-volume traces</text>`);
  for (let i = 0; i < charts.length; i++) {
    parts.push(charts[i].replace(/^<svg /, `<svg x="0" y="${y}" `));
    y += heights[i];
  }
  const rasterTop = y + 4;
  const png = Buffer.from(voxelRasterPng(rows)).toString('base64');
  parts.push(`<image x="${left}" y="${rasterTop}" width="${width}" height="${rasterH}" preserveAspectRatio="none" style="image-rendering:pixelated" href="data:image/png;base64,${png}"/>`);
  const colW = width / rows.nt;
  const drop = look.recommendation.dropInitialVolumes;
  if (drop > 0) parts.push(`<rect x="${left}" y="${rasterTop - 4}" width="${(drop * colW).toFixed(2)}" height="4" fill="${LOOK_COLOURS.dropped}"/>`);
  for (const t of look.recommendation.censorVolumes) {
    parts.push(`<rect x="${(left + t * colW).toFixed(2)}" y="${rasterTop - 4}" width="${Math.max(1, colW).toFixed(2)}" height="4" fill="${LOOK_COLOURS.censored}"/>`);
  }
  for (const g of rows.groups) {
    const gy = rasterTop + (g.start / rows.rows) * rasterH, gh = (g.count / rows.rows) * rasterH;
    parts.push(`<line x1="${left - 4}" x2="${left + width}" y1="${gy.toFixed(1)}" y2="${gy.toFixed(1)}" stroke="white" stroke-width="1"/>`);
    parts.push(`<text x="${left - 6}" y="${(gy + gh / 2 + 4).toFixed(1)}" text-anchor="end" font-family="sans-serif" font-size="10">${g.label}</text>`);
  }
  parts.push(`<text x="${left}" y="${rasterTop + rasterH + 14}" font-family="sans-serif" font-size="10">volume (columns line up with the traces above); top bar: grey = dropped start, coloured = volumes to censor</text>`);
  const bar = Buffer.from(encodeRgbPng(colourBar(220, { min: -RASTER_Z_LIMIT, max: RASTER_Z_LIMIT, colourMap: 'diverging' }, 'Z-SCORE PER ROW'))).toString('base64');
  parts.push(`<image x="${left}" y="${rasterTop + rasterH + 22}" width="220" height="36" href="data:image/png;base64,${bar}"/>`);
  const totalH = rasterTop + rasterH + 64;
  return `<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" width="${totalW}" height="${totalH}" viewBox="0 0 ${totalW} ${totalH}"><rect width="${totalW}" height="${totalH}" fill="white"/>${parts.join('')}</svg>`;
}
