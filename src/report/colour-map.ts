import { fail } from '../core/fail.js';
import { COLOUR_TABLES_HEX } from './colour-tables.js';

/**
 * Colour maps for figures: perceptually uniform 'viridis', 'magma', 'cividis' for magnitudes,
 * 'diverging' (Moreland's cool-warm, balanced about its centre) for signed values, 'grey' for anatomy.
 * Table sources are listed in test/reference/make_colour_tables.py.
 */
export type ColourMapName = 'viridis' | 'magma' | 'cividis' | 'diverging' | 'grey';

const cache = new Map<ColourMapName, Uint8Array>();

/**
 * The 256-entry RGB table of a colour map.
 * @param name - map name
 * @returns 768 bytes: r, g, b of entry 0, then entry 1, ...
 * @example colourTable('viridis').subarray(0, 3) // dark purple
 */
export function colourTable(name: ColourMapName): Uint8Array {
  const hit = cache.get(name);
  if (hit) return hit;
  const table = new Uint8Array(768);
  if (name === 'grey') {
    for (let i = 0; i < 256; i++) table[3 * i] = table[3 * i + 1] = table[3 * i + 2] = i;
  } else {
    const hex = name === 'diverging' ? COLOUR_TABLES_HEX.coolwarm : COLOUR_TABLES_HEX[name as 'viridis' | 'magma' | 'cividis'];
    if (!hex) fail('INVALID_ARGUMENT', `unknown colour map '${name}'; use viridis, magma, cividis, diverging or grey`);
    for (let i = 0; i < 768; i++) table[i] = parseInt(hex.slice(2 * i, 2 * i + 2), 16);
  }
  cache.set(name, table);
  return table;
}

/**
 * Colour of a value on a map between min and max (clamped); NaN gets `nanColour`.
 * @param value - the value
 * @param min - value shown with the first colour
 * @param max - value shown with the last colour
 * @param name - colour map
 * @param nanColour - colour for NaN (default black)
 * @returns [r, g, b]
 * @example colourOf(0, -3, 3, 'diverging') // the neutral centre
 */
export function colourOf(value: number, min: number, max: number, name: ColourMapName, nanColour: readonly [number, number, number] = [0, 0, 0]): [number, number, number] {
  if (!Number.isFinite(value)) return [nanColour[0], nanColour[1], nanColour[2]];
  const table = colourTable(name);
  const f = max > min ? (value - min) / (max - min) : 0.5;
  const i = Math.max(0, Math.min(255, Math.round(f * 255)));
  return [table[3 * i], table[3 * i + 1], table[3 * i + 2]];
}

/**
 * Hex colour string of a map entry, for vega-lite specs that should match the PNG figures.
 * @param name - colour map
 * @param fraction - position 0..1 along the map
 * @returns '#rrggbb'
 * @example mapHex('magma', 0.7)
 */
export function mapHex(name: ColourMapName, fraction: number): string {
  const [r, g, b] = colourOf(fraction, 0, 1, name);
  return '#' + [r, g, b].map((c) => c.toString(16).padStart(2, '0')).join('');
}
