// AssemblyScript: compiled to dist/kernels/gaussian-conv.wasm by scripts/build-kernels.mjs at build time
// and loaded by src/filter/conv-wasm.ts. See DEVELOPERS.md, "WebAssembly kernels".
//
// The inner loop of the separable Gaussian smoothing: a symmetric 1-D convolution over Float64 values
// in the imported memory, two values per SIMD step. For i = 0..len-1:
//   dst[i] = w0 src[i] + w1 (src[i + m1] + src[i + p1]) + ... + wr (src[i + mr] + src[i + pr])
// summed left to right (WebAssembly never fuses multiply-add, so every lane and thread gives the bits
// of that scalar expression). The offsets m_d, p_d are in bytes relative to src[i], so one call sweeps
// a whole block of rows or planes whose neighbours lie at a fixed distance. All addresses are byte
// addresses; offs holds 2r Int32 [m1, p1, m2, p2, ...], w holds r + 1 Float64 [w0 .. wr].

/** Bytes of dst swept by all taps before moving on: src and dst of one chunk stay in the first-level cache. */
const CHUNK_BYTES: usize = 16384;

/** Taps handled by one sweep of a chunk (their weights and addresses stay in registers). */
const TAPS_PER_SWEEP = 4;

/**
 * dst[i] = w0 src[i] + sum_d w_d (src[i + m_d] + src[i + p_d]), i = 0..len-1 (see the file header).
 * Radii up to TAPS_PER_SWEEP take one sweep per chunk; wider kernels add further sweeps that read back
 * the partial sums in dst, which keeps the same left-to-right order of additions.
 */
export function conv(dst: usize, src: usize, len: i32, offs: usize, w: usize, r: i32): void {
  const end = <usize>(len & ~1) << 3;
  for (let c0: usize = 0; c0 < end; c0 += CHUNK_BYTES) {
    const c1 = min(c0 + CHUNK_BYTES, end);
    const first = min(r, TAPS_PER_SWEEP);
    // one branch per tap count, so each sweep below is compiled with a constant count
    if (first == 0) sweep(dst, src, c0, c1, offs, w, 1, 0, true);
    else if (first == 1) sweep(dst, src, c0, c1, offs, w, 1, 1, true);
    else if (first == 2) sweep(dst, src, c0, c1, offs, w, 1, 2, true);
    else if (first == 3) sweep(dst, src, c0, c1, offs, w, 1, 3, true);
    else sweep(dst, src, c0, c1, offs, w, 1, 4, true);
    for (let d = TAPS_PER_SWEEP + 1; d <= r; d += TAPS_PER_SWEEP) {
      const n = min(r - d + 1, TAPS_PER_SWEEP);
      if (n == 1) sweep(dst, src, c0, c1, offs, w, d, 1, false);
      else if (n == 2) sweep(dst, src, c0, c1, offs, w, d, 2, false);
      else if (n == 3) sweep(dst, src, c0, c1, offs, w, d, 3, false);
      else sweep(dst, src, c0, c1, offs, w, d, 4, false);
    }
  }
  if (len & 1) {
    // odd length: the last value alone, same order of operations
    let e = load<f64>(src + end) * load<f64>(w);
    for (let d = 1; d <= r; d++) {
      const o = offs + <usize>(8 * (d - 1));
      const m = load<f64>(src + end + <usize>load<i32>(o));
      const p = load<f64>(src + end + <usize>load<i32>(o, 4));
      e = e + (m + p) * load<f64>(w + <usize>(8 * d));
    }
    store<f64>(dst + end, e);
  }
}

/**
 * One sweep of bytes c0..c1 with taps d .. d + n - 1 (n a constant after inlining): starts from
 * w0 src (first) or from the partial sums already in dst.
 */
@inline
function sweep(dst: usize, src: usize, c0: usize, c1: usize, offs: usize, w: usize, d: i32, n: i32, first: bool): void {
  const o = offs + <usize>(8 * (d - 1));
  const wd = w + <usize>(8 * d);
  const w0 = v128.load64_splat(w);
  const w1 = n >= 1 ? v128.load64_splat(wd) : w0;
  const w2 = n >= 2 ? v128.load64_splat(wd, 8) : w0;
  const w3 = n >= 3 ? v128.load64_splat(wd, 16) : w0;
  const w4 = n >= 4 ? v128.load64_splat(wd, 24) : w0;
  // tap addresses (src + offset; wrapping arithmetic handles negative offsets)
  const m1 = n >= 1 ? src + <usize>load<i32>(o) : src, p1 = n >= 1 ? src + <usize>load<i32>(o, 4) : src;
  const m2 = n >= 2 ? src + <usize>load<i32>(o, 8) : src, p2 = n >= 2 ? src + <usize>load<i32>(o, 12) : src;
  const m3 = n >= 3 ? src + <usize>load<i32>(o, 16) : src, p3 = n >= 3 ? src + <usize>load<i32>(o, 20) : src;
  const m4 = n >= 4 ? src + <usize>load<i32>(o, 24) : src, p4 = n >= 4 ? src + <usize>load<i32>(o, 28) : src;
  for (let i = c0; i < c1; i += 16) {
    let acc = first ? f64x2.mul(v128.load(src + i), w0) : v128.load(dst + i);
    if (n >= 1) acc = f64x2.add(acc, f64x2.mul(f64x2.add(v128.load(m1 + i), v128.load(p1 + i)), w1));
    if (n >= 2) acc = f64x2.add(acc, f64x2.mul(f64x2.add(v128.load(m2 + i), v128.load(p2 + i)), w2));
    if (n >= 3) acc = f64x2.add(acc, f64x2.mul(f64x2.add(v128.load(m3 + i), v128.load(p3 + i)), w3));
    if (n >= 4) acc = f64x2.add(acc, f64x2.mul(f64x2.add(v128.load(m4 + i), v128.load(p4 + i)), w4));
    v128.store(dst + i, acc);
  }
}

/** Float32 rows (stride nx values) at src -> Float64 rows (stride px values) at dst. */
export function widen(dst: usize, src: usize, rows: i32, nx: i32, px: i32): void {
  for (let q = 0; q < rows; q++) {
    const d = dst + <usize>(q * px) * 8, s = src + <usize>(q * nx) * 4;
    for (let i = 0; i < nx; i++) store<f64>(d + <usize>i * 8, <f64>load<f32>(s + <usize>i * 4));
  }
}

/** Float64 rows (stride px values) at src -> Float32 rows (stride nx values) at dst, rounded to nearest. */
export function narrow(dst: usize, src: usize, rows: i32, nx: i32, px: i32): void {
  for (let q = 0; q < rows; q++) {
    const d = dst + <usize>(q * nx) * 4, s = src + <usize>(q * px) * 8;
    for (let i = 0; i < nx; i++) store<f32>(d + <usize>i * 4, <f32>load<f64>(s + <usize>i * 8));
  }
}
