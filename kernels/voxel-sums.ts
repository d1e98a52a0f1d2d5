// AssemblyScript: compiled to dist/kernels/voxel-sums.wasm by scripts/build-kernels.mjs at build time
// and loaded by src/look/voxel-sums-wasm.ts. See DEVELOPERS.md, "WebAssembly kernels".
//
// The per-voxel time sums behind the look, two neighbouring voxels per SIMD step (two Float64 lanes).
// Both kernels read a block of `rows` rows of `cols` Float32 values, `stride` values apart (row i = one
// volume's values for the block's voxels; cols even), and a table of p Float64 weights per row at
// `weights`, [adj_i, w_1(i) .. w_{p-1}(i)]: adj_i = 1 when row i - 1 is the volume just before row i,
// w_k the drift terms (orthonormal over the fit rows [fitStart, rows), orthogonal to the constant there).
// Per voxel, with z_i = y_i - shift and shift = y at row fitStart:
//
//   look  (all rows)  S = sum z, SS = sum z^2, M_k = sum z w_k (rows must be consecutive volumes);
//         (fit rows)  c_0 = mean z, c_k = sum z w_k (the least-squares drift fit over the fit rows), and
//                     with u = z - c_0 - sum_k c_k w_k: uAbs = max |u| and Lu = sum u_i u_{i-1} over
//                     pairs of fit rows; skipped (uAbs +inf, Lu 0) when both voxels' mean over the fit
//                     rows is below `theta`.
//   exact (all rows)  S, M_k, then with the fit over all rows and u as above: SSu = sum u^2,
//                     Lu = sum adj_i u_i u_{i-1}, uAbs (two passes over a voxel pair's rows, which stay
//                     in cache between them, so the run is read once).
//
// Two shortcuts of the look kernel for few drift terms (see src/look/run-time-sums.ts for the maths):
//   p <= MAX_CUMULATIVE_TERMS: no multiply per row for the projections: repeated running sums
//     C_1 += z, C_2 += C_1, ..., C_p += C_{p-1}, separately for the rows before fitStart and the fit
//     rows; the caller passes at `mats` three p x p matrices (row-major): A_F maps the fit rows' sums
//     to the fit c, B_F and A_h map the fit rows' and the earlier rows' sums to (S, M_1, ...).
//   p <= MAX_DIFFERENCE_TERMS: the drift term of u is stepped from row to row by forward differences,
//     started from V c with V[j][k] = the j-th forward difference of w_k at fitStart (a fourth p x p
//     matrix at `mats`).
//
// Outputs: Float64 arrays of `stride` values at `out`, one after another, in the order of lookSumNames /
// exactSumNames (src/look/voxel-sums-wasm.ts). WebAssembly never fuses multiply-add, and every sum
// below is written in a fixed order, so results equal the scalar expressions evaluated as written.
// For p <= 4 the accumulators are named locals (registers); wider fits keep theirs in `scratch`
// (16 x 3p bytes the caller reserves).

/** Drift terms up to which the look kernel uses repeated running sums (mirrored in voxel-sums-wasm.ts). */
const MAX_CUMULATIVE_TERMS = 4;
/** Drift terms up to which the look kernel steps its residuals' drift by forward differences. */
const MAX_DIFFERENCE_TERMS = 3;

/** Look kernel for p drift terms (see the file header). */
export function look(src: usize, cols: i32, rows: i32, fitStart: i32, weights: usize, out: usize, theta: f64, stride: i32, mats: usize, p: i32, scratch: usize): void {
  // one function per number of terms up to MAX_CUMULATIVE_TERMS, each compiled with that number as a
  // constant (accumulators in registers); more terms take the general form
  if (p == 1) look1(src, cols, rows, fitStart, weights, out, theta, stride, mats);
  else if (p == 2) look2(src, cols, rows, fitStart, weights, out, theta, stride, mats);
  else if (p == 3) look3(src, cols, rows, fitStart, weights, out, theta, stride, mats);
  else if (p == 4) look4(src, cols, rows, fitStart, weights, out, theta, stride, mats);
  else lookMany(src, cols, rows, fitStart, weights, out, theta, stride, p, scratch);
}

/** Exact kernel for p drift terms (see the file header); theta and mats are not read. */
export function exact(src: usize, cols: i32, rows: i32, fitStart: i32, weights: usize, out: usize, theta: f64, stride: i32, mats: usize, p: i32, scratch: usize): void {
  if (p == 1) exact1(src, cols, rows, fitStart, weights, out, stride);
  else if (p == 2) exact2(src, cols, rows, fitStart, weights, out, stride);
  else if (p == 3) exact3(src, cols, rows, fitStart, weights, out, stride);
  else if (p == 4) exact4(src, cols, rows, fitStart, weights, out, stride);
  else exactMany(src, cols, rows, fitStart, weights, out, stride, p, scratch);
}

function look1(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, theta: f64, stride: i32, mats: usize): void { sumsFew(src, cols, rows, fit, weights, out, theta, stride, mats, 1, false); }
function look2(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, theta: f64, stride: i32, mats: usize): void { sumsFew(src, cols, rows, fit, weights, out, theta, stride, mats, 2, false); }
function look3(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, theta: f64, stride: i32, mats: usize): void { sumsFew(src, cols, rows, fit, weights, out, theta, stride, mats, 3, false); }
function look4(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, theta: f64, stride: i32, mats: usize): void { sumsFew(src, cols, rows, fit, weights, out, theta, stride, mats, 4, false); }
function lookMany(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, theta: f64, stride: i32, p: i32, scratch: usize): void { sumsMany(src, cols, rows, fit, weights, out, theta, stride, p, scratch, false); }
function exact1(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, stride: i32): void { sumsFew(src, cols, rows, fit, weights, out, 0, stride, 0, 1, true); }
function exact2(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, stride: i32): void { sumsFew(src, cols, rows, fit, weights, out, 0, stride, 0, 2, true); }
function exact3(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, stride: i32): void { sumsFew(src, cols, rows, fit, weights, out, 0, stride, 0, 3, true); }
function exact4(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, stride: i32): void { sumsFew(src, cols, rows, fit, weights, out, 0, stride, 0, 4, true); }
function exactMany(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, stride: i32, p: i32, scratch: usize): void { sumsMany(src, cols, rows, fit, weights, out, 0, stride, p, scratch, true); }

// ---- small helpers (inlined) ----

/** Two Float32 values at ptr, widened to Float64 lanes. */
@inline function ld(ptr: usize): v128 { return f64x2.promote_low_f32x4(v128.load64_zero(ptr)); }
/** A Float64 at ptr in both lanes. */
@inline function sp(ptr: usize): v128 { return v128.load64_splat(ptr); }
@inline function add(a: v128, b: v128): v128 { return f64x2.add(a, b); }
@inline function sub(a: v128, b: v128): v128 { return f64x2.sub(a, b); }
@inline function mul(a: v128, b: v128): v128 { return f64x2.mul(a, b); }
/**
 * a < b ? b : a per lane (f64x2.pmax: one instruction on x64, where f64x2.max needs several to order
 * NaN and signed zeros; a NaN u is ignored unless it comes first)
 */
@inline function vmax(a: v128, b: v128): v128 { return f64x2.pmax(a, b); }
/** b < a ? b : a per lane (f64x2.pmin, see vmax). */
@inline function vmin(a: v128, b: v128): v128 { return f64x2.pmin(a, b); }

/**
 * Pairwise sum of a[k] x_k, k = 0..n-1 (n <= 4 a constant after inlining), for the matrix row at a:
 * x_0 for n = 1, x_0 + x_1, x_0 + (x_1 + x_2), (x_0 + x_1) + (x_2 + x_3).
 */
@inline
function dot(a: usize, n: i32, x0: v128, x1: v128, x2: v128, x3: v128): v128 {
  const t0 = mul(sp(a), x0);
  if (n == 1) return t0;
  const t1 = mul(sp(a + 8), x1);
  if (n == 2) return add(t0, t1);
  const t2 = mul(sp(a + 16), x2);
  if (n == 3) return add(t0, add(t1, t2));
  return add(add(t0, t1), add(t2, mul(sp(a + 24), x3)));
}

/**
 * Both kernels for P <= 4 drift terms (P and EXACT constants after inlining): every accumulator is a
 * local, terms beyond P are never touched. Two rows per loop step: the rows of a step are combined
 * first (z_0 + z_1, max(u_0, u_1), ...) and then added to each accumulator once, so the chains of
 * dependent additions are half as long (Node 20 on x64: 2 rows about as fast as 1, 4 slower).
 */
@inline
function sumsFew(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, theta: f64, stride: i32, mats: usize, P: i32, EXACT: bool): void {
  const CUMULATIVE = !EXACT; // the look with p <= MAX_CUMULATIVE_TERMS always takes the running sums
  const DIFFERENCES = !EXACT && P <= MAX_DIFFERENCE_TERMS;
  const rowBytes = <usize>stride << 2;
  const colBytes = <usize>stride << 3;
  const wRow = <usize>(8 * P); // bytes of one row of weights
  const pp = <usize>(8 * P * P); // bytes of one p x p matrix
  const zero = f64x2.splat(0);
  for (let j = 0; j < cols; j += 2) {
    const col = src + (<usize>j << 2);
    const sh = ld(col + <usize>fit * rowBytes);
    let s = zero, ss = zero;
    // look: m0..m3 are the running sums C_1..C_4; exact: m1..m3 are M_1..M_3
    let m0 = zero, m1 = zero, m2 = zero, m3 = zero;
    let snap0 = zero, snap1 = zero, snap2 = zero, snap3 = zero; // look: the sums over rows before fitStart

    // loop A: sums over all rows (look: in two parts, rows before fitStart, then the fit rows)
    let ptr = col, wp = weights, i = 0;
    for (let part = EXACT ? 1 : 0; part < 2; part++) {
      const end = part == 0 ? fit : rows;
      for (; i + 2 <= end; i += 2) {
        const z0 = sub(ld(ptr), sh), z1 = sub(ld(ptr + rowBytes), sh);
        if (!EXACT) ss = add(ss, add(mul(z0, z0), mul(z1, z1)));
        if (CUMULATIVE) {
          m0 = add(m0, z0);
          if (P >= 2) m1 = add(m1, m0);
          if (P >= 3) m2 = add(m2, m1);
          if (P >= 4) m3 = add(m3, m2);
          m0 = add(m0, z1);
          if (P >= 2) m1 = add(m1, m0);
          if (P >= 3) m2 = add(m2, m1);
          if (P >= 4) m3 = add(m3, m2);
        } else {
          s = add(s, add(z0, z1));
          if (P >= 2) m1 = add(m1, add(mul(z0, sp(wp + 8)), mul(z1, sp(wp + wRow + 8))));
          if (P >= 3) m2 = add(m2, add(mul(z0, sp(wp + 16)), mul(z1, sp(wp + wRow + 16))));
          if (P >= 4) m3 = add(m3, add(mul(z0, sp(wp + 24)), mul(z1, sp(wp + wRow + 24))));
        }
        ptr += 2 * rowBytes;
        wp += 2 * wRow;
      }
      for (; i < end; i++) {
        const z0 = sub(ld(ptr), sh);
        if (!EXACT) ss = add(ss, mul(z0, z0));
        if (CUMULATIVE) {
          m0 = add(m0, z0);
          if (P >= 2) m1 = add(m1, m0);
          if (P >= 3) m2 = add(m2, m1);
          if (P >= 4) m3 = add(m3, m2);
        } else {
          s = add(s, z0);
          if (P >= 2) m1 = add(m1, mul(z0, sp(wp + 8)));
          if (P >= 3) m2 = add(m2, mul(z0, sp(wp + 16)));
          if (P >= 4) m3 = add(m3, mul(z0, sp(wp + 24)));
        }
        ptr += rowBytes;
        wp += wRow;
      }
      if (part == 0) {
        snap0 = m0; snap1 = m1; snap2 = m2; snap3 = m3;
        m0 = zero; m1 = zero; m2 = zero; m3 = zero;
      }
    }

    // the drift fit over the fit rows (c) and the whole-run moments (mb)
    let c0: v128, c1 = zero, c2 = zero, c3 = zero;
    let mb0: v128, mb1 = zero, mb2 = zero, mb3 = zero;
    const fitCount = f64x2.splat(<f64>(rows - fit));
    if (CUMULATIVE) {
      // c = A_F G, mb = B_F G + A_h P (G = the fit rows' running sums, P = the earlier rows')
      c0 = dot(mats, P, m0, m1, m2, m3);
      mb0 = add(dot(mats + pp, P, m0, m1, m2, m3), dot(mats + 2 * pp, P, snap0, snap1, snap2, snap3));
      if (P >= 2) {
        c1 = dot(mats + wRow, P, m0, m1, m2, m3);
        mb1 = add(dot(mats + pp + wRow, P, m0, m1, m2, m3), dot(mats + 2 * pp + wRow, P, snap0, snap1, snap2, snap3));
      }
      if (P >= 3) {
        c2 = dot(mats + 2 * wRow, P, m0, m1, m2, m3);
        mb2 = add(dot(mats + pp + 2 * wRow, P, m0, m1, m2, m3), dot(mats + 2 * pp + 2 * wRow, P, snap0, snap1, snap2, snap3));
      }
      if (P >= 4) {
        c3 = dot(mats + 3 * wRow, P, m0, m1, m2, m3);
        mb3 = add(dot(mats + pp + 3 * wRow, P, m0, m1, m2, m3), dot(mats + 2 * pp + 3 * wRow, P, snap0, snap1, snap2, snap3));
      }
    } else {
      c0 = f64x2.div(s, fitCount);
      mb0 = s;
      c1 = m1; c2 = m2; c3 = m3;
      mb1 = m1; mb2 = m2; mb3 = m3;
    }
    const sh2 = add(sh, c0);
    // differences: gd_j = sum_k V[j][k] c_k, the drift term of u and its forward differences at fitStart
    let gd0 = zero, gd1 = zero, gd2 = zero;
    if (DIFFERENCES && P == 2) {
      gd0 = mul(sp(mats + 3 * pp + 8), c1);
      gd1 = mul(sp(mats + 3 * pp + wRow + 8), c1);
    }
    if (DIFFERENCES && P == 3) {
      gd0 = add(mul(sp(mats + 3 * pp + 8), c1), mul(sp(mats + 3 * pp + 16), c2));
      gd1 = add(mul(sp(mats + 3 * pp + wRow + 8), c1), mul(sp(mats + 3 * pp + wRow + 16), c2));
      gd2 = add(mul(sp(mats + 3 * pp + 2 * wRow + 8), c1), mul(sp(mats + 3 * pp + 2 * wRow + 16), c2));
    }

    // store the outputs known before loop B (output q at out + q * stride * 8, these voxels at
    // + j * 8): it frees their registers for the loop (x64 has 16 vector registers)
    let o = out + (<usize>j << 3);
    v128.store(o, sh); o += colBytes;
    v128.store(o, mb0); o += colBytes;
    if (!EXACT) { v128.store(o, ss); o += colBytes; }
    if (P >= 2) { v128.store(o, mb1); o += colBytes; }
    if (P >= 3) { v128.store(o, mb2); o += colBytes; }
    if (P >= 4) { v128.store(o, mb3); o += colBytes; }
    if (!EXACT) {
      v128.store(o, c0); o += colBytes;
      if (P >= 2) { v128.store(o, c1); o += colBytes; }
      if (P >= 3) { v128.store(o, c2); o += colBytes; }
      if (P >= 4) { v128.store(o, c3); o += colBytes; }
    }

    // loop B: residuals of that fit over the fit rows (the rows are still in cache)
    let ssu = zero, lu = zero, uprev = zero;
    let umax = f64x2.splat(-Infinity), umin = f64x2.splat(Infinity);
    if (!EXACT && i64x2.all_true(f64x2.lt(sh2, f64x2.splat(theta)))) {
      // background (both voxels' mean below theta): no residual sums; +inf / -inf mean "no bound"
      umax = f64x2.splat(Infinity);
      umin = f64x2.splat(-Infinity);
    } else {
      ptr = col + <usize>fit * rowBytes;
      wp = weights + <usize>fit * wRow;
      i = fit;
      for (; i + 2 <= rows; i += 2) {
        let u0 = sub(ld(ptr), sh2);
        if (DIFFERENCES) {
          u0 = sub(u0, gd0);
          if (P >= 2) gd0 = add(gd0, gd1);
          if (P >= 3) gd1 = add(gd1, gd2);
        } else {
          if (P >= 2) u0 = sub(u0, mul(c1, sp(wp + 8)));
          if (P >= 3) u0 = sub(u0, mul(c2, sp(wp + 16)));
          if (P >= 4) u0 = sub(u0, mul(c3, sp(wp + 24)));
        }
        let u1 = sub(ld(ptr + rowBytes), sh2);
        if (DIFFERENCES) {
          u1 = sub(u1, gd0);
          if (P >= 2) gd0 = add(gd0, gd1);
          if (P >= 3) gd1 = add(gd1, gd2);
        } else {
          if (P >= 2) u1 = sub(u1, mul(c1, sp(wp + wRow + 8)));
          if (P >= 3) u1 = sub(u1, mul(c2, sp(wp + wRow + 16)));
          if (P >= 4) u1 = sub(u1, mul(c3, sp(wp + wRow + 24)));
        }
        umax = vmax(umax, vmax(u0, u1));
        umin = vmin(umin, vmin(u0, u1));
        if (EXACT) {
          ssu = add(ssu, add(mul(u0, u0), mul(u1, u1)));
          lu = add(lu, add(mul(mul(u0, uprev), sp(wp)), mul(mul(u1, u0), sp(wp + wRow))));
        } else {
          lu = add(lu, add(mul(u0, uprev), mul(u1, u0)));
        }
        uprev = u1;
        ptr += 2 * rowBytes;
        wp += 2 * wRow;
      }
      for (; i < rows; i++) {
        let u0 = sub(ld(ptr), sh2);
        if (DIFFERENCES) {
          u0 = sub(u0, gd0);
          if (P >= 2) gd0 = add(gd0, gd1);
          if (P >= 3) gd1 = add(gd1, gd2);
        } else {
          if (P >= 2) u0 = sub(u0, mul(c1, sp(wp + 8)));
          if (P >= 3) u0 = sub(u0, mul(c2, sp(wp + 16)));
          if (P >= 4) u0 = sub(u0, mul(c3, sp(wp + 24)));
        }
        umax = vmax(umax, u0);
        umin = vmin(umin, u0);
        if (EXACT) {
          ssu = add(ssu, mul(u0, u0));
          lu = add(lu, mul(mul(u0, uprev), sp(wp)));
        } else {
          lu = add(lu, mul(u0, uprev));
        }
        uprev = u0;
        ptr += rowBytes;
        wp += wRow;
      }
    }
    const uAbs = vmax(umax, f64x2.neg(umin));

    // the outputs that depend on loop B
    if (EXACT) {
      v128.store(o, ssu); o += colBytes;
      v128.store(o, lu); o += colBytes;
      v128.store(o, uAbs);
    } else {
      v128.store(o, uAbs); o += colBytes;
      v128.store(o, lu);
    }
  }
}

/**
 * Both kernels for any number p of drift terms, with the drift sums M_1..M_{p-1} (at scratch),
 * their values before fitStart (scratch + 16 p) and the fit c_1..c_{p-1} (scratch + 32 p) in memory:
 * the weights path of {@link sumsFew} (no running sums, no differences), in the same order of
 * operations.
 */
@inline
function sumsMany(src: usize, cols: i32, rows: i32, fit: i32, weights: usize, out: usize, theta: f64, stride: i32, p: i32, scratch: usize, EXACT: bool): void {
  const rowBytes = <usize>stride << 2;
  const colBytes = <usize>stride << 3;
  const wRow = <usize>(8 * p);
  const M = scratch, SNAP = scratch + <usize>(16 * p), C = scratch + <usize>(32 * p);
  const zero = f64x2.splat(0);
  for (let j = 0; j < cols; j += 2) {
    const col = src + (<usize>j << 2);
    const sh = ld(col + <usize>fit * rowBytes);
    let s = zero, ss = zero, snapS = zero;
    for (let k = 1; k < p; k++) v128.store(M + <usize>(16 * k), zero);

    let ptr = col, wp = weights, i = 0;
    for (let part = EXACT ? 1 : 0; part < 2; part++) {
      const end = part == 0 ? fit : rows;
      for (; i + 2 <= end; i += 2) {
        const z0 = sub(ld(ptr), sh), z1 = sub(ld(ptr + rowBytes), sh);
        if (!EXACT) ss = add(ss, add(mul(z0, z0), mul(z1, z1)));
        s = add(s, add(z0, z1));
        for (let k = 1; k < p; k++) {
          const a = M + <usize>(16 * k), w = wp + <usize>(8 * k);
          v128.store(a, add(v128.load(a), add(mul(z0, sp(w)), mul(z1, sp(w + wRow)))));
        }
        ptr += 2 * rowBytes;
        wp += 2 * wRow;
      }
      for (; i < end; i++) {
        const z0 = sub(ld(ptr), sh);
        if (!EXACT) ss = add(ss, mul(z0, z0));
        s = add(s, z0);
        for (let k = 1; k < p; k++) {
          const a = M + <usize>(16 * k);
          v128.store(a, add(v128.load(a), mul(z0, sp(wp + <usize>(8 * k)))));
        }
        ptr += rowBytes;
        wp += wRow;
      }
      if (part == 0) {
        snapS = s;
        for (let k = 1; k < p; k++) v128.store(SNAP + <usize>(16 * k), v128.load(M + <usize>(16 * k)));
      }
    }

    const fitCount = f64x2.splat(<f64>(rows - fit));
    const c0 = EXACT ? f64x2.div(s, fitCount) : f64x2.div(sub(s, snapS), fitCount);
    for (let k = 1; k < p; k++) {
      const m = v128.load(M + <usize>(16 * k));
      v128.store(C + <usize>(16 * k), EXACT ? m : sub(m, v128.load(SNAP + <usize>(16 * k))));
    }
    const sh2 = add(sh, c0);

    let ssu = zero, lu = zero, uprev = zero;
    let umax = f64x2.splat(-Infinity), umin = f64x2.splat(Infinity);
    if (!EXACT && i64x2.all_true(f64x2.lt(sh2, f64x2.splat(theta)))) {
      umax = f64x2.splat(Infinity);
      umin = f64x2.splat(-Infinity);
    } else {
      ptr = col + <usize>fit * rowBytes;
      wp = weights + <usize>fit * wRow;
      i = fit;
      for (; i + 2 <= rows; i += 2) {
        let u0 = sub(ld(ptr), sh2);
        for (let k = 1; k < p; k++) u0 = sub(u0, mul(v128.load(C + <usize>(16 * k)), sp(wp + <usize>(8 * k))));
        let u1 = sub(ld(ptr + rowBytes), sh2);
        for (let k = 1; k < p; k++) u1 = sub(u1, mul(v128.load(C + <usize>(16 * k)), sp(wp + wRow + <usize>(8 * k))));
        umax = vmax(umax, vmax(u0, u1));
        umin = vmin(umin, vmin(u0, u1));
        if (EXACT) {
          ssu = add(ssu, add(mul(u0, u0), mul(u1, u1)));
          lu = add(lu, add(mul(mul(u0, uprev), sp(wp)), mul(mul(u1, u0), sp(wp + wRow))));
        } else {
          lu = add(lu, add(mul(u0, uprev), mul(u1, u0)));
        }
        uprev = u1;
        ptr += 2 * rowBytes;
        wp += 2 * wRow;
      }
      for (; i < rows; i++) {
        let u0 = sub(ld(ptr), sh2);
        for (let k = 1; k < p; k++) u0 = sub(u0, mul(v128.load(C + <usize>(16 * k)), sp(wp + <usize>(8 * k))));
        umax = vmax(umax, u0);
        umin = vmin(umin, u0);
        if (EXACT) {
          ssu = add(ssu, mul(u0, u0));
          lu = add(lu, mul(mul(u0, uprev), sp(wp)));
        } else {
          lu = add(lu, mul(u0, uprev));
        }
        uprev = u0;
        ptr += rowBytes;
        wp += wRow;
      }
    }
    const uAbs = vmax(umax, f64x2.neg(umin));

    let o = out + (<usize>j << 3);
    v128.store(o, sh); o += colBytes;
    v128.store(o, s); o += colBytes;
    if (!EXACT) { v128.store(o, ss); o += colBytes; }
    for (let k = 1; k < p; k++) { v128.store(o, v128.load(M + <usize>(16 * k))); o += colBytes; }
    if (EXACT) {
      v128.store(o, ssu); o += colBytes;
      v128.store(o, lu); o += colBytes;
      v128.store(o, uAbs);
    } else {
      v128.store(o, c0); o += colBytes;
      for (let k = 1; k < p; k++) { v128.store(o, v128.load(C + <usize>(16 * k))); o += colBytes; }
      v128.store(o, uAbs); o += colBytes;
      v128.store(o, lu);
    }
  }
}
