/**
 * Shift one evenly sampled series by `delta` samples with linear interpolation: out[n] is the
 * series read at position n + delta, the series extended past each end by its end value
 * (nearest-end extension), so a shift never reads outside the run.
 *
 * Frequency response (why it blurs): at a fractional offset d the two taps (1 - d, d) have gain
 * |(1 - d) + d e^{i 2 pi f}|; at d = 1/2 that is cos(pi f) with f in cycles per sample (f x TR for
 * a frequency f in Hz), so a sine of 0.1 Hz at TR 2 s keeps cos(0.2 pi) = 0.81 of its amplitude.
 * @param y - the series (not modified)
 * @param delta - shift in samples (positive reads later samples)
 * @param out - output, same length as y (may not be y)
 * @returns out
 * @example shiftSeriesLinear(Float64Array.of(0, 2, 4), 0.5, new Float64Array(3)) // [1, 3, 4]
 */
export function shiftSeriesLinear(y: ArrayLike<number>, delta: number, out: Float64Array): Float64Array {
  const nt = y.length;
  const last = nt - 1;
  const shift = Math.floor(delta);
  const f = delta - shift;
  const g = 1 - f;
  for (let n = 0; n < nt; n++) {
    let i0 = n + shift;
    let i1 = i0 + 1;
    i0 = i0 < 0 ? 0 : i0 > last ? last : i0;
    i1 = i1 < 0 ? 0 : i1 > last ? last : i1;
    out[n] = g * y[i0] + f * y[i1];
  }
  return out;
}
