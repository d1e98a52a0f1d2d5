/** Options of {@link nelderMead}. */
export interface NelderMeadOptions {
  /** Initial simplex: x0 plus `step` along each coordinate. __Default value:__ 1 */
  step?: number;
  /** Done when every vertex is within this of the best one along every coordinate. __Default value:__ 1e-3 */
  xTolerance?: number;
  /** Iterations before giving up (reported as not converged). __Default value:__ 200 x dimension */
  maxIterations?: number;
}

/** What {@link nelderMead} found. */
export interface NelderMeadResult {
  /** Best point. */
  x: Float64Array;
  /** Cost there. */
  fx: number;
  /** Iterations taken. */
  iterations: number;
  /** False when the iteration cap was reached before the simplex shrank below xTolerance. */
  converged: boolean;
}

/**
 * Minimise f by the downhill simplex method of Nelder and Mead (1965, Computer Journal 7:308-313)
 * with the standard coefficients (reflection 1, expansion 2, contraction 1/2, shrink 1/2; the
 * inside contraction when the reflected point is no better than the worst). Our own rather than
 * fmin's nelderMead because the caller must know whether it converged (the iteration cap is an
 * error for registration, never a silent answer). Deterministic; +Infinity is a valid cost (a
 * point outside the feasible set).
 * @param f - cost function of a point (the array is not kept)
 * @param x0 - starting point
 * @param options - step, xTolerance, maxIterations
 * @returns best point, its cost, iterations and whether it converged
 * @example nelderMead((x) => (x[0] - 1) ** 2 + (x[1] + 2) ** 2, [0, 0]).x // ~[1, -2]
 */
export function nelderMead(f: (x: Float64Array) => number, x0: ArrayLike<number>, options: NelderMeadOptions = {}): NelderMeadResult {
  const n = x0.length;
  const step = options.step ?? 1;
  const xTol = options.xTolerance ?? 1e-3;
  const maxIt = options.maxIterations ?? 200 * n;
  const pts: Float64Array[] = [];
  const fx: number[] = [];
  for (let v = 0; v <= n; v++) {
    const p = Float64Array.from(x0);
    if (v > 0) p[v - 1] += step;
    pts.push(p);
    fx.push(f(p));
  }
  const order = Array.from({ length: n + 1 }, (_, i) => i);
  const centroid = new Float64Array(n);
  const trial = (coef: number, worst: Float64Array): Float64Array => {
    const p = new Float64Array(n);
    for (let i = 0; i < n; i++) p[i] = centroid[i] + coef * (worst[i] - centroid[i]);
    return p;
  };
  let it = 0;
  let converged = false;
  for (; it < maxIt; it++) {
    order.sort((a, b) => fx[a] - fx[b] || a - b);
    const best = pts[order[0]];
    let spread = 0;
    for (let v = 1; v <= n; v++) {
      const p = pts[order[v]];
      for (let i = 0; i < n; i++) spread = Math.max(spread, Math.abs(p[i] - best[i]));
    }
    if (spread < xTol) { converged = true; break; }
    const w = order[n];
    centroid.fill(0);
    for (let v = 0; v < n; v++) { const p = pts[order[v]]; for (let i = 0; i < n; i++) centroid[i] += p[i] / n; }
    const xr = trial(-1, pts[w]);
    const fr = f(xr);
    if (fr < fx[order[0]]) {
      const xe = trial(-2, pts[w]);
      const fe = f(xe);
      if (fe < fr) { pts[w] = xe; fx[w] = fe; } else { pts[w] = xr; fx[w] = fr; }
      continue;
    }
    if (fr < fx[order[n - 1]]) { pts[w] = xr; fx[w] = fr; continue; }
    // contraction: outside when the reflected point beats the worst, inside otherwise
    const outside = fr < fx[w];
    const xc = trial(outside ? -0.5 : 0.5, pts[w]);
    const fc = f(xc);
    if (fc < (outside ? fr : fx[w])) { pts[w] = xc; fx[w] = fc; continue; }
    // shrink towards the best vertex
    for (let v = 1; v <= n; v++) {
      const k = order[v];
      for (let i = 0; i < n; i++) pts[k][i] = best[i] + 0.5 * (pts[k][i] - best[i]);
      fx[k] = f(pts[k]);
    }
  }
  order.sort((a, b) => fx[a] - fx[b] || a - b);
  return { x: Float64Array.from(pts[order[0]]), fx: fx[order[0]], iterations: it, converged };
}
