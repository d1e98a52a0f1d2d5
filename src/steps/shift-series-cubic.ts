/**
 * Shift one evenly sampled series by `delta` samples with the cubic convolution kernel of Keys
 * (1981, IEEE Trans. Acoust. Speech Signal Process. 29:1153-1160) with a = -1/2 (the Catmull-Rom
 * spline): interpolating (it passes through the samples), four taps, no prefilter. out[n] is the
 * series read at position n + delta, extended past each end by its end value (nearest-end extension).
 *
 * Taps at fractional offset d (samples i-1, i, i+1, i+2):
 *   w(-1) = -d^3/2 + d^2 - d/2,  w(0) = 3d^3/2 - 5d^2/2 + 1,
 *   w(1) = -3d^3/2 + 2d^2 + d/2, w(2) = d^3/2 - d^2/2.
 * At d = 1/2 the taps are (-1/16, 9/16, 9/16, -1/16), so a sine of f cycles per sample keeps
 * (9 cos(pi f) - cos(3 pi f)) / 8 of its amplitude (symmetric taps: a real gain, no phase error).
 * @param y - the series (not modified)
 * @param delta - shift in samples (positive reads later samples)
 * @param out - output, same length as y (may not be y)
 * @returns out
 * @example shiftSeriesCubic(Float64Array.of(0, 1, 2, 3), 0.5, new Float64Array(4)) // [0.4375, 1.5, 2.5625, 3.0625]
 */
export function shiftSeriesCubic(y: ArrayLike<number>, delta: number, out: Float64Array): Float64Array {
  const nt = y.length;
  const last = nt - 1;
  const shift = Math.floor(delta);
  const d = delta - shift;
  const d2 = d * d;
  const d3 = d2 * d;
  const wa = -0.5 * d3 + d2 - 0.5 * d;
  const wb = 1.5 * d3 - 2.5 * d2 + 1;
  const wc = -1.5 * d3 + 2 * d2 + 0.5 * d;
  const wd = 0.5 * d3 - 0.5 * d2;
  for (let n = 0; n < nt; n++) {
    const i = n + shift;
    if (i >= 1 && i + 2 <= last) {
      out[n] = wa * y[i - 1] + wb * y[i] + wc * y[i + 1] + wd * y[i + 2];
    } else {
      const a = i - 1 < 0 ? 0 : i - 1 > last ? last : i - 1;
      const b = i < 0 ? 0 : i > last ? last : i;
      const c = i + 1 < 0 ? 0 : i + 1 > last ? last : i + 1;
      const e = i + 2 < 0 ? 0 : i + 2 > last ? last : i + 2;
      out[n] = wa * y[a] + wb * y[b] + wc * y[c] + wd * y[e];
    }
  }
  return out;
}
