import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { loadKernelModule } from '../../src/core/load-kernel-module.js';

// The kernels are compiled from kernels/*.ts by `npm run build` (scripts/build-kernels.mjs); the
// tests run after the build, as `npm test` does.
describe('loadKernelModule', () => {
  it('compiles each built kernel once per thread and gives every instance its own memory of the asked size', () => {
    const conv = loadKernelModule('gaussian-conv');
    expect(loadKernelModule('gaussian-conv')).toBe(conv);
    const a = conv.instantiate(2), b = conv.instantiate(3);
    expect([a.memory.buffer.byteLength, b.memory.buffer.byteLength]).toEqual([2 * 65536, 3 * 65536]);
    expect(Object.keys(loadKernelModule('voxel-sums').instantiate(1).exports).sort()).toEqual(['exact', 'look']);
  });
  it('names a kernel that was not built (KERNEL_MISSING: run npm run build)', () => {
    try { loadKernelModule('no-such-kernel'); expect.unreachable(); } catch (e) {
      expect(isBoldsweepError(e, 'KERNEL_MISSING')).toBe(true);
      expect(String(e)).toContain('no-such-kernel.wasm');
    }
  });
});
