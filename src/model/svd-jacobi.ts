/** Thin singular value decomposition A = U diag(s) V' of a tall matrix. */
export interface Svd {
  /** Singular values, largest first (length n). */
  s: Float64Array;
  /** Left singular vectors, row-major m x n (column k belongs to s[k]; zero where s[k] is 0). */
  u: Float64Array;
  /** Right singular vectors, row-major n x n (column k belongs to s[k]). */
  v: Float64Array;
}

/**
 * Thin SVD of a small-width matrix by one-sided Jacobi rotations (Hestenes 1958, J SIAM 6(1):51-90;
 * Demmel J & Veselic K 1992, SIAM J Matrix Anal Appl 13(4):1204-1245). Rotations are applied to the
 * columns of A until every pair is orthogonal to working precision; singular values then come out
 * with high relative accuracy, unlike eigenvalues of A'A, which square the condition number. Meant
 * for design matrices (n up to ~100 columns, any number of rows).
 * @param a - row-major m x n matrix (not modified)
 * @param m - rows
 * @param n - columns (n <= m)
 * @returns s (descending), u (m x n), v (n x n)
 * @example const { s } = svdJacobi(Float64Array.from([1, 0, 0, 1, 1, 1]), 3, 2) // s = [sqrt(3), 1]
 */
export function svdJacobi(a: ArrayLike<number>, m: number, n: number): Svd {
  // work column-major so each rotation touches two contiguous columns
  const w = new Float64Array(m * n);
  for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) w[j * m + i] = a[i * n + j];
  const vc = new Float64Array(n * n); // column-major V
  for (let j = 0; j < n; j++) vc[j * n + j] = 1;
  const eps = 2.220446049250313e-16;
  for (let sweep = 0; sweep < 80; sweep++) {
    let rotated = false;
    for (let i = 0; i < n - 1; i++) {
      for (let j = i + 1; j < n; j++) {
        let alpha = 0;
        let beta = 0;
        let gamma = 0;
        const oi = i * m;
        const oj = j * m;
        for (let r = 0; r < m; r++) {
          const x = w[oi + r];
          const y = w[oj + r];
          alpha += x * x;
          beta += y * y;
          gamma += x * y;
        }
        if (alpha === 0 || beta === 0) continue;
        // stop rotating a pair once it is orthogonal to working precision (Demmel & Veselic criterion)
        if (Math.abs(gamma) <= eps * Math.sqrt(alpha * beta)) continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = c * t;
        for (let r = 0; r < m; r++) {
          const x = w[oi + r];
          const y = w[oj + r];
          w[oi + r] = c * x - s * y;
          w[oj + r] = s * x + c * y;
        }
        const vi = i * n;
        const vj = j * n;
        for (let r = 0; r < n; r++) {
          const x = vc[vi + r];
          const y = vc[vj + r];
          vc[vi + r] = c * x - s * y;
          vc[vj + r] = s * x + c * y;
        }
      }
    }
    if (!rotated) break;
  }
  const norms = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let ss = 0;
    for (let r = 0; r < m; r++) ss += w[j * m + r] * w[j * m + r];
    norms[j] = Math.sqrt(ss);
  }
  const order = Array.from({ length: n }, (_, k) => k).sort((p, q) => norms[q] - norms[p] || p - q);
  const s = new Float64Array(n);
  const u = new Float64Array(m * n);
  const v = new Float64Array(n * n);
  order.forEach((src, k) => {
    s[k] = norms[src];
    const inv = norms[src] > 0 ? 1 / norms[src] : 0;
    for (let r = 0; r < m; r++) u[r * n + k] = w[src * m + r] * inv;
    for (let r = 0; r < n; r++) v[r * n + k] = vc[src * n + r];
  });
  return { s, u, v };
}
