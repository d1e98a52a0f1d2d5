import type { Volume } from '../core/volume.js';
import { fail } from '../core/fail.js';
import { colourOf, type ColourMapName } from './colour-map.js';
import { displayAxes, extractPlane, type PlaneName } from './display-planes.js';
import { svgColourBar, svgDocument, svgImage, svgText } from './figure-svg.js';
import { autoRange, renderPlane, svgEdgeLabels, type MapLook } from './plane-panel.js';

/** Colour of the mask outline in every map figure (from the magma table, apart from grey and viridis). */
export const MASK_OUTLINE_RGB = colourOf(0.62, 0, 1, 'magma');

/** Options of {@link threePlaneSvg} and sliceGridSvg. */
export interface MapFigureOptions {
  /** Figure title: say what the map shows. */
  title: string;
  /** Unit text under the colour bar (case kept). */
  unit: string;
  /** Colour map (default viridis). */
  colourMap?: ColourMapName;
  /** Display range (default 1st-99th percentile, inside `mask` when given). */
  min?: number;
  max?: number;
  /** Brain mask (0/1, same grid): sets the automatic range (unless outside is 'show'), and is drawn as below. */
  mask?: ArrayLike<number>;
  /** With a mask: 'hide' (default) draws voxels outside it as background, 'show' draws the whole map. */
  outside?: 'hide' | 'show';
  /** With a mask: draw its outline (default true). */
  outline?: boolean;
  /** Legend text of the outline. __Default value:__ 'brain mask outline' */
  outlineLabel?: string;
  /** Display scale (default 1.5 pixels per mm). */
  pixelsPerMm?: number;
}

/**
 * Three sections (sagittal, coronal, axial) of a 3D map through one voxel as an SVG figure: the
 * sections as embedded images (nearest neighbour, true voxel shape), and every word as vector text:
 * title, the subject's left/right, anterior/posterior and superior/inferior from the affine, section
 * names, and a colour bar with the unit. A small cross marks the point.
 * @param map - a 3D map (first volume used)
 * @param point - voxel (i, j, k) to cut through (default the grid centre)
 * @param options - title, unit, colour map, range, mask
 * @returns SVG markup
 * @example await writeFileAtomic('tsnr-planes.svg', threePlaneSvg(look.maps.tsnr, [32, 30, 18], { title: 'tSNR', unit: 'mean / SD', mask }))
 */
export function threePlaneSvg(map: Volume, point: readonly [number, number, number] | undefined, options: MapFigureOptions): string {
  const [nx, ny, nz] = map.dims;
  const p = point ?? [Math.floor(nx / 2), Math.floor(ny / 2), Math.floor(nz / 2)];
  if (p.some((x, a) => !(x >= 0 && x < map.dims[a]))) fail('INVALID_ARGUMENT', `point (${p.join(', ')}) lies outside the ${nx}x${ny}x${nz} grid`);
  const values = map.data.subarray(0, nx * ny * nz);
  const look: MapLook = options.min !== undefined && options.max !== undefined
    ? { min: options.min, max: options.max, colourMap: options.colourMap ?? 'viridis' }
    : autoRange(values, options.colourMap ?? 'viridis', options.outside === 'show' ? undefined : options.mask);
  const ppm = options.pixelsPerMm ?? 1.5;
  const planes: PlaneName[] = ['sagittal', 'coronal', 'axial'];
  const margin = 12, gap = 10, titleH = 30;
  const parts: string[] = [svgText(margin, 20, options.title, { size: 15, weight: 'bold' })];
  let x = margin, bottom = 0;
  for (const name of planes) {
    const plane = extractPlane(values, map.dims, map.spacingMm, map.affine, name, p);
    const maskPlane = options.mask ? extractPlane(options.mask, map.dims, map.spacingMm, map.affine, name, p).values : undefined;
    const img = renderPlane(plane, look, { pixelsPerMm: ppm, maskPlane, hideOutside: options.outside !== 'show', outline: maskPlane && options.outline !== false ? MASK_OUTLINE_RGB : undefined });
    parts.push(svgImage(img, x, titleH));
    const cx = x + (plane.pointColumn + 0.5) * plane.pixelMm[0] * ppm, cy = titleH + (plane.pointRow + 0.5) * plane.pixelMm[1] * ppm;
    parts.push(`<path d="M${cx - 9} ${cy}h5M${cx + 4} ${cy}h5M${cx} ${cy - 9}v5M${cx} ${cy + 4}v5" stroke="white" stroke-width="1.2"/>`);
    parts.push(svgEdgeLabels(plane, x, titleH, img.width, img.height));
    parts.push(svgText(x, titleH + img.height + 15, `${plane.plane}, ${['i', 'j', 'k'][displayAxes(map.affine).axisOf[['sagittal', 'coronal', 'axial'].indexOf(name)]]} = ${plane.index}`, { size: 11, fill: '#444' }));
    x += img.width + gap;
    bottom = Math.max(bottom, titleH + img.height + 20);
  }
  const width = Math.max(x - gap + margin, 300);
  const barW = Math.min(260, width - 2 * margin);
  parts.push(svgColourBar(margin, bottom + 6, barW, look, options.unit));
  if (options.mask && options.outline !== false) {
    const [r, g, b] = MASK_OUTLINE_RGB;
    parts.push(`<rect x="${margin + barW + 24}" y="${bottom + 8}" width="18" height="8" fill="none" stroke="rgb(${r},${g},${b})" stroke-width="2"/>`);
    parts.push(svgText(margin + barW + 48, bottom + 16, options.outlineLabel ?? 'brain mask outline', { size: 11, fill: '#444' }));
  }
  return svgDocument(width, bottom + 56, parts);
}

