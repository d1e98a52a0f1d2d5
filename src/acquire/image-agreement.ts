import { fail } from '../core/fail.js';

/**
 * How alike two images are inside a mask: Pearson correlation and mean absolute difference, the
 * agreement of a reversed phase-encode pair before and after unwarping.
 * @param a - first image
 * @param b - second image
 * @param mask - voxels compared (1 = in), or null for all
 * @returns correlation and mean absolute difference (NaN for fewer than 2 voxels)
 * @example imageAgreement(unwarpedA, unwarpedB, brainMask).correlation
 */
export function imageAgreement(a: ArrayLike<number>, b: ArrayLike<number>, mask: Uint8Array | null): { correlation: number; meanAbsDifference: number; voxels: number } {
  if (a.length !== b.length || (mask && mask.length !== a.length)) fail('INVALID_ARGUMENT', `images (${a.length}, ${b.length}) and mask (${mask?.length}) must have one length`);
  let n = 0, sa = 0, sb = 0;
  for (let v = 0; v < a.length; v++) if (!mask || mask[v]) { n++; sa += a[v]; sb += b[v]; }
  if (n < 2) return { correlation: NaN, meanAbsDifference: NaN, voxels: n };
  const ma = sa / n, mb = sb / n;
  let saa = 0, sbb = 0, sab = 0, mad = 0;
  for (let v = 0; v < a.length; v++) {
    if (mask && !mask[v]) continue;
    const da = a[v] - ma, db = b[v] - mb;
    saa += da * da; sbb += db * db; sab += da * db; mad += Math.abs(a[v] - b[v]);
  }
  return { correlation: sab / Math.sqrt(saa * sbb), meanAbsDifference: mad / n, voxels: n };
}
