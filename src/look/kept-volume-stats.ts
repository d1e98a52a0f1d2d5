import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import type { RunTimeSums } from './run-time-sums.js';

/** Per-voxel statistics over the kept volumes, from {@link keptVolumeStats}; maps are Float32, NIfTI order. */
export interface KeptVolumeStats {
  /** Mean over the kept volumes (signal units). */
  mean: Float32Array;
  /** SD of the residuals after the polynomial drift fitted over the kept volumes, ddof = detrendOrder + 1 (signal units). */
  sd: Float32Array;
  /** mean / sd; 0 where sd is 0. */
  tsnr: Float32Array;
  /** Lag-1 autocorrelation of those residuals (pairs of kept neighbours); 0 where sd is 0, NaN outside `mask`. */
  lag1: Float32Array;
  /** Drift fit over the kept volumes for voxels in `mask`: y_t ~ shift + sum_k fit[k][v] basis[k][t] (0 elsewhere). */
  fit: Float64Array[];
  /**
   * For the voxels in `mask` with finite values (ascending): bounds on max |r_t| over the kept volumes
   * (upper +Infinity where the sums hold no residual extremes). See screenSpikeVoxels.
   */
  residualBounds: { voxels: Int32Array; lower: Float64Array; upper: Float64Array };
  firstVolume: number;
  keptVolumes: number[];
  usedVolumes: number;
  detrendOrder: number;
  /** Degrees of freedom subtracted in the SD denominator (drift terms). */
  ddof: number;
}

/**
 * Mean, drift-removed SD, tSNR and lag-1 autocorrelation over the kept volumes (from `firstVolume`,
 * censored volumes left out) from whole-run sums, reading only the volumes left out and a few
 * neighbours. Definitions are those of voxelTimeStats: residuals r of a least-squares polynomial of
 * order detrendOrder fitted over the kept volumes, SD = sqrt(sum r^2 / (T - p)), lag-1 =
 * sum over kept neighbour pairs r_t r_{t-1} / sum r^2.
 *
 * How, with z = y - shift and W(t) the drift terms (W_0 = 1):
 * - SD: the kept sums are the whole-run sums minus the left-out volumes' terms, b = sum_K z W and
 *   sum_K z^2. With G = sum_K W W^T = L L^T (Cholesky) the fit is a = G^-1 b and
 *   sum r^2 = sum_K z^2 - |L^-1 b|^2.
 * - Lag-1: the sums hold sum u_t u_{t-1} for u = z - c.W, the residuals of the fit c over the volumes
 *   from fitFrom (F). With d = a - c, r = u - d.W, so over kept pairs
 *   sum r_t r_{t-1} = sum u_t u_{t-1} - d.(B + C) + d^T D d, B = sum u_t W(t-1), C = sum u_{t-1} W(t),
 *   D = sum W(t) W(t-1)^T. Over all pairs of F, u is orthogonal to every W and W(t -+ 1) is a fixed
 *   linear map of W(t) (a shifted polynomial is a polynomial of the same order), so B = -u_h W(h-1) and
 *   C = -u_{N-1} W(N) there; the pairs that dropping and censoring remove from F, or add before it, are
 *   corrected term by term from the data.
 * - Bounds on max |r| over the kept volumes (for the spike screen): r = u - d.W with |d.W| <= gap =
 *   sum_k |d_k| max |W_k| over kept fit volumes, so max |r| <= max |u| + gap there; when no fit volume
 *   is censored the largest |u| is at a kept volume, so max |r| >= max |u| - gap too. Kept volumes
 *   before fitFrom are read and their |r| taken exactly.
 * @param run - the run the sums came from (only left-out volumes and a few others are read)
 * @param sums - from runTimeSums
 * @param options - firstVolume (default 0); censorVolumes (default none); mask: voxels that need lag-1 and the fit (default all)
 * @returns the maps and bookkeeping; voxels with any non-finite value get NaN everywhere
 * @throws BoldsweepError INVALID_ARGUMENT for a firstVolume outside the run; TOO_FEW_VOLUMES when T <= p
 * @example const s = keptVolumeStats(run, runTimeSums(run), { firstVolume: 3, censorVolumes: [40] })
 */
export function keptVolumeStats(run: Volume, sums: RunTimeSums, options: { firstVolume?: number; censorVolumes?: readonly number[]; mask?: ArrayLike<number> } = {}): KeptVolumeStats {
  const N = sums.nt;
  const p = sums.terms;
  const n = voxelsPerVolume(run);
  if (run.dims[3] !== N || sums.shift.length !== n) fail('INVALID_ARGUMENT', 'the sums were made from another run');
  const firstVolume = options.firstVolume ?? 0;
  if (!Number.isInteger(firstVolume) || firstVolume < 0 || firstVolume >= N) fail('INVALID_ARGUMENT', `firstVolume must be in 0..${N - 1}, got ${firstVolume}`);
  const censored = new Set(options.censorVolumes ?? []);
  const isKept = new Uint8Array(N);
  const kept: number[] = [];
  for (let t = firstVolume; t < N; t++) if (!censored.has(t)) { isKept[t] = 1; kept.push(t); }
  const T = kept.length;
  if (T <= p) fail('TOO_FEW_VOLUMES', `removing a polynomial drift of order ${p - 1} needs more than ${p} volumes, got ${T}`);
  const W = sums.basis; // W[0] = 1
  const h = sums.fitFrom;
  const wAt = (t: number): number[] => Array.from({ length: p }, (_, k) => W[k][t]);

  // fixed p x p matrices: G over kept volumes, D over kept pairs; the terms one volume outside the run
  const G = new Float64Array(p * p), D = new Float64Array(p * p);
  for (const t of kept) for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) G[i * p + j] += W[i][t] * W[j][t];
  for (let t = 1; t < N; t++) if (isKept[t] && isKept[t - 1]) for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) D[i * p + j] += W[i][t] * W[j][t - 1];
  const LG = cholesky(G, p);
  const before = mulVec(shiftMap(W, N, p, -1), wAt(h), p); // W(h - 1)
  const after = mulVec(shiftMap(W, N, p, +1), wAt(N - 1), p); // W(N)
  // pairs (t-1, t) of F that are not kept pairs (sign -1), and kept pairs before or at the start of F (+1)
  const pairs: Array<[number, number]> = [];
  for (let t = 1; t < N; t++) {
    const inF = t - 1 >= h, inK = isKept[t] === 1 && isKept[t - 1] === 1;
    if (inF && !inK) pairs.push([t, -1]);
    if (!inF && inK) pairs.push([t, +1]);
  }
  const left: number[] = [];
  for (let t = 0; t < N; t++) if (!isKept[t]) left.push(t);
  const early = kept.filter((t) => t < h);
  const lateCount = T - early.length;
  const wMax = new Float64Array(p);
  for (const t of kept) if (t >= h) for (let k = 0; k < p; k++) wMax[k] = Math.max(wMax[k], Math.abs(W[k][t]));

  // volumes read: the left-out ones (SD, every voxel) first, then for mask voxels h, N - 1, both ends of
  // the corrected pairs (lag-1) and the kept volumes before h (residual bounds)
  const extraSet = new Set<number>([h, N - 1, ...early]);
  for (const [t] of pairs) { extraSet.add(t); extraSet.add(t - 1); }
  for (const t of left) extraSet.delete(t);
  const reads = [...left, ...[...extraSet].sort((a, b) => a - b)];
  const slot = new Map(reads.map((t, i) => [t, i]));
  const plan: CorrectionPlan = {
    p, T, LG, D,
    readBase: Int32Array.from(reads, (t) => t * n),
    readW: Float64Array.from(reads.flatMap(wAt)),
    nLeft: left.length,
    earlySlot: Int32Array.from(early, (t) => slot.get(t)!),
    lagSlot: Int32Array.from(new Set([h, N - 1, ...pairs.flatMap(([t]) => [t, t - 1])]), (t) => slot.get(t)!),
    wMax, haveLate: lateCount > 0, fitAllKept: lateCount === N - h,
    // rounding allowance of the bounds: the sums and fits carry relative errors of order 1e-15, and the
    // kernel steps the drift by forward differences, whose error grows with the number of volumes
    slackPerScale: 1e-13 * Math.max(100, N),
    pairT: Int32Array.from(pairs, ([t]) => slot.get(t)!),
    pairPrev: Int32Array.from(pairs, ([t]) => slot.get(t - 1)!),
    pairSign: Float64Array.from(pairs, ([, s]) => s),
    slotH: slot.get(h)!, slotN: slot.get(N - 1)!,
    before: Float64Array.from(before), after: Float64Array.from(after),
  };
  const mean = new Float32Array(n), sd = new Float32Array(n), tsnr = new Float32Array(n), lag1 = new Float32Array(n);
  const fit = Array.from({ length: p }, () => new Float64Array(n));
  const m = options.mask ?? null;
  const maskCount = m ? countNonzero(m) : n;
  const bounds = { voxels: new Int32Array(maskCount), lower: new Float64Array(maskCount), upper: new Float64Array(maskCount), count: 0 };
  const outMaps: OutMaps = { mean, sd, tsnr, lag1, fit, unsummed: new Int32Array(maskCount + 1), bounds };
  // in chunks: the loops stay small functions that V8 optimises once and keeps across calls; the default
  // drift order (2) has its own straight-line loop (the generic one spends its time in 3-step loops)
  for (let v0 = 0; v0 < n; v0 += 4096) {
    if (p === 3) correctVoxels3(run.data, n, v0, Math.min(n, v0 + 4096), sums, plan, m, outMaps);
    else correctVoxels(run.data, n, v0, Math.min(n, v0 + 4096), sums, plan, m, outMaps);
  }
  // mask voxels whose residual sums were skipped (below the sums' background level): lag-1 from the data
  // (the count sits in the last slot: a typed array keeps the hot loop's object shapes fixed)
  const nUnsummed = outMaps.unsummed[maskCount];
  if (nUnsummed) lagFromData(run, W, kept, isKept, Array.from(outMaps.unsummed.subarray(0, nUnsummed)), fit, sums.shift, lag1);
  const c = bounds.count;
  const residualBounds = { voxels: bounds.voxels.subarray(0, c), lower: bounds.lower.subarray(0, c), upper: bounds.upper.subarray(0, c) };
  return { mean, sd, tsnr, lag1, fit, residualBounds, firstVolume, keptVolumes: kept, usedVolumes: T, detrendOrder: p - 1, ddof: p };
}

/** Nonzero entries (its own small function, so the count over all voxels runs optimised). */
function countNonzero(mask: ArrayLike<number>): number {
  let c = 0;
  for (let v = 0; v < mask.length; v++) if (mask[v]) c++;
  return c;
}

/** Fixed quantities of the correction, shared by every voxel. */
interface CorrectionPlan {
  p: number; T: number; LG: Float64Array; D: Float64Array;
  /** Per read volume: its offset in the run and its drift terms (p each); the left-out volumes come first. */
  readBase: Int32Array; readW: Float64Array; nLeft: number;
  /** Kept volumes before fitFrom; the largest |W_k| over kept fit volumes; whether any, and all, fit volumes are kept. */
  earlySlot: Int32Array; wMax: Float64Array; haveLate: boolean; fitAllKept: boolean; slackPerScale: number;
  /** Read slots where lag-1 needs the residual u (fitFrom, N - 1, ends of corrected pairs). */
  lagSlot: Int32Array;
  /** Corrected pairs: read slots of t and t - 1, and whether the pair is removed (-1) or added (+1). */
  pairT: Int32Array; pairPrev: Int32Array; pairSign: Float64Array;
  slotH: number; slotN: number;
  /** W(fitFrom - 1) and W(N), one volume beyond each end of the fit volumes. */
  before: Float64Array; after: Float64Array;
}

interface OutMaps {
  mean: Float32Array; sd: Float32Array; tsnr: Float32Array; lag1: Float32Array; fit: Float64Array[];
  /** Mask voxels whose residual sums were skipped; their count in the last slot. */
  unsummed: Int32Array;
  bounds: { voxels: Int32Array; lower: Float64Array; upper: Float64Array; count: number };
}

/**
 * Bounds on max |r| over the kept volumes of one voxel (see keptVolumeStats): from the residual extremes
 * of the sums widened by `gap`, and the exact |r| of the kept volumes before fitFrom (in `early`).
 */
function storeBounds(out: OutMaps['bounds'], v: number, uAbs: number, gap: number, slack: number, early: number, haveLate: boolean, fitAllKept: boolean): void {
  // (voxels whose residual sums were skipped have uAbs = Infinity: no bound either way)
  const upper = haveLate ? uAbs + gap + slack : 0;
  const lower = haveLate && fitAllKept && uAbs < Infinity ? uAbs - gap - slack : 0;
  const i = out.count++;
  out.voxels[i] = v;
  out.upper[i] = Math.max(upper, early);
  out.lower[i] = Math.max(lower, early);
}

/**
 * The per-voxel part of keptVolumeStats for voxels v0..v1-1 (its own function, called per chunk, so V8
 * optimises it once and keeps it instead of re-entering one long loop through on-stack replacement).
 */
function correctVoxels(data: Float32Array, n: number, v0: number, v1: number, sums: RunTimeSums, c: CorrectionPlan, mask: ArrayLike<number> | null, out: OutMaps): void {
  const { p, T, LG, D, readBase, readW, nLeft, earlySlot, lagSlot, wMax, haveLate, fitAllKept, pairT, pairPrev, pairSign, slotH, slotN, before, after } = c;
  const { mean, sd, tsnr, lag1, fit } = out;
  const { shift, sumSquares, moments, fit: g, residualLag, residualAbsMax } = sums;
  const slackPerScale = c.slackPerScale;
  const nRead = readBase.length, nPairs = pairT.length;
  const z = new Float64Array(nRead), u = new Float64Array(nRead);
  const b = new Float64Array(p), y = new Float64Array(p), a = new Float64Array(p), d = new Float64Array(p);
  for (let v = v0; v < v1; v++) {
    const sh = shift[v];
    if (!Number.isFinite(sh + moments[0][v])) { mean[v] = sd[v] = tsnr[v] = lag1[v] = NaN; continue; }
    let ss = sumSquares[v];
    for (let k = 0; k < p; k++) b[k] = moments[k][v];
    for (let e = 0; e < nLeft; e++) {
      const ze = data[readBase[e] + v] - sh;
      z[e] = ze;
      ss -= ze * ze;
      for (let k = 0; k < p; k++) b[k] -= ze * readW[e * p + k];
    }
    // y = L^-1 b; sum r^2 = sum z^2 - |y|^2
    let proj = 0;
    for (let i = 0; i < p; i++) {
      let s = b[i];
      for (let j = 0; j < i; j++) s -= LG[i * p + j] * y[j];
      const yi = s / LG[i * p + i];
      y[i] = yi;
      proj += yi * yi;
    }
    const ssr = Math.max(0, ss - proj);
    const m = sh + b[0] / T;
    // below Float32 resolution (6e-8 relative) any "variation" is rounding: call it 0
    const raw = Math.sqrt(ssr / (T - p));
    const sdv = raw > 1e-9 * Math.abs(m) ? raw : 0;
    mean[v] = m;
    sd[v] = sdv;
    tsnr[v] = sdv > 0 ? m / sdv : 0;
    if (mask !== null && !mask[v]) { lag1[v] = NaN; continue; }
    for (let i = nLeft; i < nRead; i++) z[i] = data[readBase[i] + v] - sh;
    // a = L^-T y
    for (let i = p - 1; i >= 0; i--) {
      let s = y[i];
      for (let j = i + 1; j < p; j++) s -= LG[j * p + i] * a[j];
      const ai = s / LG[i * p + i];
      a[i] = ai;
      fit[i][v] = ai;
    }
    let gap = 0, scale = Math.abs(sh), early = 0;
    for (let k = 0; k < p; k++) { d[k] = a[k] - g[k][v]; gap += Math.abs(d[k]) * wMax[k]; scale += Math.abs(g[k][v]) * wMax[k]; }
    for (let q = 0; q < earlySlot.length; q++) {
      const i = earlySlot[q];
      let r = z[i];
      for (let k = 0; k < p; k++) r -= a[k] * readW[i * p + k];
      if (Math.abs(r) > early) early = Math.abs(r);
    }
    storeBounds(out.bounds, v, residualAbsMax[v], gap, slackPerScale * scale, early, haveLate, fitAllKept);
    if (!(sdv > 0)) { lag1[v] = 0; continue; }
    if (!(residualAbsMax[v] < Infinity)) { const u0 = out.unsummed, last = u0.length - 1; u0[u0[last]++] = v; continue; }
    for (let q = 0; q < lagSlot.length; q++) {
      const i = lagSlot[q];
      let s = z[i];
      for (let k = 0; k < p; k++) s -= g[k][v] * readW[i * p + k];
      u[i] = s;
    }
    let U = residualLag[v], dBC = 0, dDd = 0;
    for (let k = 0; k < p; k++) dBC -= d[k] * (u[slotH] * before[k] + u[slotN] * after[k]);
    for (let q = 0; q < nPairs; q++) {
      const s = pairSign[q], ut = u[pairT[q]], up = u[pairPrev[q]];
      U += s * ut * up;
      for (let k = 0; k < p; k++) dBC += s * d[k] * (ut * readW[pairPrev[q] * p + k] + up * readW[pairT[q] * p + k]);
    }
    for (let k = 0; k < p; k++) for (let l = 0; l < p; l++) dDd += d[k] * D[k * p + l] * d[l];
    lag1[v] = (U - dBC + dDd) / ssr;
  }
}

/** correctVoxels for p = 3 (drift order 2) with every small loop written out (and reciprocals instead of divisions). */
function correctVoxels3(data: Float32Array, n: number, v0: number, v1: number, sums: RunTimeSums, c: CorrectionPlan, mask: ArrayLike<number> | null, out: OutMaps): void {
  const { T, LG, D, readBase, readW, nLeft, earlySlot, lagSlot, wMax, haveLate, fitAllKept, pairT, pairPrev, pairSign, slotH, slotN, before, after } = c;
  const { mean, sd, tsnr, lag1 } = out;
  const [f0, f1, f2] = out.fit;
  const { shift, sumSquares, residualLag, residualAbsMax } = sums;
  const slackPerScale = c.slackPerScale;
  const [m0, m1, m2] = sums.moments;
  const [g0, g1, g2] = sums.fit;
  const L10 = LG[3], L20 = LG[6], L21 = LG[7];
  const r00 = 1 / LG[0], r11 = 1 / LG[4], r22 = 1 / LG[8], rT = 1 / T;
  const w0 = wMax[0], w1 = wMax[1], w2 = wMax[2];
  const z = new Float64Array(readBase.length), u = new Float64Array(readBase.length);
  const nRead = readBase.length, nPairs = pairT.length, nEarly = earlySlot.length, nLag = lagSlot.length;
  const ddofT = T - 3;
  const bh0 = before[0], bh1 = before[1], bh2 = before[2], an0 = after[0], an1 = after[1], an2 = after[2];
  for (let v = v0; v < v1; v++) {
    const sh = shift[v];
    let b0 = m0[v], b1 = m1[v], b2 = m2[v];
    if (!Number.isFinite(sh + b0)) { mean[v] = sd[v] = tsnr[v] = lag1[v] = NaN; continue; }
    let ss = sumSquares[v];
    for (let e = 0; e < nLeft; e++) {
      const ze = data[readBase[e] + v] - sh;
      z[e] = ze;
      ss -= ze * ze;
      b0 -= ze * readW[3 * e]; b1 -= ze * readW[3 * e + 1]; b2 -= ze * readW[3 * e + 2];
    }
    const y0 = b0 * r00;
    const y1 = (b1 - L10 * y0) * r11;
    const y2 = (b2 - L20 * y0 - L21 * y1) * r22;
    const ssr = Math.max(0, ss - (y0 * y0 + y1 * y1 + y2 * y2));
    const m = sh + b0 * rT;
    const raw = Math.sqrt(ssr / ddofT);
    const sdv = raw > 1e-9 * Math.abs(m) ? raw : 0;
    mean[v] = m;
    sd[v] = sdv;
    tsnr[v] = sdv > 0 ? m / sdv : 0;
    if (mask !== null && !mask[v]) { lag1[v] = NaN; continue; }
    for (let i = nLeft; i < nRead; i++) z[i] = data[readBase[i] + v] - sh;
    const a2 = y2 * r22;
    const a1 = (y1 - L21 * a2) * r11;
    const a0 = (y0 - L10 * a1 - L20 * a2) * r00;
    f0[v] = a0; f1[v] = a1; f2[v] = a2;
    const c0 = g0[v], c1 = g1[v], c2 = g2[v];
    const d0 = a0 - c0, d1 = a1 - c1, d2 = a2 - c2;
    let early = 0;
    for (let q = 0; q < nEarly; q++) {
      const i = earlySlot[q];
      const r = Math.abs(z[i] - a0 * readW[3 * i] - a1 * readW[3 * i + 1] - a2 * readW[3 * i + 2]);
      if (r > early) early = r;
    }
    const gap = Math.abs(d0) * w0 + Math.abs(d1) * w1 + Math.abs(d2) * w2;
    const scale = Math.abs(sh) + Math.abs(c0) * w0 + Math.abs(c1) * w1 + Math.abs(c2) * w2;
    storeBounds(out.bounds, v, residualAbsMax[v], gap, slackPerScale * scale, early, haveLate, fitAllKept);
    if (!(sdv > 0)) { lag1[v] = 0; continue; }
    if (!(residualAbsMax[v] < Infinity)) { const u0 = out.unsummed, last = u0.length - 1; u0[u0[last]++] = v; continue; }
    for (let q = 0; q < nLag; q++) { const i = lagSlot[q]; u[i] = z[i] - c0 * readW[3 * i] - c1 * readW[3 * i + 1] - c2 * readW[3 * i + 2]; }
    const uh = u[slotH], un = u[slotN];
    let U = residualLag[v];
    let dBC = -(d0 * (uh * bh0 + un * an0) + d1 * (uh * bh1 + un * an1) + d2 * (uh * bh2 + un * an2));
    for (let q = 0; q < nPairs; q++) {
      const s = pairSign[q], it = pairT[q], ip = pairPrev[q], ut = u[it], up = u[ip];
      U += s * ut * up;
      dBC += s * (d0 * (ut * readW[3 * ip] + up * readW[3 * it]) + d1 * (ut * readW[3 * ip + 1] + up * readW[3 * it + 1]) + d2 * (ut * readW[3 * ip + 2] + up * readW[3 * it + 2]));
    }
    const dDd = d0 * (D[0] * d0 + D[1] * d1 + D[2] * d2) + d1 * (D[3] * d0 + D[4] * d1 + D[5] * d2) + d2 * (D[6] * d0 + D[7] * d1 + D[8] * d2);
    lag1[v] = (U - dBC + dDd) / ssr;
  }
}

/** Lag-1 of the kept-fit residuals straight from the data, for the few voxels whose residual sums were skipped. */
function lagFromData(run: Volume, W: Float64Array[], kept: number[], isKept: Uint8Array, voxels: number[], fit: Float64Array[], shift: Float64Array, lag1: Float32Array): void {
  const n = voxelsPerVolume(run);
  const p = W.length;
  for (const v of voxels) {
    let ss = 0, lag = 0, prev = 0;
    for (const t of kept) {
      let r = run.data[t * n + v] - shift[v];
      for (let k = 0; k < p; k++) r -= fit[k][v] * W[k][t];
      ss += r * r;
      if (t > 0 && isKept[t - 1]) lag += r * prev;
      prev = r;
    }
    lag1[v] = lag / ss;
  }
}

/** Lower-triangular L with L L^T = A (row-major p x p); A must be positive definite. */
function cholesky(A: Float64Array, p: number): Float64Array {
  const L = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j <= i; j++) {
      let s = A[i * p + j];
      for (let k = 0; k < j; k++) s -= L[i * p + k] * L[j * p + k];
      if (i === j) {
        if (!(s > 0)) fail('TOO_FEW_VOLUMES', 'the kept volumes cannot support the drift fit (its terms are not independent over them)');
        L[i * p + i] = Math.sqrt(s);
      } else L[i * p + j] = s / L[j * p + j];
    }
  }
  return L;
}

/**
 * The p x p matrix S with W(t + step) = S W(t) for the polynomial drift terms, by least squares over
 * the volumes where both sides exist (exact up to rounding: a shifted polynomial has the same order).
 */
function shiftMap(W: Float64Array[], N: number, p: number, step: 1 | -1): Float64Array {
  const Q = new Float64Array(p * p), P = new Float64Array(p * p);
  const from = step < 0 ? 1 : 0, to = step < 0 ? N : N - 1;
  for (let t = from; t < to; t++) {
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) {
      Q[i * p + j] += W[i][t] * W[j][t];
      P[i * p + j] += W[i][t + step] * W[j][t];
    }
  }
  // S Q = P  ->  Q S^T = P^T: solve column by column with the Cholesky factor of Q
  const L = cholesky(Q, p);
  const S = new Float64Array(p * p);
  const col = new Float64Array(p), y = new Float64Array(p);
  for (let r = 0; r < p; r++) {
    for (let i = 0; i < p; i++) col[i] = P[r * p + i];
    for (let i = 0; i < p; i++) { let s = col[i]; for (let j = 0; j < i; j++) s -= L[i * p + j] * y[j]; y[i] = s / L[i * p + i]; }
    for (let i = p - 1; i >= 0; i--) { let s = y[i]; for (let j = i + 1; j < p; j++) s -= L[j * p + i] * col[j]; col[i] = s / L[i * p + i]; }
    for (let i = 0; i < p; i++) S[r * p + i] = col[i];
  }
  return S;
}

function mulVec(M: Float64Array, x: number[], p: number): number[] {
  return Array.from({ length: p }, (_, i) => { let s = 0; for (let j = 0; j < p; j++) s += M[i * p + j] * x[j]; return s; });
}
