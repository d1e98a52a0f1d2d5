/*
 * ln(x) as in FreeBSD msun e_log.c, in the form @stdlib/math-base-special-ln 0.2 ports it, so the
 * normal sampler's tables and tail draws (improved-ziggurat.ts) get the same doubles as before.
 * Origin of the method and constants:
 * ====================================================
 * Copyright (C) 1993 by Sun Microsystems, Inc. All rights reserved.
 *
 * Developed at SunSoft, a Sun Microsystems, Inc. business.
 * Permission to use, copy, modify, and distribute this
 * software is freely granted, provided that this notice
 * is preserved.
 * ====================================================
 */

const LN2_HI = 6.93147180369123816490e-01;
const LN2_LO = 1.90821492927058770002e-10;
const TWO54 = 1.80143985094819840000e+16;
const ONE_THIRD = 0.33333333333333333;
const view = new DataView(new ArrayBuffer(8));

function highWord(x: number): number {
  view.setFloat64(0, x);
  return view.getInt32(0);
}

function withHighWord(x: number, hi: number): number {
  view.setFloat64(0, x);
  view.setInt32(0, hi);
  return view.getFloat64(0);
}

/**
 * Natural logarithm: x = 2^k (1 + f) with sqrt(2)/2 < 1 + f < sqrt(2), then ln(1 + f) from
 * s = f / (2 + f) and a degree-14 remez fit in s.
 * @param x - a positive number
 * @returns ln x (-Infinity at 0, NaN below 0 or for NaN)
 * @example fdlibmLn(Math.E) // 1
 */
export function fdlibmLn(x: number): number {
  if (x === 0) return -Infinity;
  if (Number.isNaN(x) || x < 0) return NaN;
  let hx = highWord(x);
  let k = 0;
  if (hx < 0x00100000) {
    k -= 54;
    x *= TWO54;
    hx = highWord(x);
  }
  if (hx >= 0x7ff00000) return x + x;
  k += (hx >> 20) - 1023;
  hx &= 0x000fffff;
  let i = (hx + 0x95f64) & 0x100000;
  x = withHighWord(x, hx | (i ^ 0x3ff00000));
  k += i >> 20;
  const f = x - 1.0;
  if ((0x000fffff & (2 + hx)) < 3) {
    if (f === 0) return k === 0 ? 0 : k * LN2_HI + k * LN2_LO;
    const R = f * f * (0.5 - ONE_THIRD * f);
    return k === 0 ? f - R : k * LN2_HI - (R - k * LN2_LO - f);
  }
  const s = f / (2.0 + f);
  const z = s * s;
  i = hx - 0x6147a;
  const w = z * z;
  const j = 0x6b851 - hx;
  const t1 = w * (w === 0 ? 0.3999999999940942 : 0.3999999999940942 + w * (0.22222198432149784 + w * 0.15313837699209373));
  const t2 = z * (w === 0 ? 0.6666666666666735 : 0.6666666666666735 + w * (0.2857142874366239 + w * (0.1818357216161805 + w * 0.14798198605116586)));
  i |= j;
  const R = t2 + t1;
  if (i > 0) {
    const hfsq = 0.5 * f * f;
    return k === 0 ? f - (hfsq - s * (hfsq + R)) : k * LN2_HI - (hfsq - (s * (hfsq + R) + k * LN2_LO) - f);
  }
  return k === 0 ? f - s * (f - R) : k * LN2_HI - (s * (f - R) - k * LN2_LO - f);
}
