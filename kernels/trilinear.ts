// AssemblyScript: compiled to dist/kernels/trilinear.wasm by scripts/build-kernels.mjs at build time
// and loaded by src/resample/trilinear-wasm.ts. See DEVELOPERS.md, "WebAssembly kernels".
//
// The interior of the linear kernel of resampleVoxels (src/resample/resample-voxels.ts, rowLinear and
// trilinear), one whole output volume per call, in the same order of Float64 operations, so the bytes
// equal that routine's:
//   for each output row (j, k): x = m1 j + m2 k + m3 + pad (likewise y, z), then per voxel the position
//   steps by the map's first column (x += m0, y += m4, z += m8: a running sum, as in rowLinear);
//   inside the fast-path box [lx, hx] x [ly, hy] x [lz, hz]: trilinear value from the eight taps (floor
//   by truncation: positions there are >= 0), lerps along x, then y, then z;
//   else, in constant mode, outside the grid proper [e, gx] x [e, gy] x [e, gz]: cval;
//   else: the voxel is left to the caller's generic path: its index goes to a list (the caller replays
//   the row's running sum to get its position).
//
// Parameters (Float64 at `params`): m0..m11 (the first three rows of the output -> source voxel map,
// row-major), pad, lx, hx, ly, hy, lz, hz, e, gx, gy, gz, cval. The source is Float32, x fastest,
// nx x ny x nz. Positions and bounds count `shift` planes of margin that the source does not hold
// (the caller's virtual margin: in constant and nearest mode the fast path reads a margin value only
// with weight 0, at a position exactly on the grid's last voxel, so that tap reads the voxel itself
// instead: a + 0 (a - a) = a + 0 (b - a) for finite b); the taps are read at the position minus
// `shift`. The output is Float32, ox x oy x oz. Each list entry is the output index (Int32), ascending.
// Returns the number of entries.

/** Offsets of the parameters (in Float64 values) at `params`. */
/** 2^52: adding it to a non-negative integer below 2^52 leaves that integer in the low mantissa bits. */
const TWO_52: f64 = 4503599627370496.0;
const PAD = 12, LX = 13, HX = 14, LY = 15, HY = 16, LZ = 17, HZ = 18, E = 19, GX = 20, GY = 21, GZ = 22, CVAL = 23;

@inline function prm(params: usize, i: i32): f64 { return load<f64>(params + (<usize>i << 3)); }
/** The Float32 values at ptr and ptr + 4 as two Float64 lanes; the one at ptr twice when `full` is false. */
@inline function pair(ptr: usize, full: bool): v128 {
  return f64x2.promote_low_f32x4(full ? v128.load64_zero(ptr) : v128.load32_splat(ptr));
}

/** Trilinear resampling of one volume (see the file header). */
export function linearVolume(params: usize, src: usize, nx: i32, ny: i32, nz: i32, shift: i32, out: usize, ox: i32, oy: i32, oz: i32, constant: i32, list: usize): i32 {
  const sxy = nx * ny;
  const m0 = prm(params, 0), m1 = prm(params, 1), m2 = prm(params, 2), m3 = prm(params, 3);
  const m4 = prm(params, 4), m5 = prm(params, 5), m6 = prm(params, 6), m7 = prm(params, 7);
  const m8 = prm(params, 8), m9 = prm(params, 9), m10 = prm(params, 10), m11 = prm(params, 11);
  const pad = prm(params, PAD);
  const lx = prm(params, LX), hx = prm(params, HX), ly = prm(params, LY), hy = prm(params, HY), lz = prm(params, LZ), hz = prm(params, HZ);
  const e = prm(params, E), gx = prm(params, GX), gy = prm(params, GY), gz = prm(params, GZ);
  const cval = <f32>prm(params, CVAL);
  // in the position's frame (virtual margin included): the source's first voxel and the last voxel of each axis
  const nxf = <f64>nx, sxyf = <f64>sxy, first = <f64>shift * (1 + nxf + sxyf);
  const lastX = <f64>(nx - 1 + shift), lastY = <f64>(ny - 1 + shift), lastZ = <f64>(nz - 1 + shift);
  let count = 0;
  let p = 0;
  for (let k = 0; k < oz; k++) {
    const fk = <f64>k;
    for (let j = 0; j < oy; j++) {
      const fj = <f64>j;
      let x = m1 * fj + m2 * fk + m3 + pad;
      let y = m5 * fj + m6 * fk + m7 + pad;
      let z = m9 * fj + m10 * fk + m11 + pad;
      for (let i = 0; i < ox; i++, p++) {
        const o = out + (<usize>p << 2);
        if (x >= lx && x <= hx && y >= ly && y <= hy && z >= lz && z <= hz) {
          // floor by truncation (positions here are >= 0), as a Float64: x - trunc(x) is the fraction
          // the row routine computes from its integer. The address's index (an integer below 2^31,
          // exact in Float64) is read from the low bits of 2^52 + index, without a float -> integer
          // conversion (V8's saturating ones cost about as much as the interpolation)
          const tx = f64.trunc(x), ty = f64.trunc(y), tz = f64.trunc(z);
          const fx = x - tx, fy = y - ty, fz = z - tz;
          const r = src + (<usize><i32>reinterpret<i64>(tx + ty * nxf + tz * sxyf - first + TWO_52) << 2);
          // the x-neighbours of each of the four rows in one 64-bit load, widened to two Float64 lanes;
          // lanes then pair the rows so each lerp below is one vector operation on two scalar lerps.
          // On the last voxel of an axis (weight 0 for the next one) the voxel itself stands in for it.
          const ry = ty < lastY ? <usize>nx << 2 : 0, rz = r + (tz < lastZ ? <usize>sxy << 2 : 0);
          const full = tx < lastX;
          const v0 = pair(r, full); // a, b
          const v1 = pair(r + ry, full); // c, d
          const v2 = pair(rz, full); // e, f
          const v3 = pair(rz + ry, full); // g, h
          const vx = f64x2.splat(fx), vy = f64x2.splat(fy);
          const ac = v128.shuffle<f64>(v0, v1, 0, 2), bd = v128.shuffle<f64>(v0, v1, 1, 3);
          const eg = v128.shuffle<f64>(v2, v3, 0, 2), fh = v128.shuffle<f64>(v2, v3, 1, 3);
          const abcd = f64x2.add(ac, f64x2.mul(vx, f64x2.sub(bd, ac))); // ab, cd
          const efgh = f64x2.add(eg, f64x2.mul(vx, f64x2.sub(fh, eg))); // ef, gh
          const l = v128.shuffle<f64>(abcd, efgh, 0, 2), h = v128.shuffle<f64>(abcd, efgh, 1, 3); // (ab, ef), (cd, gh)
          const lh = f64x2.add(l, f64x2.mul(vy, f64x2.sub(h, l))); // lo, hi
          const lo = f64x2.extract_lane(lh, 0), hi = f64x2.extract_lane(lh, 1);
          store<f32>(o, <f32>(lo + fz * (hi - lo)));
        } else if (constant != 0 && !(x >= e && x <= gx && y >= e && y <= gy && z >= e && z <= gz)) {
          store<f32>(o, cval);
        } else {
          store<i32>(list + (<usize>count << 2), p);
          count++;
        }
        x += m0; y += m4; z += m8;
      }
    }
  }
  return count;
}

/**
 * How many of the n Float32 values at `at` are NaN or +-Infinity (exponent bits all ones), four at a
 * time: what resampleRun's threads report for the volumes they read.
 */
export function countNonFinite(at: usize, n: i32): i32 {
  const expBits = i32x4.splat(0x7f800000);
  let counts = i32x4.splat(0);
  let i = 0;
  for (; i + 4 <= n; i += 4) {
    const v = v128.load(at + (<usize>i << 2));
    // lanes of -1 where all exponent bits are set
    counts = i32x4.sub(counts, i32x4.eq(v128.and(v, expBits), expBits));
  }
  let count = i32x4.extract_lane(counts, 0) + i32x4.extract_lane(counts, 1) + i32x4.extract_lane(counts, 2) + i32x4.extract_lane(counts, 3);
  for (; i < n; i++) if ((load<i32>(at + (<usize>i << 2)) & 0x7f800000) == 0x7f800000) count++;
  return count;
}
