import { drawText, textWidth, GLYPH_HEIGHT } from './bitmap-font.js';
import { colourTable, type ColourMapName } from './colour-map.js';
import type { PlaneImage } from './display-planes.js';
import { createRgbImage, fillRect, type RgbImage } from './rgb-image.js';

/** Value range and colour map of a map figure. */
export interface MapLook {
  min: number;
  max: number;
  colourMap: ColourMapName;
}

/**
 * Draw a section as an image at `pixelsPerMm` (nearest neighbour, so voxels stay visible and
 * anisotropic voxels keep their true shape). NaN shows as black.
 * @param plane - a section from extractPlane
 * @param look - range and colour map
 * @param pixelsPerMm - display scale (default 1.5)
 * @returns the panel image
 * @example renderPlane(extractPlane(...), { min: 0, max: 120, colourMap: 'viridis' })
 */
export function renderPlane(plane: PlaneImage, look: MapLook, pixelsPerMm = 1.5): RgbImage {
  const w = Math.max(1, Math.round(plane.width * plane.pixelMm[0] * pixelsPerMm));
  const h = Math.max(1, Math.round(plane.height * plane.pixelMm[1] * pixelsPerMm));
  const img = createRgbImage(w, h, [0, 0, 0]);
  const table = colourTable(look.colourMap);
  const span = look.max > look.min ? look.max - look.min : 1;
  for (let py = 0; py < h; py++) {
    const r = Math.min(plane.height - 1, Math.floor((py * plane.height) / h));
    for (let px = 0; px < w; px++) {
      const c = Math.min(plane.width - 1, Math.floor((px * plane.width) / w));
      const v = plane.values[r * plane.width + c];
      if (!Number.isFinite(v)) continue;
      const i = Math.max(0, Math.min(255, Math.round(((v - look.min) / span) * 255)));
      const o = 3 * (py * w + px);
      img.data[o] = table[3 * i]; img.data[o + 1] = table[3 * i + 1]; img.data[o + 2] = table[3 * i + 2];
    }
  }
  return img;
}

/**
 * Burn the orientation letters into a panel's edges (white on a black box, so they read on any map).
 * @param img - the panel (drawn into)
 * @param plane - its section, for the letters
 * @param scale - font scale (default 2)
 * @example labelEdges(panel, plane)
 */
export function labelEdges(img: RgbImage, plane: PlaneImage, scale = 2): void {
  const h = GLYPH_HEIGHT * scale;
  const put = (x: number, y: number, s: string) => {
    fillRect(img, x - 1, y - 1, textWidth(s, scale) + 2, h + 2, [0, 0, 0]);
    drawText(img, x, y, s, [255, 255, 255], scale);
  };
  put(2, Math.round(img.height / 2 - h / 2), plane.edges.left);
  put(img.width - textWidth(plane.edges.right, scale) - 2, Math.round(img.height / 2 - h / 2), plane.edges.right);
  put(Math.round(img.width / 2 - textWidth(plane.edges.top, scale) / 2), 2, plane.edges.top);
  put(Math.round(img.width / 2 - textWidth(plane.edges.bottom, scale) / 2), img.height - h - 2, plane.edges.bottom);
}

/**
 * A horizontal colour bar with its end values and unit under it.
 * @param width - bar width in pixels
 * @param look - range and colour map
 * @param unit - unit text, e.g. 'signal units' or 'tSNR (mean/SD)'
 * @returns an image about 34 px tall
 * @example blit(figure, colourBar(300, look, 'tSNR'), 10, 400)
 */
export function colourBar(width: number, look: MapLook, unit: string): RgbImage {
  const img = createRgbImage(width, 36, [255, 255, 255]);
  const table = colourTable(look.colourMap);
  for (let px = 0; px < width; px++) {
    const i = Math.round((px / Math.max(1, width - 1)) * 255);
    fillRect(img, px, 0, 1, 12, [table[3 * i], table[3 * i + 1], table[3 * i + 2]]);
  }
  const lo = formatValue(look.min), hi = formatValue(look.max);
  drawText(img, 0, 16, lo, [0, 0, 0], 1);
  drawText(img, width - textWidth(hi), 16, hi, [0, 0, 0], 1);
  drawText(img, Math.round(width / 2 - textWidth(unit) / 2), 27, unit, [0, 0, 0], 1);
  return img;
}

/**
 * Display range for a map: 1st to 99th percentile of its finite values (inside the mask when
 * given); symmetric about 0 for a diverging map.
 * @param values - the map
 * @param colourMap - the map it will be shown with
 * @param mask - optional: only these voxels set the range
 * @returns the range and colour map
 * @example autoRange(look.maps.tsnr.data, 'viridis', look.mask.mask)
 */
export function autoRange(values: ArrayLike<number>, colourMap: ColourMapName, mask?: ArrayLike<number>): MapLook {
  const vals: number[] = [];
  for (let i = 0; i < values.length; i++) if ((!mask || mask[i]) && Number.isFinite(values[i])) vals.push(values[i]);
  if (vals.length === 0) return { min: 0, max: 1, colourMap };
  vals.sort((a, b) => a - b);
  const q = (p: number) => vals[Math.min(vals.length - 1, Math.max(0, Math.round(p * (vals.length - 1))))];
  let min = q(0.01), max = q(0.99);
  if (colourMap === 'diverging') { const m = Math.max(Math.abs(min), Math.abs(max)) || 1; min = -m; max = m; }
  if (!(max > min)) max = min + 1;
  if (colourMap !== 'diverging' && min > 0 && min < 0.2 * max) min = 0;
  return { min, max, colourMap };
}

/** Short number text for labels: 3 significant digits, no exponent for ordinary values. */
export function formatValue(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a >= 1000) return x.toFixed(0);
  if (a >= 10) return x.toFixed(1);
  if (a >= 1) return x.toFixed(2);
  return x.toPrecision(2);
}
