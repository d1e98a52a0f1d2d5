import type { Volume } from '../core/volume.js';
import { drawText, textWidth } from './bitmap-font.js';
import { displayAxes, extractPlane } from './display-planes.js';
import { autoRange, colourBar, labelEdges, renderPlane, type MapLook } from './plane-panel.js';
import { blit, createRgbImage, encodeRgbPng } from './rgb-image.js';
import type { MapFigureOptions } from './three-plane-png.js';

/**
 * A grid of axial sections of a 3D map (every `step`-th slice, inferior first), each labelled with
 * its slice index, the first marked with L/R, under a title and above a colour bar with the unit.
 * @param map - a 3D map (first volume used)
 * @param options - title, unit, colour map, range; step (default: enough to show at most 20 slices);
 *   columns (default 6); slices: an explicit list of slice indices (k) instead of a step
 * @returns PNG bytes
 * @example sliceGridPng(look.maps.mean, { title: 'Mean signal over time', unit: 'signal units', colourMap: 'grey' })
 */
export function sliceGridPng(map: Volume, options: MapFigureOptions & { step?: number; columns?: number; slices?: number[] }): Uint8Array {
  const [nx, ny, nz] = map.dims;
  const values = map.data.subarray(0, nx * ny * nz);
  const look: MapLook = options.min !== undefined && options.max !== undefined
    ? { min: options.min, max: options.max, colourMap: options.colourMap ?? 'viridis' }
    : autoRange(values, options.colourMap ?? 'viridis', options.mask);
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
    return { img: renderPlane(plane, look, ppm), plane, slice: s };
  });
  const pw = panels[0].img.width, ph = panels[0].img.height;
  const gap = 4, margin = 10, titleH = 24, labelH = 10;
  const rows = Math.ceil(panels.length / cols);
  const width = Math.max(margin * 2 + cols * pw + (cols - 1) * gap, textWidth(options.title, 2) + 2 * margin);
  const figure = createRgbImage(width, titleH + rows * (ph + labelH + gap) + 44, [255, 255, 255]);
  drawText(figure, margin, 6, options.title, [0, 0, 0], 2);
  panels.forEach(({ img, plane, slice }, i) => {
    if (i === 0) labelEdges(img, plane, 1);
    const x = margin + (i % cols) * (pw + gap), y = titleH + Math.floor(i / cols) * (ph + labelH + gap);
    blit(figure, img, x, y);
    drawText(figure, x, y + ph + 2, `slice ${slice}`, [60, 60, 60], 1);
  });
  blit(figure, colourBar(Math.min(300, width - 2 * margin), look, options.unit), margin, titleH + rows * (ph + labelH + gap) + 4);
  return encodeRgbPng(figure);
}
