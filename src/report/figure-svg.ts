import { colourTable } from './colour-map.js';
import { escapeHtml } from './html-escape.js';
import { formatValue, type MapLook } from './plane-panel.js';
import { createRgbImage, encodeRgbPng, type RgbImage } from './rgb-image.js';

/** Font stack of every figure: set as vector text, drawn by the viewer's font renderer (DejaVu Sans on Debian). */
export const FIGURE_FONT = "'DejaVu Sans', 'Helvetica Neue', Helvetica, Arial, sans-serif";

/**
 * An SVG text element in the figure font (text escaped; case kept as given).
 * @param x - anchor x, px
 * @param y - baseline y, px
 * @param text - the words
 * @param options - size (default 12), anchor (start/middle/end), weight, fill
 * @returns SVG markup
 * @example svgText(10, 20, 'tSNR, dimensionless', { size: 11 })
 */
export function svgText(x: number, y: number, text: string, options: { size?: number; anchor?: 'start' | 'middle' | 'end'; weight?: 'normal' | 'bold'; fill?: string } = {}): string {
  return `<text x="${x.toFixed(1)}" y="${y.toFixed(1)}" font-family="${FIGURE_FONT}" font-size="${options.size ?? 12}"${options.anchor && options.anchor !== 'start' ? ` text-anchor="${options.anchor}"` : ''}${options.weight === 'bold' ? ' font-weight="bold"' : ''} fill="${options.fill ?? '#222'}">${escapeHtml(text)}</text>`;
}

/**
 * An RGB image embedded as a PNG data URI, drawn pixel for pixel (no smoothing between voxels).
 * @param img - the image
 * @param x - left, px
 * @param y - top, px
 * @param width - drawn width (default the image's)
 * @param height - drawn height (default the image's)
 * @returns SVG markup
 * @example svgImage(panel, 10, 30)
 */
export function svgImage(img: RgbImage, x: number, y: number, width = img.width, height = img.height): string {
  const b64 = Buffer.from(encodeRgbPng(img)).toString('base64');
  return `<image x="${x.toFixed(1)}" y="${y.toFixed(1)}" width="${width.toFixed(1)}" height="${height.toFixed(1)}" preserveAspectRatio="none" style="image-rendering:pixelated" href="data:image/png;base64,${b64}"/>`;
}

/**
 * A horizontal colour bar as SVG: the map as a stretched 256-pixel strip, values at both ends and the
 * middle, and the unit under it (all vector text). About 44 px tall.
 * @param x - left, px
 * @param y - top, px
 * @param width - bar width, px
 * @param look - range and colour map
 * @param unit - unit text (case kept: 'tSNR, dimensionless')
 * @returns SVG markup
 * @example svgColourBar(10, 400, 240, { min: 0, max: 120, colourMap: 'viridis' }, 'tSNR')
 */
export function svgColourBar(x: number, y: number, width: number, look: MapLook, unit: string): string {
  const strip = createRgbImage(256, 1);
  const table = colourTable(look.colourMap);
  strip.data.set(table);
  const mid = (look.min + look.max) / 2;
  return [
    svgImage(strip, x, y, width, 12),
    `<rect x="${x}" y="${y}" width="${width}" height="12" fill="none" stroke="#888" stroke-width="0.5"/>`,
    svgText(x, y + 25, formatValue(look.min), { size: 11 }),
    svgText(x + width / 2, y + 25, formatValue(mid), { size: 11, anchor: 'middle' }),
    svgText(x + width, y + 25, formatValue(look.max), { size: 11, anchor: 'end' }),
    svgText(x, y + 40, unit, { size: 11, fill: '#444' }),
  ].join('');
}

/**
 * Wrap figure parts in an SVG document with a white background.
 * @param width - px
 * @param height - px
 * @param parts - SVG markup
 * @returns the SVG document
 * @example svgDocument(400, 300, [svgText(10, 20, 'Title')])
 */
export function svgDocument(width: number, height: number, parts: string[]): string {
  const w = Math.ceil(width), h = Math.ceil(height);
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}" viewBox="0 0 ${w} ${h}"><rect width="${w}" height="${h}" fill="white"/>${parts.join('')}</svg>`;
}
