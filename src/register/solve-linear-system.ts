/**
 * Solve A x = b for a small dense system by Gaussian elimination with partial pivoting.
 * @param a - n x n, row-major (not modified)
 * @param b - length n (not modified)
 * @returns x, or null when a pivot is below 1e-12 times the largest entry of A (singular)
 * @example solveLinearSystem(Float64Array.from([2, 0, 0, 4]), Float64Array.from([2, 8])) // [1, 2]
 */
export function solveLinearSystem(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array | null {
  const n = b.length;
  const m = Float64Array.from(a);
  const x = Float64Array.from(b);
  let scale = 0;
  for (let i = 0; i < m.length; i++) scale = Math.max(scale, Math.abs(m[i]));
  if (!(scale > 0)) return null;
  for (let c = 0; c < n; c++) {
    let piv = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r * n + c]) > Math.abs(m[piv * n + c])) piv = r;
    if (!(Math.abs(m[piv * n + c]) > 1e-12 * scale)) return null;
    if (piv !== c) {
      for (let k = 0; k < n; k++) { const t = m[c * n + k]; m[c * n + k] = m[piv * n + k]; m[piv * n + k] = t; }
      const t = x[c]; x[c] = x[piv]; x[piv] = t;
    }
    for (let r = c + 1; r < n; r++) {
      const f = m[r * n + c] / m[c * n + c];
      if (f === 0) continue;
      for (let k = c; k < n; k++) m[r * n + k] -= f * m[c * n + k];
      x[r] -= f * x[c];
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let s = x[r];
    for (let k = r + 1; k < n; k++) s -= m[r * n + k] * x[k];
    x[r] = s / m[r * n + r];
  }
  return x;
}
