/*
 * exp(x) as in FreeBSD msun e_exp.c, in the form @stdlib/math-base-special-exp 0.2 ports it, so the
 * normal sampler's tables and acceptance tests (improved-ziggurat.ts) get the same doubles as before.
 * Origin of the method and constants:
 * ====================================================
 * Copyright (C) 2004 by Sun Microsystems, Inc. All rights reserved.
 *
 * Permission to use, copy, modify, and distribute this
 * software is freely granted, provided that this notice
 * is preserved.
 * ====================================================
 */

const LN2_HI = 6.93147180369123816490e-01;
const LN2_LO = 1.90821492927058770002e-10;
const LOG2_E = 1.44269504088896338700e+00;
const OVERFLOW = 7.09782712893383973096e+02;
const UNDERFLOW = -7.45133219101941108420e+02;
const NEARZERO = 1.0 / (1 << 28);

/**
 * e^x, reduced to r = x - k ln2 with |r| <= ln2/2 and a degree-5 remez fit for r*(e^r+1)/(e^r-1).
 * Results are exact to the bit against @stdlib for results in the normal range (x > -708.39, the
 * only range the sampler uses: arguments between -7 and 0); below it the last scaling may round twice.
 * @param x - the exponent
 * @returns e^x
 * @example fdlibmExp(1) // 2.718281828459045
 */
export function fdlibmExp(x: number): number {
  if (Number.isNaN(x) || x === Infinity) return x;
  if (x === -Infinity) return 0;
  if (x > OVERFLOW) return Infinity;
  if (x < UNDERFLOW) return 0;
  if (x > -NEARZERO && x < NEARZERO) return 1.0 + x;
  const k = x < 0 ? Math.trunc(LOG2_E * x - 0.5) : Math.trunc(LOG2_E * x + 0.5);
  const hi = x - k * LN2_HI;
  const lo = k * LN2_LO;
  const r = hi - lo;
  const t = r * r;
  const p = t === 0 ? 0.16666666666666602 : 0.16666666666666602 + t * (-0.0027777777777015593 + t * (0.00006613756321437934 + t * (-0.0000016533902205465252 + t * 4.1381367970572385e-8)));
  const c = r - t * p;
  const y = 1.0 - (lo - (r * c) / (2.0 - c) - hi);
  // y * 2^k in two exact steps while the result is normal (|k| may reach 1075 at the range's ends)
  const k1 = k >> 1;
  return y * 2 ** k1 * 2 ** (k - k1);
}
