import type { RgbImage } from './rgb-image.js';

/**
 * Our own 5x7 bitmap font for labels burned into PNG figures (letters are drawn upper case). Each
 * glyph is seven rows of five bits, most significant bit on the left.
 */
const GLYPHS: Record<string, string> = {
  A: '01110 10001 10001 11111 10001 10001 10001', B: '11110 10001 10001 11110 10001 10001 11110',
  C: '01110 10001 10000 10000 10000 10001 01110', D: '11110 10001 10001 10001 10001 10001 11110',
  E: '11111 10000 10000 11110 10000 10000 11111', F: '11111 10000 10000 11110 10000 10000 10000',
  G: '01110 10001 10000 10111 10001 10001 01111', H: '10001 10001 10001 11111 10001 10001 10001',
  I: '01110 00100 00100 00100 00100 00100 01110', J: '00111 00010 00010 00010 00010 10010 01100',
  K: '10001 10010 10100 11000 10100 10010 10001', L: '10000 10000 10000 10000 10000 10000 11111',
  M: '10001 11011 10101 10101 10001 10001 10001', N: '10001 10001 11001 10101 10011 10001 10001',
  O: '01110 10001 10001 10001 10001 10001 01110', P: '11110 10001 10001 11110 10000 10000 10000',
  Q: '01110 10001 10001 10001 10101 10010 01101', R: '11110 10001 10001 11110 10100 10010 10001',
  S: '01111 10000 10000 01110 00001 00001 11110', T: '11111 00100 00100 00100 00100 00100 00100',
  U: '10001 10001 10001 10001 10001 10001 01110', V: '10001 10001 10001 10001 10001 01010 00100',
  W: '10001 10001 10001 10101 10101 10101 01010', X: '10001 10001 01010 00100 01010 10001 10001',
  Y: '10001 10001 01010 00100 00100 00100 00100', Z: '11111 00001 00010 00100 01000 10000 11111',
  0: '01110 10001 10011 10101 11001 10001 01110', 1: '00100 01100 00100 00100 00100 00100 01110',
  2: '01110 10001 00001 00010 00100 01000 11111', 3: '11111 00010 00100 00010 00001 10001 01110',
  4: '00010 00110 01010 10010 11111 00010 00010', 5: '11111 10000 11110 00001 00001 10001 01110',
  6: '00110 01000 10000 11110 10001 10001 01110', 7: '11111 00001 00010 00100 01000 01000 01000',
  8: '01110 10001 10001 01110 10001 10001 01110', 9: '01110 10001 10001 01111 00001 00010 01100',
  ' ': '00000 00000 00000 00000 00000 00000 00000', '.': '00000 00000 00000 00000 00000 01100 01100',
  ',': '00000 00000 00000 00000 01100 00100 01000', '-': '00000 00000 00000 11111 00000 00000 00000',
  '+': '00000 00100 00100 11111 00100 00100 00000', '(': '00010 00100 01000 01000 01000 00100 00010',
  ')': '01000 00100 00010 00010 00010 00100 01000', '/': '00000 00001 00010 00100 01000 10000 00000',
  ':': '00000 01100 01100 00000 01100 01100 00000', '%': '11000 11001 00010 00100 01000 10011 00011',
  '=': '00000 00000 11111 00000 11111 00000 00000', _: '00000 00000 00000 00000 00000 00000 11111',
  "'": '01100 00100 01000 00000 00000 00000 00000', '?': '01110 10001 00001 00010 00100 00000 00100',
};

/** Glyph cell: 5 columns + 1 spacing, 7 rows (times the scale). */
export const GLYPH_WIDTH = 6;
export const GLYPH_HEIGHT = 7;

/**
 * Width in pixels of a text drawn by {@link drawText}.
 * @param text - the text
 * @param scale - pixel size of one font dot (default 1)
 * @returns width in pixels
 * @example textWidth('L', 2) // 10
 */
export function textWidth(text: string, scale = 1): number {
  return Math.max(0, text.length * GLYPH_WIDTH - 1) * scale;
}

/**
 * Draw text into an RGB image (clipped at the edges); characters without a glyph show as '?'.
 * @param image - the image to draw into (modified: this is a drawing routine)
 * @param x - left edge, pixels
 * @param y - top edge, pixels
 * @param text - the text (lower case drawn as upper case)
 * @param colour - [r, g, b] 0-255
 * @param scale - pixel size of one font dot (default 1)
 * @example drawText(img, 4, 4, 'L', [255, 255, 255], 2)
 */
export function drawText(image: RgbImage, x: number, y: number, text: string, colour: readonly [number, number, number], scale = 1): void {
  let cx = x;
  for (const ch of text.toUpperCase()) {
    const rows = (GLYPHS[ch] ?? GLYPHS['?']).split(' ');
    for (let r = 0; r < GLYPH_HEIGHT; r++) {
      for (let c = 0; c < 5; c++) {
        if (rows[r][c] !== '1') continue;
        for (let dy = 0; dy < scale; dy++) for (let dx = 0; dx < scale; dx++) {
          const px = cx + c * scale + dx, py = y + r * scale + dy;
          if (px < 0 || py < 0 || px >= image.width || py >= image.height) continue;
          const o = 3 * (py * image.width + px);
          image.data[o] = colour[0]; image.data[o + 1] = colour[1]; image.data[o + 2] = colour[2];
        }
      }
    }
    cx += GLYPH_WIDTH * scale;
  }
}
