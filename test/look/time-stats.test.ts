import { describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume } from '../../src/core/volume.js';
import { voxelTimeStats } from '../../src/look/voxel-time-stats.js';
import { medianOf } from '../../src/look/median-of.js';

function series(values: number[][]) {
  // one voxel per row, as an (n x 1 x 1 x nt) run
  const n = values.length, nt = values[0].length;
  const data = new Float32Array(n * nt);
  for (let v = 0; v < n; v++) for (let t = 0; t < nt; t++) data[t * n + v] = values[v][t];
  return makeVolume({ dims: [n, 1, 1, nt], spacingMm: [1, 1, 1], trSec: 2, affine: diagonalAffine([1, 1, 1]), data });
}

describe('tSNR maps', () => {
  it('matches the definition mean / SD on the REFERENCES.md §5 check (ddof 1 with no detrending)', () => {
    // REFERENCES.md §5: [100,102,98,101,99] -> 63.245553 (ddof 1); definition of the sample SD
    const s = voxelTimeStats(series([[100, 102, 98, 101, 99]]), { detrendOrder: 0 });
    expect(s.ddof).toBe(1);
    expect(s.tsnr[0]).toBeCloseTo(63.245553, 4); // Float32 map: 4 decimals is within its precision at 63
    expect(s.mean[0]).toBeCloseTo(100, 5);
  });

  it('recovers mean/sd of Gaussian noise of known mean and sd', () => {
    const rng = createRng(7);
    const rows = Array.from({ length: 400 }, () => Array.from({ length: 200 }, () => rng.normal(500, 20)));
    const s = voxelTimeStats(series(rows), { detrendOrder: 2 });
    // median over 400 voxels of a 199-dof SD estimate: relative SE about 0.05/sqrt(400*0.64) = 0.3 %; 2 % is > 6 SE
    expect(Math.abs(medianOf(s.tsnr) / 25 - 1)).toBeLessThan(0.02);
  });

  it('removes a polynomial drift before the SD (order 2 leaves a quadratic trend no variance)', () => {
    const nt = 50;
    const row = Array.from({ length: nt }, (_, t) => 1000 + 3 * t + 0.05 * t * t);
    const s = voxelTimeStats(series([row]), { detrendOrder: 2 });
    expect(s.sd[0]).toBeLessThan(1e-3); // only Float32 rounding of the input remains
  });

  it('follows Krüger & Glover (2001) tSNR = SNR0 / sqrt(1 + lambda^2 SNR0^2) with a physiological component', () => {
    // Krüger G & Glover GH (2001) Magn Reson Med 46:631-637 [formula from memory, REFERENCES.md §5];
    // lambda 0.01: SNR0 = 50, 100, 400 -> 44.72136, 70.71068, 97.01425 (computed with numpy, REFERENCES.md §5).
    // Signal S = 1000; thermal SD = S / SNR0; physiological SD = lambda * S (proportional to signal).
    const expected: Array<[number, number]> = [[50, 44.72136], [100, 70.71068], [400, 97.01425]];
    for (const [snr0, tsnr] of expected) {
      const rng = createRng(snr0);
      const rows = Array.from({ length: 300 }, () => Array.from({ length: 300 }, () => 1000 * (1 + 0.01 * rng.normal()) + (1000 / snr0) * rng.normal()));
      const s = voxelTimeStats(series(rows), { detrendOrder: 0 });
      // median of 300 voxels' tSNR over 300 volumes: sampling SE ~0.25 %, 1/SD bias ~0.25 %; 1.5 % tolerance
      const got = medianOf(s.tsnr);
      expect(Math.abs(got / tsnr - 1), `SNR0 ${snr0}: got ${got}, expected ${tsnr}`).toBeLessThan(0.015);
    }
  });

  it('leaves censored volumes out of every sum', () => {
    const row = [10, 11, 9, 10, 500, 11, 9, 10, 11, 9];
    const s = voxelTimeStats(series([row]), { detrendOrder: 0, censorVolumes: [4] });
    const kept = row.filter((_, t) => t !== 4);
    const m = kept.reduce((a, b) => a + b, 0) / kept.length;
    const sd = Math.sqrt(kept.reduce((a, b) => a + (b - m) ** 2, 0) / (kept.length - 1));
    expect(s.mean[0]).toBeCloseTo(m, 5);
    expect(s.sd[0]).toBeCloseTo(sd, 5);
    expect(s.usedVolumes).toBe(9);
  });
});
