import type { Volume } from '../core/volume.js';
import { displayAxes, extractPlane } from './display-planes.js';
import { svgColourBar, svgDocument, svgImage, svgText } from './figure-svg.js';
import { autoRange, renderPlane, svgEdgeLabels, type MapLook } from './plane-panel.js';
import { MASK_OUTLINE_RGB, type MapFigureOptions } from './three-plane-svg.js';

/**
 * A grid of axial sections of a 3D map (every `step`-th slice, inferior first) as an SVG figure:
 * sections as embedded images, each labelled with its slice index (vector text), the first with the
 * orientation letters, a title, and a colour bar with the unit. With a mask, voxels outside it are
 * background (or shown, `outside: 'show'`) and its outline is drawn.
 * @param map - a 3D map (first volume used)
 * @param options - title, unit, colour map, range, mask; step (default: enough to show at most 20
 *   slices); columns (default 6); slices: an explicit list of slice indices instead of a step
 * @returns SVG markup
 * @example sliceGridSvg(look.maps.tsnr, { title: 'tSNR', unit: 'tSNR, dimensionless', mask: look.mask.mask })
 */
export function sliceGridSvg(map: Volume, options: MapFigureOptions & { step?: number; columns?: number; slices?: number[] }): string {
  const [nx, ny, nz] = map.dims;
  const values = map.data.subarray(0, nx * ny * nz);
  const look: MapLook = options.min !== undefined && options.max !== undefined
    ? { min: options.min, max: options.max, colourMap: options.colourMap ?? 'viridis' }
    : autoRange(values, options.colourMap ?? 'viridis', options.outside === 'show' ? undefined : options.mask);
  const ppm = options.pixelsPerMm ?? 1;
  // which voxel axis is the axial normal depends on the affine, not on storage order
  const normalAxis = displayAxes(map.affine).axisOf[2];
  const count = map.dims[normalAxis];
  const step = options.step ?? Math.max(1, Math.ceil(count / 20));
  const slices = options.slices ?? Array.from({ length: Math.ceil(count / step) }, (_, i) => i * step);
  const cols = Math.min(options.columns ?? 6, slices.length);
  const panels = slices.map((s) => {
    const p: [number, number, number] = [0, 0, 0]; p[normalAxis] = s;
    const plane = extractPlane(values, map.dims, map.spacingMm, map.affine, 'axial', p);
    const maskPlane = options.mask ? extractPlane(options.mask, map.dims, map.spacingMm, map.affine, 'axial', p).values : undefined;
    const img = renderPlane(plane, look, { pixelsPerMm: ppm, maskPlane, hideOutside: options.outside !== 'show', outline: maskPlane && options.outline !== false ? MASK_OUTLINE_RGB : undefined });
    return { img, plane, slice: s };
  });
  const pw = panels[0].img.width, ph = panels[0].img.height;
  const gap = 6, margin = 12, titleH = 30, labelH = 15;
  const rows = Math.ceil(panels.length / cols);
  const width = Math.max(margin * 2 + cols * pw + (cols - 1) * gap, 320);
  const parts: string[] = [svgText(margin, 20, options.title, { size: 15, weight: 'bold' })];
  panels.forEach(({ img, plane, slice }, i) => {
    const x = margin + (i % cols) * (pw + gap), y = titleH + Math.floor(i / cols) * (ph + labelH + gap);
    parts.push(svgImage(img, x, y));
    if (i === 0) parts.push(svgEdgeLabels(plane, x, y, pw, ph, 10));
    parts.push(svgText(x, y + ph + 12, `slice ${slice}`, { size: 10, fill: '#444' }));
  });
  const barY = titleH + rows * (ph + labelH + gap) + 4;
  const barW = Math.min(260, width - 2 * margin);
  parts.push(svgColourBar(margin, barY, barW, look, options.unit));
  if (options.mask && options.outline !== false) {
    const [r, g, b] = MASK_OUTLINE_RGB;
    parts.push(`<rect x="${margin + barW + 24}" y="${barY + 2}" width="18" height="8" fill="none" stroke="rgb(${r},${g},${b})" stroke-width="2"/>`);
    parts.push(svgText(margin + barW + 48, barY + 10, options.outlineLabel ?? 'brain mask outline', { size: 11, fill: '#444' }));
  }
  return svgDocument(width, barY + 50, parts);
}
