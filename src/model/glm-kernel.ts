/*
 * Inner loops of the voxelwise GLM, shared by OLS and AR(1) fits. Private to src/model (not exported
 * from the barrel). Layout choices, all for speed in plain JavaScript (no SIMD):
 * - a voxel's series is read straight from the Float32 run (stride nvox per volume), two voxels at a
 *   time; consecutive voxels share cache lines, so the ~nt lines a pair touches are reused by the
 *   next pairs and the run streams through the cache once (a gathered copy of each block was tried
 *   and was slower);
 * - projectors are stored t-major (nt x p) so the loop over t walks them forward;
 * - two voxels share each projector load, and columns go three at a time into six scalar
 *   accumulators (registers), so the hot loop does no stores; Float64 accumulation throughout.
 */

/**
 * Betas of one or two voxels: beta_j = sum_t proj[t, j] y_t, with proj t-major (nt x p) at offset po.
 * @param data - run data (nt volumes of nvox voxels)
 * @param nvox - voxels per volume
 * @param ya - index of the first voxel within a volume
 * @param yb - index of the second voxel, or -1 for one voxel only
 * @param proj - projector(s), t-major
 * @param po - offset of this projector in proj
 * @param nt - volumes
 * @param p - columns
 * @param out - betas: first voxel at out[0..p), second at out[p..2p)
 * @example projectPair(run.data, nvox, 10, 11, proj, 0, nt, p, b)
 */
export function projectPair(data: Float32Array, nvox: number, ya: number, yb: number, proj: Float64Array, po: number, nt: number, p: number, out: Float64Array): void {
  let j = 0;
  if (yb >= 0) {
    for (; j + 2 < p; j += 3) {
      let a0 = 0, a1 = 0, a2 = 0, c0 = 0, c1 = 0, c2 = 0;
      for (let t = 0, q = po + j, o = 0; t < nt; t++, q += p, o += nvox) {
        const y1 = data[o + ya];
        const y2 = data[o + yb];
        const w0 = proj[q], w1 = proj[q + 1], w2 = proj[q + 2];
        a0 += w0 * y1; a1 += w1 * y1; a2 += w2 * y1;
        c0 += w0 * y2; c1 += w1 * y2; c2 += w2 * y2;
      }
      out[j] = a0; out[j + 1] = a1; out[j + 2] = a2;
      out[p + j] = c0; out[p + j + 1] = c1; out[p + j + 2] = c2;
    }
    for (; j < p; j++) {
      let a0 = 0, c0 = 0;
      for (let t = 0, q = po + j, o = 0; t < nt; t++, q += p, o += nvox) {
        a0 += proj[q] * data[o + ya];
        c0 += proj[q] * data[o + yb];
      }
      out[j] = a0;
      out[p + j] = c0;
    }
    return;
  }
  for (; j + 2 < p; j += 3) {
    let a0 = 0, a1 = 0, a2 = 0;
    for (let t = 0, q = po + j, o = 0; t < nt; t++, q += p, o += nvox) {
      const y1 = data[o + ya];
      a0 += proj[q] * y1; a1 += proj[q + 1] * y1; a2 += proj[q + 2] * y1;
    }
    out[j] = a0; out[j + 1] = a1; out[j + 2] = a2;
  }
  for (; j < p; j++) {
    let a0 = 0;
    for (let t = 0, q = po + j, o = 0; t < nt; t++, q += p, o += nvox) a0 += proj[q] * data[o + ya];
    out[j] = a0;
  }
}

/**
 * Betas of two voxels with different projectors (AR(1) bins): like {@link projectPair} but the
 * second voxel uses the projector at offset pb.
 * @param data - run data (nt volumes of nvox voxels)
 * @param nvox - voxels per volume
 * @param ya - index of the first voxel within a volume
 * @param yb - index of the second voxel
 * @param proj - projectors, t-major
 * @param pa - offset of the first voxel's projector
 * @param pb - offset of the second voxel's projector
 * @param nt - volumes
 * @param p - columns
 * @param out - betas: first voxel at out[0..p), second at out[p..2p)
 * @example projectPairMixed(run.data, nvox, 10, 11, proj, 0, nt * p, nt, p, b)
 */
export function projectPairMixed(data: Float32Array, nvox: number, ya: number, yb: number, proj: Float64Array, pa: number, pb: number, nt: number, p: number, out: Float64Array): void {
  let j = 0;
  for (; j + 2 < p; j += 3) {
    let a0 = 0, a1 = 0, a2 = 0, c0 = 0, c1 = 0, c2 = 0;
    for (let t = 0, q = pa + j, r = pb + j, o = 0; t < nt; t++, q += p, r += p, o += nvox) {
      const y1 = data[o + ya];
      const y2 = data[o + yb];
      a0 += proj[q] * y1; a1 += proj[q + 1] * y1; a2 += proj[q + 2] * y1;
      c0 += proj[r] * y2; c1 += proj[r + 1] * y2; c2 += proj[r + 2] * y2;
    }
    out[j] = a0; out[j + 1] = a1; out[j + 2] = a2;
    out[p + j] = c0; out[p + j + 1] = c1; out[p + j + 2] = c2;
  }
  for (; j < p; j++) {
    let a0 = 0, c0 = 0;
    for (let t = 0, q = pa + j, r = pb + j, o = 0; t < nt; t++, q += p, r += p, o += nvox) {
      a0 += proj[q] * data[o + ya];
      c0 += proj[r] * data[o + yb];
    }
    out[j] = a0;
    out[p + j] = c0;
  }
}

/**
 * Residuals e = y - X b of one or two voxels, optionally AR(1)-whitened (e~_0 = sqrt(1-rho^2) e_0,
 * e~_t = e_t - rho e_{t-1}); the residuals are written into ea / eb (length nt each), and
 * out = [RSS of first, RSS of second, sum of y of first, sum of y of second]. A second pass over the
 * data rather than y'y - b'X'y: see fitGlm for why.
 * @param data - run data (nt volumes of nvox voxels)
 * @param nvox - voxels per volume
 * @param ya - index of the first voxel within a volume
 * @param yb - index of the second voxel, or -1
 * @param x - design, row-major nt x p
 * @param nt - volumes
 * @param p - columns
 * @param b - betas (first voxel [0,p), second [p,2p))
 * @param rhoA - AR(1) coefficient for whitening the first voxel's residuals (0: none)
 * @param rhoB - the same for the second voxel
 * @param ea - residual output for the first voxel
 * @param eb - residual output for the second voxel
 * @param out - output, length 4
 * @example residualPair(run.data, nvox, 10, -1, x, nt, p, b, 0, 0, ea, eb, out)
 */
export function residualPair(data: Float32Array, nvox: number, ya: number, yb: number, x: Float64Array, nt: number, p: number, b: Float64Array, rhoA: number, rhoB: number, ea: Float64Array, eb: Float64Array, out: Float64Array): void {
  const two = yb >= 0;
  // columns three at a time (missing columns get weight 0 and a clamped x index); the first group
  // reads the data, later groups update e, and the last group sums squares when no whitening follows
  const sumInLoop = rhoA === 0 && rhoB === 0;
  let ra = 0, rb = 0, sa = 0, sb = 0;
  for (let j = 0; j < p; j += 3) {
    const last = j + 3 >= p;
    const k1 = j + 1 < p ? 1 : 0;
    const k2 = j + 2 < p ? 2 : k1;
    const b0 = b[j], b1 = k1 ? b[j + 1] : 0, b2 = j + 2 < p ? b[j + 2] : 0;
    const sq = last && sumInLoop;
    if (two) {
      const d0 = b[p + j], d1 = k1 ? b[p + j + 1] : 0, d2 = j + 2 < p ? b[p + j + 2] : 0;
      if (j === 0) {
        for (let t = 0, q = 0, o = 0; t < nt; t++, q += p, o += nvox) {
          const x0 = x[q], x1 = x[q + k1], x2 = x[q + k2];
          const y1 = data[o + ya];
          const y2 = data[o + yb];
          sa += y1;
          sb += y2;
          const fa = y1 - (x0 * b0 + x1 * b1 + x2 * b2);
          const fb = y2 - (x0 * d0 + x1 * d1 + x2 * d2);
          ea[t] = fa;
          eb[t] = fb;
          if (sq) { ra += fa * fa; rb += fb * fb; }
        }
      } else {
        for (let t = 0, q = j; t < nt; t++, q += p) {
          const x0 = x[q], x1 = x[q + k1], x2 = x[q + k2];
          const fa = ea[t] - (x0 * b0 + x1 * b1 + x2 * b2);
          const fb = eb[t] - (x0 * d0 + x1 * d1 + x2 * d2);
          ea[t] = fa;
          eb[t] = fb;
          if (sq) { ra += fa * fa; rb += fb * fb; }
        }
      }
    } else if (j === 0) {
      for (let t = 0, q = 0, o = 0; t < nt; t++, q += p, o += nvox) {
        const y1 = data[o + ya];
        sa += y1;
        const fa = y1 - (x[q] * b0 + x[q + k1] * b1 + x[q + k2] * b2);
        ea[t] = fa;
        if (sq) ra += fa * fa;
      }
    } else {
      for (let t = 0, q = j; t < nt; t++, q += p) {
        const fa = ea[t] - (x[q] * b0 + x[q + k1] * b1 + x[q + k2] * b2);
        ea[t] = fa;
        if (sq) ra += fa * fa;
      }
    }
  }
  if (!sumInLoop) {
    whitenInPlace(ea, nt, rhoA);
    for (let t = 0; t < nt; t++) ra += ea[t] * ea[t];
    if (two) {
      whitenInPlace(eb, nt, rhoB);
      for (let t = 0; t < nt; t++) rb += eb[t] * eb[t];
    }
  }
  out[0] = ra;
  out[1] = rb;
  out[2] = sa;
  out[3] = sb;
}

/** Prais-Winsten AR(1) whitening of a series in place (walks backwards so no copy is needed). */
export function whitenInPlace(e: Float64Array, nt: number, rho: number): void {
  for (let t = nt - 1; t >= 1; t--) e[t] -= rho * e[t - 1];
  e[0] *= Math.sqrt(1 - rho * rho);
}

/** What {@link sweepVoxels} reads and writes. Compact arrays are indexed by position in `idx`. */
export interface VoxelSweep {
  /** Run data (nt volumes of nvox voxels). */
  data: Float32Array;
  nvox: number;
  nt: number;
  p: number;
  /** Voxels to fit (indices within a volume). */
  idx: Int32Array;
  /** Design, row-major nt x p (used for residuals). */
  x: Float64Array;
  /** Projectors of all groups, each t-major nt x p, concatenated (group g at g * nt * p). */
  proj: Float64Array;
  /** Group of each voxel (compact), or null for group 0 everywhere. */
  group: Uint16Array | null;
  /** Whitening coefficient of each group (residuals are whitened with it), or null for none. */
  rhoOfGroup: Float64Array | null;
  /** Output betas, p x n (row j at j * n). */
  betas: Float64Array;
  /** Output residual sums of squares. */
  rss: Float64Array;
  /** Output temporal means, when given. */
  mean: Float64Array | null;
  /** Output sum_t e_t e_{t-1} of the (unwhitened) residuals, when given. */
  lag1: Float64Array | null;
  /** Output residual run (full size), when given. */
  residuals: Float32Array | null;
}

/**
 * Fit every voxel of `s.idx`: betas by projection, then residuals in a second pass (the pair's
 * cache lines are still warm). Neighbouring voxels go in pairs, sharing projector loads when they
 * share a group.
 * @param s - inputs and outputs
 * @example sweepVoxels({ data, nvox, nt, p, idx, x, proj, group: null, rhoOfGroup: null, betas, rss, mean: null, lag1: null, residuals: null })
 */
export function sweepVoxels(s: VoxelSweep): void {
  const { data, nvox, nt, p, idx, x, proj, group, rhoOfGroup, betas, rss, mean, lag1, residuals } = s;
  const n = idx.length;
  const b = new Float64Array(2 * p);
  const ea = new Float64Array(nt);
  const eb = new Float64Array(nt);
  const r = new Float64Array(4);
  const size = nt * p;
  let i = 0;
  while (i < n) {
    const pair = i + 1 < n;
    const ga = group ? group[i] : 0;
    const gb = group && pair ? group[i + 1] : ga;
    const ya = idx[i];
    const yb = pair ? idx[i + 1] : -1;
    if (ga === gb) projectPair(data, nvox, ya, yb, proj, ga * size, nt, p, b);
    else projectPairMixed(data, nvox, ya, yb, proj, ga * size, gb * size, nt, p, b);
    const rhoA = rhoOfGroup ? rhoOfGroup[ga] : 0;
    const rhoB = rhoOfGroup ? rhoOfGroup[gb] : 0;
    if (lag1) {
      // unwhitened residuals first, for the autocorrelation, then whitened RSS
      residualPair(data, nvox, ya, yb, x, nt, p, b, 0, 0, ea, eb, r);
      lag1[i] = lagProduct(ea, nt);
      if (pair) lag1[i + 1] = lagProduct(eb, nt);
      if (rhoA !== 0) {
        whitenInPlace(ea, nt, rhoA);
        r[0] = sumSquares(ea, nt);
      }
      if (pair && rhoB !== 0) {
        whitenInPlace(eb, nt, rhoB);
        r[1] = sumSquares(eb, nt);
      }
    } else {
      residualPair(data, nvox, ya, yb, x, nt, p, b, rhoA, rhoB, ea, eb, r);
    }
    for (let k = 0, c = pair ? 2 : 1; k < c; k++) {
      const at = i + k;
      for (let j = 0; j < p; j++) betas[j * n + at] = b[k * p + j];
      rss[at] = r[k];
      if (mean) mean[at] = r[2 + k] / nt;
      if (residuals) {
        const e = k === 0 ? ea : eb;
        const vox = idx[at];
        for (let t = 0; t < nt; t++) residuals[t * nvox + vox] = e[t];
      }
    }
    i += pair ? 2 : 1;
  }
}

function lagProduct(e: Float64Array, nt: number): number {
  let acc = 0;
  for (let t = 1; t < nt; t++) acc += e[t] * e[t - 1];
  return acc;
}

function sumSquares(e: Float64Array, nt: number): number {
  let acc = 0;
  for (let t = 0; t < nt; t++) acc += e[t] * e[t];
  return acc;
}

/**
 * Row-major p x nt (as the design's pseudo-inverse is stored) -> t-major nt x p (as the kernels read it).
 * @param a - p x nt matrix, row-major
 * @param p - rows
 * @param nt - columns
 * @returns the nt x p matrix, row-major
 * @example const proj = transposeToTimeMajor(pinv, p, nt)
 */
export function transposeToTimeMajor(a: Float64Array, p: number, nt: number): Float64Array {
  const out = new Float64Array(nt * p);
  for (let j = 0; j < p; j++) for (let t = 0; t < nt; t++) out[t * p + j] = a[j * nt + t];
  return out;
}
