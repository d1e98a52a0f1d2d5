import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';

/**
 * Per-voxel mean over volumes `firstVolume..nt-1`, one pass over the data with a Float64
 * accumulator per voxel. The loop runs over blocks of 4096 voxels so the accumulators stay in the
 * first-level cache while each volume's block streams past. A voxel holding any NaN or infinite
 * value gets NaN (the sum of a non-finite value is never finite), which marks it as unusable.
 * @param run - the run (not modified)
 * @param firstVolume - first volume to include (default 0)
 * @returns Float64Array of length nx*ny*nz
 * @throws BoldsweepError INVALID_ARGUMENT when firstVolume leaves no volume
 * @example const mean = meanImage(run.volume)
 */
export function meanImage(run: Volume, firstVolume = 0): Float64Array {
  const n = voxelsPerVolume(run);
  const nt = run.dims[3];
  if (!Number.isInteger(firstVolume) || firstVolume < 0 || firstVolume >= nt) fail('INVALID_ARGUMENT', `firstVolume must be in 0..${nt - 1}, got ${firstVolume}`);
  const out = new Float64Array(n);
  const block = 4096;
  const acc = new Float64Array(block);
  const data = run.data;
  const inv = 1 / (nt - firstVolume);
  for (let v0 = 0; v0 < n; v0 += block) {
    const len = Math.min(block, n - v0);
    acc.fill(0);
    for (let t = firstVolume; t < nt; t++) {
      const base = t * n + v0;
      for (let j = 0; j < len; j++) acc[j] += data[base + j];
    }
    for (let j = 0; j < len; j++) {
      const m = acc[j] * inv;
      out[v0 + j] = Number.isFinite(m) ? m : NaN;
    }
  }
  return out;
}
