import { describe, expect, it } from 'vitest';
import type { BoundaryMode } from '../../src/core/boundary-mode.js';
import { createRng } from '../../src/core/random.js';
import { loadKernelModule } from '../../src/core/load-kernel-module.js';
import { extendCoefficients } from '../../src/resample/extend-coefficients.js';
import { scanNonFinite } from '../../src/io/non-finite.js';
import { resampleVoxels } from '../../src/resample/resample-voxels.js';
import { trilinearKernel } from '../../src/resample/trilinear-wasm.js';

// The linear kernel without a displacement field runs kernels/trilinear.ts; with one (here all zeros,
// so every position is the same number) it runs the TypeScript row routine. Both must give the same
// bits: the kernel repeats that routine's Float64 operations in the same order.
const DIMS: [number, number, number] = [13, 11, 7];

/** Row-major 4x4 output voxel -> source voxel: a rotation about z and x by `deg` about the grid centre, then a shift. */
function map(deg: number, shift: [number, number, number]): Float64Array {
  const a = (deg * Math.PI) / 180, b = (0.6 * deg * Math.PI) / 180;
  const c = DIMS.map((n) => (n - 1) / 2);
  const ca = Math.cos(a), sa = Math.sin(a), cb = Math.cos(b), sb = Math.sin(b);
  // R = Rz(a) Rx(b); x_src = R (x_out - c) + c + shift
  const R = [ca, -sa * cb, sa * sb, sa, ca * cb, -ca * sb, 0, sb, cb];
  const m = new Float64Array(16);
  for (let r = 0; r < 3; r++) {
    m[4 * r] = R[3 * r]; m[4 * r + 1] = R[3 * r + 1]; m[4 * r + 2] = R[3 * r + 2];
    m[4 * r + 3] = c[r] + shift[r] - (R[3 * r] * c[0] + R[3 * r + 1] * c[1] + R[3 * r + 2] * c[2]);
  }
  m[15] = 1;
  return m;
}

describe('WebAssembly trilinear kernel', () => {
  it('is the module built from kernels/trilinear.ts: imports its memory, exports linearVolume and countNonFinite only', () => {
    const { exports } = loadKernelModule('trilinear').instantiate(1);
    expect(Object.keys(exports).sort()).toEqual(['countNonFinite', 'linearVolume']);
  });
  it('countNonFinite counts NaN and both infinities (any count, any alignment), as scanNonFinite does', () => {
    const values = new Float32Array(103);
    createRng(3).fillNormal(values, 0, 1e30);
    values[0] = NaN; values[5] = Infinity; values[6] = -Infinity; values[101] = NaN; values[102] = 3.4e38;
    for (const [from, len] of [[0, 103], [1, 101], [2, 3], [7, 0], [100, 3]]) {
      const k = trilinearKernel(len, 1);
      new Float32Array(k.memory.buffer, k.sourceAt, len).set(values.subarray(from, from + len));
      expect(k.countNonFinite(k.sourceAt, len)).toBe(scanNonFinite(values.subarray(from, from + len), false).count);
    }
  });
  const rng = createRng(9);
  const image = new Float32Array(DIMS[0] * DIMS[1] * DIMS[2]);
  rng.fillNormal(image, 100, 30);
  const modes: BoundaryMode[] = ['constant', 'nearest', 'mirror', 'reflect', 'wrap'];
  for (const mode of modes) {
    for (const margin of [0, 1]) {
      for (const [deg, shift] of [[0, [0, 0, 0]], [3, [0.3, -0.2, 0.1]], [25, [2.5, -4, 1.5]], [-40, [-9, 6, -5]]] as Array<[number, [number, number, number]]>) {
        it(`${mode}, margin ${margin}, ${deg} deg, shift ${shift.join(' ')}: the bits of the TypeScript row routine`, () => {
          const x = extendCoefficients(image, DIMS, mode, margin);
          const outDims: [number, number, number] = [DIMS[0] + 2, DIMS[1] - 1, DIMS[2] + 1];
          const m = outDims[0] * outDims[1] * outDims[2];
          const input = { source: x.values, sourceDims: x.dims, pad: 0, margin, srcFromOut: map(deg, shift), outDims, kernel: 'linear' as const, mode, cval: -7.25 };
          const byKernel = resampleVoxels(input, new Float32Array(m));
          const byRows = resampleVoxels({ ...input, displacementVox: new Float32Array(3 * m) }, new Float32Array(m));
          expect(Buffer.from(byKernel.buffer).equals(Buffer.from(byRows.buffer))).toBe(true);
          if (deg !== 0) expect(byKernel.some((v) => v === -7.25)).toBe(mode === 'constant');
          if (margin === 1 && (mode === 'constant' || mode === 'nearest')) {
            // the same positions over the image itself, its margin only virtual: the same bits again
            const virtual = resampleVoxels({ ...input, source: image, sourceDims: DIMS, margin: 0, virtualMargin: 1 }, new Float32Array(m));
            expect(Buffer.from(virtual.buffer).equals(Buffer.from(byRows.buffer))).toBe(true);
          }
        });
      }
    }
  }
});
