import { colourTable, type ColourMapName } from './colour-map.js';
import type { PlaneImage } from './display-planes.js';
import { svgText } from './figure-svg.js';
import { createRgbImage, type RgbImage } from './rgb-image.js';

/** Value range and colour map of a map figure. */
export interface MapLook {
  min: number;
  max: number;
  colourMap: ColourMapName;
}

/** Colour of voxels outside the mask: the page's neutral, apart from every colour of every map. */
export const OUTSIDE_MASK_RGB: readonly [number, number, number] = [236, 236, 236];

/** Options of {@link renderPlane}. */
export interface PlaneDrawOptions {
  /** Display scale (default 1.5 pixels per mm). */
  pixelsPerMm?: number;
  /** The mask cut through the same section (values 0/1): outside it the background colour is drawn. */
  maskPlane?: ArrayLike<number>;
  /** Draw only inside the mask (default true when maskPlane is given). */
  hideOutside?: boolean;
  /** Colour of the mask outline, drawn on the mask's inner edge (default none). */
  outline?: readonly [number, number, number];
}

/**
 * Draw a section as an image at `pixelsPerMm` (nearest neighbour, so voxels stay visible and
 * anisotropic voxels keep their true shape). NaN and, with a mask, voxels outside it are drawn in
 * {@link OUTSIDE_MASK_RGB}, never as the map's lowest colour; the mask outline is drawn over the
 * map on the mask's inner edge when asked.
 * @param plane - a section from extractPlane
 * @param look - range and colour map
 * @param options - scale, mask section, outline colour
 * @returns the panel image
 * @example renderPlane(extractPlane(...), { min: 0, max: 120, colourMap: 'viridis' }, { maskPlane, outline: [255, 140, 0] })
 */
export function renderPlane(plane: PlaneImage, look: MapLook, options: PlaneDrawOptions = {}): RgbImage {
  const ppm = options.pixelsPerMm ?? 1.5;
  const w = Math.max(1, Math.round(plane.width * plane.pixelMm[0] * ppm));
  const h = Math.max(1, Math.round(plane.height * plane.pixelMm[1] * ppm));
  const img = createRgbImage(w, h, OUTSIDE_MASK_RGB);
  const table = colourTable(look.colourMap);
  const span = look.max > look.min ? look.max - look.min : 1;
  const m = options.maskPlane;
  const hide = m !== undefined && options.hideOutside !== false;
  const cell = new Int32Array(w * h); // source cell of each pixel
  for (let py = 0; py < h; py++) {
    const r = Math.min(plane.height - 1, Math.floor((py * plane.height) / h));
    for (let px = 0; px < w; px++) {
      const c = Math.min(plane.width - 1, Math.floor((px * plane.width) / w));
      const q = r * plane.width + c;
      cell[py * w + px] = q;
      const v = plane.values[q];
      if (!Number.isFinite(v) || (hide && !m[q])) continue;
      const i = Math.max(0, Math.min(255, Math.round(((v - look.min) / span) * 255)));
      const o = 3 * (py * w + px);
      img.data[o] = table[3 * i]; img.data[o + 1] = table[3 * i + 1]; img.data[o + 2] = table[3 * i + 2];
    }
  }
  if (m && options.outline) {
    const col = options.outline;
    const t = Math.max(1, Math.round(Math.min(plane.pixelMm[0], plane.pixelMm[1]) * ppm / 4)); // line width, px
    for (let py = 0; py < h; py++) for (let px = 0; px < w; px++) {
      if (!m[cell[py * w + px]]) continue;
      let edge = false;
      for (let d = 1; d <= t && !edge; d++) {
        for (const [dx, dy] of [[d, 0], [-d, 0], [0, d], [0, -d]]) {
          const x = px + dx, y = py + dy;
          if (x < 0 || y < 0 || x >= w || y >= h || !m[cell[y * w + x]]) { edge = true; break; }
        }
      }
      if (!edge) continue;
      const o = 3 * (py * w + px);
      img.data[o] = col[0]; img.data[o + 1] = col[1]; img.data[o + 2] = col[2];
    }
  }
  return img;
}

/**
 * The orientation letters of a panel as SVG text on small dark boxes (they read on any map).
 * @param plane - the panel's section, for the letters
 * @param x - panel left, px
 * @param y - panel top, px
 * @param width - panel width, px
 * @param height - panel height, px
 * @param size - font size (default 11)
 * @returns SVG markup
 * @example parts.push(svgEdgeLabels(plane, 10, 30, panel.width, panel.height))
 */
export function svgEdgeLabels(plane: PlaneImage, x: number, y: number, width: number, height: number, size = 11): string {
  const box = (cx: number, cy: number, s: string) => {
    const bw = size * 0.75 + 4, bh = size + 3;
    return `<rect x="${(cx - bw / 2).toFixed(1)}" y="${(cy - bh / 2).toFixed(1)}" width="${bw.toFixed(1)}" height="${bh}" rx="2" fill="black" fill-opacity="0.6"/>`
      + svgText(cx, cy + size * 0.36, s, { size, anchor: 'middle', fill: 'white', weight: 'bold' });
  };
  const pad = size * 0.75;
  return box(x + pad, y + height / 2, plane.edges.left) + box(x + width - pad, y + height / 2, plane.edges.right)
    + box(x + width / 2, y + pad, plane.edges.top) + box(x + width / 2, y + height - pad, plane.edges.bottom);
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
