import { fail } from '../core/fail.js';

/**
 * Orthonormal basis of the span of the constant and `columns`, by modified Gram-Schmidt applied
 * twice per column (the second sweep removes what rounding left of earlier directions). A column
 * whose remainder is below 1e-10 of its own norm adds nothing new (e.g. a second constant) and is
 * dropped; the constant always comes first.
 * @param columns - regressors, each of length nt
 * @param nt - number of time points
 * @returns orthonormal columns (first = 1/sqrt(nt)), at most columns.length + 1
 * @example const q = orthonormalSpan(dctBasis(200, 2, 128), 200)
 */
export function orthonormalSpan(columns: readonly Float64Array[], nt: number): Float64Array[] {
  const q: Float64Array[] = [new Float64Array(nt).fill(1 / Math.sqrt(nt))];
  for (const col of columns) {
    if (col.length !== nt) fail('INVALID_ARGUMENT', `every basis column needs ${nt} values, got ${col.length}`);
    const c = Float64Array.from(col);
    let norm0 = 0;
    for (let t = 0; t < nt; t++) norm0 += c[t] * c[t];
    norm0 = Math.sqrt(norm0);
    if (!(norm0 > 0) || !Number.isFinite(norm0)) continue;
    for (let pass = 0; pass < 2; pass++) {
      for (const b of q) {
        let dot = 0;
        for (let t = 0; t < nt; t++) dot += b[t] * c[t];
        for (let t = 0; t < nt; t++) c[t] -= dot * b[t];
      }
    }
    let norm = 0;
    for (let t = 0; t < nt; t++) norm += c[t] * c[t];
    norm = Math.sqrt(norm);
    if (norm <= 1e-10 * norm0) continue;
    for (let t = 0; t < nt; t++) c[t] /= norm;
    q.push(c);
  }
  return q;
}

/**
 * Remove from every voxel's time series its least-squares fit on a basis (plus the constant), then
 * add the voxel's temporal mean back: y - Q Q'y + mean(y) with Q an orthonormal basis of
 * span{1, columns}. The result keeps each voxel's mean and loses everything the basis describes.
 * Works on the run layout (voxel fastest, then time); accumulations in Float64.
 * @param data - run values, length nVoxels * nt, voxel index fastest (not modified)
 * @param nVoxels - voxels per volume
 * @param nt - volumes
 * @param columns - regressors of length nt (a constant among them is harmless)
 * @param out - optional output (may be `data`)
 * @returns the filtered data and the rank of the removed space (constant included)
 * @throws BoldsweepError INVALID_ARGUMENT when sizes disagree, TOO_FEW_VOLUMES when the basis spans every series
 * @example const { data } = projectOutBasis(run.data, nx*ny*nz, nt, polynomialBasis(nt, 2))
 */
export function projectOutBasis(
  data: Float32Array,
  nVoxels: number,
  nt: number,
  columns: readonly Float64Array[],
  out?: Float32Array,
): { data: Float32Array; rank: number } {
  if (data.length !== nVoxels * nt) fail('INVALID_ARGUMENT', `data has ${data.length} values, expected ${nVoxels} voxels x ${nt} volumes`);
  const result = out ?? new Float32Array(data.length);
  if (result.length !== data.length) fail('INVALID_ARGUMENT', `out has ${result.length} values, expected ${data.length}`);
  const q = orthonormalSpan(columns, nt);
  if (q.length >= nt) fail('TOO_FEW_VOLUMES', `the drift basis has rank ${q.length} for ${nt} volumes and would remove every fluctuation`);
  // coefficients of the non-constant directions: c[k][v] = sum_t q_k[t] y_v[t] (the constant's
  // coefficient is mean*sqrt(nt), which is removed and added back, so it is never needed)
  const K = q.length - 1;
  const block = 4096;
  const coef = new Float64Array(K * block);
  const fit = new Float64Array(block);
  for (let v0 = 0; v0 < nVoxels; v0 += block) {
    const len = Math.min(block, nVoxels - v0);
    coef.fill(0);
    for (let t = 0; t < nt; t++) {
      const row = data.subarray(t * nVoxels + v0, t * nVoxels + v0 + len);
      for (let k = 0; k < K; k++) {
        const w = q[k + 1][t];
        const o = k * block;
        for (let j = 0; j < len; j++) coef[o + j] += w * row[j];
      }
    }
    for (let t = 0; t < nt; t++) {
      const base = t * nVoxels + v0;
      fit.fill(0, 0, len);
      for (let k = 0; k < K; k++) {
        const w = q[k + 1][t];
        const o = k * block;
        for (let j = 0; j < len; j++) fit[j] += w * coef[o + j];
      }
      for (let j = 0; j < len; j++) result[base + j] = data[base + j] - fit[j];
    }
  }
  return { data: result, rank: q.length };
}
