import type { Volume } from '../core/volume.js';
import { fail } from '../core/fail.js';
import { drawText, textWidth } from './bitmap-font.js';
import type { ColourMapName } from './colour-map.js';
import { extractPlane, type PlaneName } from './display-planes.js';
import { autoRange, colourBar, labelEdges, renderPlane, type MapLook } from './plane-panel.js';
import { blit, createRgbImage, encodeRgbPng, fillRect } from './rgb-image.js';

/** Options of {@link threePlanePng}. */
export interface MapFigureOptions {
  /** Figure title: say what the map shows. */
  title: string;
  /** Unit text under the colour bar. */
  unit: string;
  /** Colour map (default viridis). */
  colourMap?: ColourMapName;
  /** Display range (default 1st-99th percentile, inside `mask` when given). */
  min?: number;
  max?: number;
  /** Voxels that set the automatic range. */
  mask?: ArrayLike<number>;
  /** Display scale (default 1.5 pixels per mm). */
  pixelsPerMm?: number;
}

/**
 * Three sections (sagittal, coronal, axial) of a 3D map through one voxel, with the subject's
 * left/right, anterior/posterior and superior/inferior marked from the affine, a small cross at the
 * point, a title and a colour bar with the unit. Returns PNG bytes.
 * @param map - a 3D map (first volume used)
 * @param point - voxel (i, j, k) to cut through (default the grid centre)
 * @param options - title, unit, colour map and range
 * @returns PNG bytes
 * @example await writeFileAtomic('tsnr-planes.png', threePlanePng(look.maps.tsnr, [32, 30, 18], { title: 'tSNR', unit: 'mean / SD' }))
 */
export function threePlanePng(map: Volume, point: readonly [number, number, number] | undefined, options: MapFigureOptions): Uint8Array {
  const [nx, ny, nz] = map.dims;
  const p = point ?? [Math.floor(nx / 2), Math.floor(ny / 2), Math.floor(nz / 2)];
  if (p.some((x, a) => !(x >= 0 && x < map.dims[a]))) fail('INVALID_ARGUMENT', `point (${p.join(', ')}) lies outside the ${nx}x${ny}x${nz} grid`);
  const values = map.data.subarray(0, nx * ny * nz);
  const look: MapLook = options.min !== undefined && options.max !== undefined
    ? { min: options.min, max: options.max, colourMap: options.colourMap ?? 'viridis' }
    : autoRange(values, options.colourMap ?? 'viridis', options.mask);
  const ppm = options.pixelsPerMm ?? 1.5;
  const planes: PlaneName[] = ['sagittal', 'coronal', 'axial'];
  const panels = planes.map((name) => {
    const plane = extractPlane(values, map.dims, map.spacingMm, map.affine, name, p);
    const img = renderPlane(plane, look, ppm);
    // cross at the point: short white ticks so the voxel itself stays visible
    const cx = Math.round((plane.pointColumn + 0.5) * plane.pixelMm[0] * ppm), cy = Math.round((plane.pointRow + 0.5) * plane.pixelMm[1] * ppm);
    fillRect(img, cx - 8, cy, 5, 1, [255, 255, 255]); fillRect(img, cx + 4, cy, 5, 1, [255, 255, 255]);
    fillRect(img, cx, cy - 8, 1, 5, [255, 255, 255]); fillRect(img, cx, cy + 4, 1, 5, [255, 255, 255]);
    labelEdges(img, plane);
    return { img, plane };
  });
  const gap = 8, margin = 10, titleH = 24, captionH = 12;
  const width = margin * 2 + panels.reduce((s, q) => s + q.img.width, 0) + gap * (panels.length - 1);
  const panelH = Math.max(...panels.map((q) => q.img.height));
  const figure = createRgbImage(Math.max(width, textWidth(options.title, 2) + 2 * margin), titleH + panelH + captionH + 44, [255, 255, 255]);
  drawText(figure, margin, 6, options.title, [0, 0, 0], 2);
  let x = margin;
  for (const { img, plane } of panels) {
    blit(figure, img, x, titleH);
    drawText(figure, x, titleH + panelH + 3, `${plane.plane} ${['i', 'j', 'k'][['sagittal', 'coronal', 'axial'].indexOf(plane.plane)]}=${plane.index}`, [60, 60, 60], 1);
    x += img.width + gap;
  }
  const barW = Math.min(300, figure.width - 2 * margin);
  blit(figure, colourBar(barW, look, options.unit), margin, titleH + panelH + captionH + 4);
  return encodeRgbPng(figure);
}
