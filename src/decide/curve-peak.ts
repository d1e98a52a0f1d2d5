/**
 * Where a sampled curve peaks: the vertex of the parabola through its largest sample and the two
 * neighbours (three-point interpolation; the x values may be unevenly spaced), kept between those
 * neighbours; the largest sample's x when it lies at an end. NaN when every y is NaN or the curve is flat.
 * @param x - sample positions, ascending
 * @param y - values (NaN skipped when finding the largest)
 * @returns the peak's position
 * @example curvePeak([2, 4, 6], [1, 3, 2]) // 4.333...
 */
export function curvePeak(x: readonly number[], y: readonly number[]): number {
  let b = -1;
  for (let i = 0; i < y.length; i++) if (Number.isFinite(y[i]) && (b < 0 || y[i] > y[b])) b = i;
  if (b < 0 || y.every((v) => v === y[b])) return NaN;
  if (b === 0 || b === y.length - 1 || !Number.isFinite(y[b - 1]) || !Number.isFinite(y[b + 1])) return x[b];
  const [x0, x1, x2] = [x[b - 1], x[b], x[b + 1]];
  const [y0, y1, y2] = [y[b - 1], y[b], y[b + 1]];
  const num = (x1 - x0) ** 2 * (y1 - y2) - (x1 - x2) ** 2 * (y1 - y0);
  const den = (x1 - x0) * (y1 - y2) - (x1 - x2) * (y1 - y0);
  if (den === 0) return x1;
  return Math.min(x2, Math.max(x0, x1 - num / (2 * den)));
}
