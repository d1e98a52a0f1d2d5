import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { loadKernelModule } from '../../src/core/load-kernel-module.js';
import { convKernels } from '../../src/filter/conv-wasm.js';

describe('WebAssembly convolution kernel', () => {
  it('is the module built from kernels/gaussian-conv.ts: imports its memory, exports conv, widen and narrow only', () => {
    const { exports } = loadKernelModule('gaussian-conv').instantiate(1);
    expect(Object.keys(exports).sort()).toEqual(['conv', 'narrow', 'widen']); // no exported memory: only the caller makes it
  });
  // radii above 4 take more than one sweep per chunk (kernels/gaussian-conv.ts); 2100 values span two chunks
  for (const [r, len] of [[0, 9], [1, 10], [3, 21], [4, 2100], [5, 33], [7, 40], [9, 2101]] as const) {
    it(`r = ${r}, ${len} values: the same bits as the scalar expression evaluated left to right`, () => {
      const k = convKernels([r], 65536 * 2);
      const f64 = new Float64Array(k.memory.buffer);
      const i32 = new Int32Array(k.memory.buffer);
      const rng = createRng(r + 1);
      const src = 4096 / 8, dst = 65536 / 8, w = 512 / 8; // Float64 indices of the regions
      for (let i = 0; i < len + 2 * r + 2; i++) f64[src + i] = rng.normal(0, 100);
      for (let d = 0; d <= r; d++) f64[w + d] = rng.uniform();
      for (let d = 1; d <= r; d++) { i32[2 * (d - 1)] = -8 * d; i32[2 * (d - 1) + 1] = 8 * d; }
      const s0 = src + r + 1; // start far enough in for the left taps
      k.conv(dst * 8, s0 * 8, len, 0, w * 8, r);
      for (let i = 0; i < len; i++) {
        let e = f64[w] * f64[s0 + i];
        for (let d = 1; d <= r; d++) e = e + f64[w + d] * (f64[s0 + i - d] + f64[s0 + i + d]);
        expect(f64[dst + i]).toBe(e); // exact: no fused multiply-add in WebAssembly
      }
    });
  }
  it('widen and narrow convert rows exactly (narrow rounds to nearest like Math.fround)', () => {
    const k = convKernels([2]);
    const nx = 5, px = 9, rows = 3;
    const f32 = new Float32Array(k.memory.buffer);
    const f64 = new Float64Array(k.memory.buffer);
    const rng = createRng(3);
    for (let i = 0; i < nx * rows; i++) f32[1024 / 4 + i] = rng.normal(0, 1000);
    k.widen(8192, 1024, rows, nx, px);
    for (let q = 0; q < rows; q++) for (let i = 0; i < nx; i++) expect(f64[8192 / 8 + q * px + i]).toBe(f32[1024 / 4 + q * nx + i]);
    for (let q = 0; q < rows; q++) for (let i = 0; i < nx; i++) f64[8192 / 8 + q * px + i] = rng.normal(0, 1000);
    k.narrow(2048, 8192, rows, nx, px);
    for (let q = 0; q < rows; q++) for (let i = 0; i < nx; i++) expect(f32[2048 / 4 + q * nx + i]).toBe(Math.fround(f64[8192 / 8 + q * px + i]));
  });
  it('never grows a memory: a larger request gets a new memory and leaves the old buffer attached', () => {
    const small = convKernels([1], 3 * 65536);
    const buffer = small.memory.buffer;
    expect(small.bytes).toBeGreaterThanOrEqual(3 * 65536);
    expect(convKernels([1], 65536)).toBe(small); // a smaller need reuses the instance
    const large = convKernels([2], small.bytes + 1);
    expect(large).not.toBe(small);
    expect(large.memory.buffer.byteLength).toBeGreaterThan(small.bytes);
    // a grown memory would have detached `buffer` (byteLength 0); this one keeps its size
    expect(buffer.byteLength).toBe(small.bytes);
    expect(convKernels([2, 1, 0], large.bytes)).toBe(large);
  });
  it('rejects a memory size that is not a byte count below 4 GiB', () => {
    for (const bytes of [-1, 1.5, 2 ** 32]) {
      try { convKernels([1], bytes); expect.unreachable(); } catch (e) { expect(isBoldsweepError(e, 'INVALID_ARGUMENT')).toBe(true); }
    }
  });
});
