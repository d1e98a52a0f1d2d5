import { fail } from '../core/fail.js';

/**
 * Root of a continuous function inside a bracket [lo, hi] where f(lo) and f(hi) differ in sign, by
 * Brent's method (Brent RP 1973, Algorithms for Minimization without Derivatives, ch. 4): inverse
 * quadratic interpolation or secant steps when they stay inside the bracket and shrink it fast,
 * bisection otherwise, so it never does worse than bisection.
 * @param f - the function
 * @param lo - one end of the bracket
 * @param hi - the other end
 * @param tolerance - absolute tolerance on the root (default 1e-12)
 * @param maxIterations - iteration cap (default 200; bisection alone needs ~60 for double precision)
 * @returns x with f(x) ~ 0, within tolerance of a sign change
 * @throws BoldsweepError INVALID_ARGUMENT when f(lo) and f(hi) have the same sign or are not finite
 * @example findRootBracketed((x) => x * x * x - 2, 1, 2) // 1.2599210498948732
 */
export function findRootBracketed(f: (x: number) => number, lo: number, hi: number, tolerance = 1e-12, maxIterations = 200): number {
  let a = lo, b = hi, fa = f(a), fb = f(b);
  if (!Number.isFinite(fa) || !Number.isFinite(fb)) fail('INVALID_ARGUMENT', `root finder: f is not finite at the bracket ends (f(${a}) = ${fa}, f(${b}) = ${fb})`);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa > 0 === fb > 0) fail('INVALID_ARGUMENT', `root finder: f(${a}) = ${fa} and f(${b}) = ${fb} have the same sign, so [${a}, ${b}] does not bracket a root`);
  let c = a, fc = fa, d = b - a, e = d;
  for (let iter = 0; iter < maxIterations; iter++) {
    if (fb > 0 === fc > 0) { c = a; fc = fa; d = b - a; e = d; }
    // keep b the best estimate: |f(b)| <= |f(c)|
    if (Math.abs(fc) < Math.abs(fb)) { a = b; b = c; c = a; fa = fb; fb = fc; fc = fa; }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tolerance;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      let p: number, q: number;
      const s = fb / fa;
      if (a === c) { // secant
        p = 2 * m * s; q = 1 - s;
      } else { // inverse quadratic interpolation
        const qa = fa / fc, r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q; else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) { e = d; d = p / q; } else { d = m; e = m; }
    } else { d = m; e = m; }
    a = b; fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}
