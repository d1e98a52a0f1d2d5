import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { keptVolumeStats } from '../../src/look/kept-volume-stats.js';
import { runTimeSums } from '../../src/look/run-time-sums.js';
import { screenSpikeVoxels } from '../../src/look/spike-screen.js';
import { voxelTimeStats } from '../../src/look/voxel-time-stats.js';
import { voxelSums } from '../../src/look/voxel-sums.js';

// Fixture: test/reference/make_time_stats_fixture.py, the plain two-pass statistics computed with
// numpy (numpy.linalg.lstsq fit of a Legendre polynomial over the kept volumes, then residual sums).
// The look computes them in one streamed read (whole-run sums, later corrected for the dropped and
// censored volumes); voxelTimeStats in one read with two passes per block in cache.
const fixture = JSON.parse(readFileSync(new URL('../reference/time_stats_fixture.json', import.meta.url), 'utf8'));
const [nx, ny, nz, nt] = fixture.dims as [number, number, number, number];
const fixtureRun = makeVolume({ dims: [nx, ny, nz, nt], spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data: Float32Array.from(fixture.data as number[]) });
const constantVoxel: number = fixture.constantVoxel;

// The maps are Float32: storing a Float64 result rounds it by at most 2^-24 = 6e-8 relative (lag-1,
// |value| < 1: 6e-8 absolute). The Float64 sums agree with numpy to ~1e-12, so 1e-7 bounds the difference.
const TOL = 1e-7;

function expectClose(got: ArrayLike<number>, want: number[], what: string, relative: boolean): void {
  let worst = 0, at = -1;
  for (let v = 0; v < want.length; v++) {
    if (v === constantVoxel) continue;
    const d = Math.abs(got[v] - want[v]) / (relative ? Math.abs(want[v]) : 1);
    if (!(d <= worst)) { worst = d; at = v; }
  }
  expect(worst, `${what}: worst difference ${worst} at voxel ${at} (got ${got[at]}, numpy ${want[at]}), tolerance ${TOL}`).toBeLessThanOrEqual(TOL);
}

describe('one-pass time statistics against numpy\'s two-pass reference', () => {
  for (const c of fixture.cases) {
    const label = `order ${c.detrendOrder}, volumes from ${c.firstVolume}, censored [${c.censorVolumes.join(', ')}]`;
    it(`whole-run sums corrected for left-out volumes (the look): ${label}`, () => {
      const sums = runTimeSums(fixtureRun, { detrendOrder: c.detrendOrder });
      const s = keptVolumeStats(fixtureRun, sums, { firstVolume: c.firstVolume, censorVolumes: c.censorVolumes });
      expect(s.usedVolumes).toBe(c.usedVolumes);
      expectClose(s.mean, c.mean, 'mean', true);
      expectClose(s.sd, c.sd, 'SD', true);
      expectClose(s.tsnr, c.tsnr, 'tSNR', true);
      expectClose(s.lag1, c.lag1, 'lag-1', false);
      // a constant voxel: SD 0 (not rounding noise), tSNR and lag-1 0, no division by zero
      expect([s.sd[constantVoxel], s.tsnr[constantVoxel], s.lag1[constantVoxel]]).toEqual([0, 0, 0]);
      expect(s.mean[constantVoxel]).toBe(321.5);
    });

    it(`two passes per block in cache (voxelTimeStats): ${label}`, () => {
      const s = voxelTimeStats(fixtureRun, { detrendOrder: c.detrendOrder, firstVolume: c.firstVolume, censorVolumes: c.censorVolumes });
      expectClose(s.mean, c.mean, 'mean', true);
      expectClose(s.sd, c.sd, 'SD', true);
      expectClose(s.tsnr, c.tsnr, 'tSNR', true);
      expectClose(s.lag1, c.lag1, 'lag-1', false);
      expectClose(s.maxAbsResidual, c.maxAbsResidual, 'max |residual|', true);
    });
  }

  it('gives the same statistics whatever volume the drift fit of the sums starts at, and with the residual sums skipped', () => {
    const c = fixture.cases[0];
    for (const options of [{ fitFrom: 0 }, { fitFrom: 8 }, { fitFrom: 3, residualsAbove: Infinity }]) {
      const sums = runTimeSums(fixtureRun, { detrendOrder: c.detrendOrder, ...options });
      const s = keptVolumeStats(fixtureRun, sums, { firstVolume: c.firstVolume, censorVolumes: c.censorVolumes });
      expectClose(s.sd, c.sd, `SD (${JSON.stringify(options)})`, true);
      expectClose(s.lag1, c.lag1, `lag-1 (${JSON.stringify(options)})`, false);
    }
  });
});

/** An odd number of voxels over several kernel blocks, AR(1) noise on a drifting level, two spikes. */
function largeRun(): Volume {
  const dims: [number, number, number, number] = [31, 31, 29, 50];
  const n = 31 * 31 * 29;
  const rng = createRng(17);
  const data = new Float32Array(n * 50);
  for (let v = 0; v < n; v++) {
    const level = 100 + (v % 900), slope = ((v % 7) - 3) * 0.2;
    let e = 0;
    for (let t = 0; t < 50; t++) { e = 0.3 * e + rng.normal(0, 5); data[t * n + v] = level + slope * t + e; }
  }
  data[30 * n + 12345] += 300;
  data[44 * n + 20001] -= 250;
  return makeVolume({ dims, spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data });
}

describe('one-pass time statistics on a run of several kernel blocks', () => {
  const run = largeRun();
  const n = 31 * 31 * 29;
  const options = { firstVolume: 2, censorVolumes: [25, 26] };
  const exact = voxelTimeStats(run, { detrendOrder: 2, ...options });
  const sums = runTimeSums(run, { detrendOrder: 2, residualsAbove: 400 });
  const mask = Uint8Array.from({ length: n }, (_, v) => (v % 3 === 0 || v === 12345 || v === 20001 ? 1 : 0));
  const look = keptVolumeStats(run, sums, { ...options, mask });

  it('agrees with the two-pass statistics voxel for voxel (an internal cross-check of the two kernels)', () => {
    let worstSd = 0, worstLag = 0;
    for (let v = 0; v < n; v++) {
      worstSd = Math.max(worstSd, Math.abs(look.sd[v] - exact.sd[v]) / exact.sd[v]);
      if (mask[v]) worstLag = Math.max(worstLag, Math.abs(look.lag1[v] - exact.lag1[v]));
    }
    // both are Float32 roundings of Float64 results that agree to ~1e-12: at most one Float32 step apart
    expect(worstSd).toBeLessThanOrEqual(2.4e-7);
    expect(worstLag).toBeLessThanOrEqual(2.4e-7);
    expect(Number.isNaN(look.lag1[1])).toBe(true); // outside the mask lag-1 is not computed
  });

  it('screens spike candidates exactly as max |residual| > z * SD would', () => {
    for (const z of [3.2, 3.6, 4.1]) {
      const want: number[] = [];
      for (let v = 0; v < n; v++) if (mask[v] && exact.maxAbsResidual[v] > z * exact.sd[v]) want.push(v);
      const got = screenSpikeVoxels(run, sums, look, z);
      // a voxel whose largest residual lies within rounding of the cutoff could differ; none does here
      expect(got).toEqual(want);
      expect(got).toContain(12345);
      expect(got).toContain(20001);
    }
  });
});

describe('one-pass time statistics on bad input', () => {
  const code = (fn: () => unknown): string => {
    try { fn(); } catch (e) { expect(isBoldsweepError(e), String(e)).toBe(true); return (e as { code: string }).code; }
    throw new Error('nothing was thrown');
  };

  it('refuses sums of another run, a first volume outside the run and too few kept volumes', () => {
    const sums = runTimeSums(fixtureRun);
    const other = makeVolume({ dims: [2, 2, 2, nt], spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data: new Float32Array(8 * nt) });
    expect(code(() => keptVolumeStats(other, sums))).toBe('INVALID_ARGUMENT');
    expect(code(() => keptVolumeStats(fixtureRun, sums, { firstVolume: nt }))).toBe('INVALID_ARGUMENT');
    expect(code(() => keptVolumeStats(fixtureRun, sums, { firstVolume: nt - 3 }))).toBe('TOO_FEW_VOLUMES');
    expect(code(() => runTimeSums(makeVolume({ ...other, dims: [2, 2, 2, 1], data: new Float32Array(8) })))).toBe('NOT_4D');
  });

  it('refuses a plan whose rows, weights or fit start do not fit the run', () => {
    const weights = new Float64Array(3);
    expect(code(() => voxelSums(fixtureRun, { rows: [0, 1, nt], fitStart: 0, terms: 1, weights, mode: 'exact' }))).toBe('INVALID_ARGUMENT');
    expect(code(() => voxelSums(fixtureRun, { rows: [0, 1, 2], fitStart: 3, terms: 1, weights, mode: 'exact' }))).toBe('INVALID_ARGUMENT');
    expect(code(() => voxelSums(fixtureRun, { rows: [0, 1, 2], fitStart: 0, terms: 2, weights, mode: 'exact' }))).toBe('INVALID_ARGUMENT');
    expect(code(() => voxelSums(fixtureRun, { rows: [0, 1, 2], fitStart: 0, terms: 1, weights, mode: 'look' }))).toBe('INVALID_ARGUMENT'); // no matrices
  });

  it('does not modify the run', () => {
    const before = Float32Array.from(fixtureRun.data);
    const sums = runTimeSums(fixtureRun, { detrendOrder: 2 });
    keptVolumeStats(fixtureRun, sums, { firstVolume: 3, censorVolumes: [20] });
    voxelTimeStats(fixtureRun, { firstVolume: 3 });
    expect(fixtureRun.data).toEqual(before);
  });
});
