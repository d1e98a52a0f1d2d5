/**
 * The Lanczos kernel L(x) = sinc(x) sinc(x / a) for |x| < a, 0 elsewhere, with sinc(x) =
 * sin(pi x) / (pi x) and sinc(0) = 1 (Duchon CE (1979) Lanczos filtering in one and two dimensions.
 * J Appl Meteorol 18:1016-1022 [memory]).
 * @param x - distance in voxels
 * @param radius - window radius a in voxels (3 for `lanczos3`)
 * @returns the weight (unnormalised)
 * @example lanczosWeight(0, 3) // 1; lanczosWeight(1, 3) // 0
 */
export function lanczosWeight(x: number, radius: number): number {
  const ax = Math.abs(x);
  if (ax >= radius) return 0;
  if (ax < 1e-12) return 1;
  const px = Math.PI * x;
  return (radius * Math.sin(px) * Math.sin(px / radius)) / (px * px);
}
