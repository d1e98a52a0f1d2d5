import { encode } from 'fast-png';

/** An 8-bit RGB raster, row-major from the top-left pixel. */
export interface RgbImage {
  width: number;
  height: number;
  /** width * height * 3 bytes. */
  data: Uint8Array;
}

/**
 * A new image filled with one colour.
 * @param width - pixels
 * @param height - pixels
 * @param background - [r, g, b] (default white)
 * @returns the image
 * @example const img = createRgbImage(400, 300, [0, 0, 0])
 */
export function createRgbImage(width: number, height: number, background: readonly [number, number, number] = [255, 255, 255]): RgbImage {
  const w = Math.max(1, Math.round(width)), h = Math.max(1, Math.round(height));
  const data = new Uint8Array(w * h * 3);
  for (let i = 0; i < w * h; i++) { data[3 * i] = background[0]; data[3 * i + 1] = background[1]; data[3 * i + 2] = background[2]; }
  return { width: w, height: h, data };
}

/**
 * Fill a rectangle (clipped to the image).
 * @param image - drawn into
 * @param x - left
 * @param y - top
 * @param w - width
 * @param h - height
 * @param colour - [r, g, b]
 * @example fillRect(img, 0, 0, 10, 2, [200, 0, 0])
 */
export function fillRect(image: RgbImage, x: number, y: number, w: number, h: number, colour: readonly [number, number, number]): void {
  const x0 = Math.max(0, Math.round(x)), y0 = Math.max(0, Math.round(y));
  const x1 = Math.min(image.width, Math.round(x + w)), y1 = Math.min(image.height, Math.round(y + h));
  for (let py = y0; py < y1; py++) for (let px = x0; px < x1; px++) {
    const o = 3 * (py * image.width + px);
    image.data[o] = colour[0]; image.data[o + 1] = colour[1]; image.data[o + 2] = colour[2];
  }
}

/**
 * Copy one image into another at (x, y), clipped.
 * @param target - drawn into
 * @param source - copied from
 * @param x - left of the copy in target
 * @param y - top of the copy in target
 * @example blit(figure, panel, 10, 30)
 */
export function blit(target: RgbImage, source: RgbImage, x: number, y: number): void {
  for (let sy = 0; sy < source.height; sy++) {
    const ty = y + sy;
    if (ty < 0 || ty >= target.height) continue;
    for (let sx = 0; sx < source.width; sx++) {
      const tx = x + sx;
      if (tx < 0 || tx >= target.width) continue;
      const so = 3 * (sy * source.width + sx), to = 3 * (ty * target.width + tx);
      target.data[to] = source.data[so]; target.data[to + 1] = source.data[so + 1]; target.data[to + 2] = source.data[so + 2];
    }
  }
}

/**
 * Encode as PNG (fast-png, 8-bit RGB).
 * @param image - the image
 * @returns PNG bytes
 * @example await writeFileAtomic('mean.png', encodeRgbPng(img))
 */
export function encodeRgbPng(image: RgbImage): Uint8Array {
  return encode({ width: image.width, height: image.height, data: image.data, channels: 3, depth: 8 });
}
