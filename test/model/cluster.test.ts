import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { clusterFweP, clusterTheory, minClusterVoxels } from '../../src/model/cluster-extent.js';
import type { Resels } from '../../src/model/rft-ec-density.js';
import { reselCounts } from '../../src/model/resels.js';
import { thresholdClusterExtent } from '../../src/model/threshold-cluster.js';

// Independent evaluation of the Friston et al. (1994) cluster-size distribution: test/reference/make_rft_fixture.py.
const fx = JSON.parse(readFileSync(new URL('../reference/rft_fixture.json', import.meta.url), 'utf8')) as {
  cluster: Array<{ resels: number[]; voxels: number; dof: number | null; formingP: number; u: number; expectedClusters: number; expectedVoxels: number; beta: number; k05: number; pAt: number[][] }>;
};
const code = (f: () => unknown): string | undefined => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; } return undefined; };
const rel = (a: number, b: number): number => Math.abs(a / b - 1);

describe('random-field cluster-size distribution (Friston KJ et al. 1994, Hum Brain Mapp 1:210-220)', () => {
  it('E[m], E[N], beta, P(max >= k) and the 5 % critical size match scipy for z and t, p = 0.001 and 0.01', () => {
    for (const c of fx.cluster) {
      const stat = c.dof === null ? ({ kind: 'z' } as const) : ({ kind: 't', dof: c.dof } as const);
      const th = clusterTheory({ resels: c.resels as unknown as Resels, voxels: c.voxels, formingThreshold: c.u, stat });
      const what = `resels ${c.resels} dof ${c.dof} p ${c.formingP}`;
      // 1e-9 relative: same closed forms; differences come from the tail functions (tested to 1e-9 elsewhere)
      expect(rel(th.expectedClusters, c.expectedClusters), what).toBeLessThan(1e-9);
      expect(rel(th.expectedVoxels, c.expectedVoxels), what).toBeLessThan(1e-9);
      expect(rel(th.beta, c.beta), what).toBeLessThan(1e-9);
      for (const [k, p] of c.pAt) expect(rel(clusterFweP(k, th), p), `${what} k ${k}`).toBeLessThan(1e-8);
      expect(minClusterVoxels(th, 0.05), what).toBe(c.k05);
    }
  });
  it('the critical size is the smallest k with P(max >= k) <= alpha', () => {
    const th = clusterTheory({ resels: [1, 30, 300, 1000], voxels: 125000, formingThreshold: 3.09, stat: { kind: 'z' } });
    for (const alpha of [0.01, 0.05, 0.2]) {
      const k = minClusterVoxels(th, alpha);
      expect(clusterFweP(k, th)).toBeLessThanOrEqual(alpha);
      expect(clusterFweP(k - 1, th)).toBeGreaterThan(alpha);
    }
  });
  it('a forming threshold too low for the theory (E[m] <= 0) is refused', () => {
    // at u = 0.5 the rho3 term (u^2 - 1 < 0) dominates and E[EC] is negative
    expect(code(() => clusterTheory({ resels: [1, 30, 300, 1000], voxels: 125000, formingThreshold: 0.5, stat: { kind: 'z' } }))).toBe('INVALID_ARGUMENT');
  });
});

describe('thresholdClusterExtent', () => {
  const dims = [40, 40, 40];
  const n = 40 ** 3;
  const idx = (x: number, y: number, z: number): number => x + 40 * (y + 40 * z);
  const mask = new Uint8Array(n);
  for (let z = 2; z < 38; z++) for (let y = 2; y < 38; y++) for (let x = 2; x < 38; x++) mask[idx(x, y, z)] = 1;
  const options = { alpha: 0.05, stat: { kind: 'z' } as const, fwhmMm: 8, spacingMm: [2, 2, 2], formingP: 0.001 };
  const theory = clusterTheory({ resels: reselCounts(mask, dims, 8, [2, 2, 2]).resels, voxels: 36 ** 3, formingThreshold: 3.090232306167813, stat: { kind: 'z' } });
  const k = minClusterVoxels(theory, 0.05);

  function block(map: Float32Array, x0: number, y0: number, z0: number, sx: number, sy: number, sz: number, value: number): void {
    for (let z = z0; z < z0 + sz; z++) for (let y = y0; y < y0 + sy; y++) for (let x = x0; x < x0 + sx; x++) map[idx(x, y, z)] = value;
  }

  it('keeps a cluster of k voxels and drops one of k - 1', () => {
    const map = new Float32Array(n);
    // a k-voxel cluster and a (k - 1)-voxel one (filled in scan order, so each is connected), far apart;
    // values 5 and 4 are above the forming threshold 3.09
    const big = new Float32Array(n);
    let placed = 0;
    for (let z = 5; z < 15 && placed < k; z++) for (let y = 5; y < 15 && placed < k; y++) for (let x = 5; x < 15 && placed < k; x++) { big[idx(x, y, z)] = 5; placed++; }
    placed = 0;
    for (let z = 22; z < 32 && placed < k - 1; z++) for (let y = 22; y < 32 && placed < k - 1; y++) for (let x = 22; x < 32 && placed < k - 1; x++) { map[idx(x, y, z)] = 4; placed++; }
    for (let i = 0; i < n; i++) map[i] = Math.max(map[i], big[i]);
    const r = thresholdClusterExtent(map, mask, dims, options);
    expect(r.rule).toBe('cluster-fwe');
    expect(r.threshold).toBeCloseTo(3.090232306167813, 9); // norm.isf(0.001), rft_fixture.json tails
    expect(r.details.minClusterVoxels).toBe(k);
    expect(r.details.clusters.map((c) => c.voxels)).toEqual([k, k - 1]);
    expect(r.details.clusters[0].peak).toBe(5);
    expect(r.details.clusters[0].fweP).toBeLessThanOrEqual(0.05);
    expect(r.details.clusters[1].fweP).toBeGreaterThan(0.05);
    expect(r.details.survivingClusters).toBe(1);
    expect(r.details.survivorCount).toBe(k);
    let mismatches = 0;
    for (let i = 0; i < n; i++) if (r.survivors[i] !== (big[i] > 0 ? 1 : 0)) mismatches++;
    expect(mismatches).toBe(0);
  });
  it('connectivity decides whether edge-touching blocks are one cluster', () => {
    // two w x w x d blocks sharing one edge line along z (diagonal neighbours in xy): 18- but not 6-connected.
    // d is chosen so each block alone is below k and the pair together reaches k.
    const w = 4, d = Math.ceil(k / (2 * w * w));
    expect(w * w * d < k && 2 * w * w * d >= k).toBe(true);
    const map = new Float32Array(n);
    block(map, 5, 5, 3, w, w, d, 6);
    block(map, 5 + w, 5 + w, 3, w, w, d, 6);
    const six = thresholdClusterExtent(map, mask, dims, { ...options, connectivity: 6 });
    const eighteen = thresholdClusterExtent(map, mask, dims, { ...options, connectivity: 18 });
    expect(six.details.clusters.map((c) => c.voxels)).toEqual([w * w * d, w * w * d]);
    expect(eighteen.details.clusters.map((c) => c.voxels)).toEqual([2 * w * w * d]);
    expect(six.details.survivorCount).toBe(0);
    expect(eighteen.details.survivorCount).toBe(2 * w * w * d);
  });
  it('a t map uses the t tail for the forming threshold', () => {
    const r = thresholdClusterExtent(new Float32Array(n), mask, dims, { ...options, stat: { kind: 't', dof: 40 } });
    const c = fx.cluster.find((cc) => cc.dof === 40 && cc.formingP === 0.001)!;
    expect(Math.abs(r.threshold - c.u)).toBeLessThan(1e-8); // scipy t.isf(0.001, 40)
    expect(r.details.survivorCount).toBe(0);
  });
  it('errors: alpha or formingP outside (0, 1) -> INVALID_ARGUMENT; map and mask lengths differ -> GRID_MISMATCH', () => {
    const map = new Float32Array(n);
    expect(code(() => thresholdClusterExtent(map, mask, dims, { ...options, alpha: 0 }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdClusterExtent(map, mask, dims, { ...options, formingP: 1 }))).toBe('INVALID_ARGUMENT');
    expect(code(() => thresholdClusterExtent(map, mask.subarray(1), dims, options))).toBe('GRID_MISMATCH');
    expect(code(() => thresholdClusterExtent(map, mask, dims, { ...options, connectivity: 4 as 6 }))).toBe('INVALID_ARGUMENT');
  });
});
