import { describe, expect, it } from 'vitest';
import { affineFromRows, applyAffine, diagonalAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { createRng } from '../../src/core/random.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import { plantActivations, type PlantOptions } from '../../src/plant/plant-activations.js';
import { interiorVoxels } from '../../src/plant/plant-placement.js';
import { blobProfile, blobWeight } from '../../src/plant/plant-profile.js';

const [NX, NY, NZ, NT] = [24, 24, 14, 30];
const N = NX * NY * NZ;

/** A synthetic run: smooth baseline 200..600 plus N(0, 5) noise, 3 mm voxels, TR 2 s. */
function syntheticRun(seed = 5): Volume {
  const rng = createRng(seed);
  const data = new Float32Array(N * NT);
  for (let t = 0; t < NT; t++) for (let v = 0; v < N; v++) data[v + N * t] = 200 + (v % 400) + rng.normal(0, 5);
  return makeVolume({ dims: [NX, NY, NZ, NT], spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3], [-36, -36, -21]), data });
}

/** Placement region: a box leaving 3 voxels at each face. */
function boxMask(): Uint8Array {
  const m = new Uint8Array(N);
  for (let k = 3; k < NZ - 3; k++) for (let j = 3; j < NY - 3; j++) for (let i = 3; i < NX - 3; i++) m[i + NX * (j + NY * k)] = 1;
  return m;
}

/** A block-design time course with a negative dip, so rescaling to peak 1 matters. */
const timeCourse = Array.from({ length: NT }, (_, t) => (t % 10 < 5 ? 2.5 : -0.5));

const base = (over: Partial<PlantOptions> = {}): PlantOptions => ({
  count: 4, fwhmMm: 6, amplitudePct: 3, timeCourse, placementMask: boxMask(), seed: 42, ...over,
});

function codeOf(f: () => unknown): string {
  try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : `other: ${String(e)}`; }
  return 'none';
}

describe('plantActivations', () => {
  it('adds exactly amplitude% x baseline x timeCourse x profile and leaves the input untouched', () => {
    const run = syntheticRun();
    const before = new Float32Array(run.data);
    const { volume, truth } = plantActivations(run, base());
    expect(Buffer.from(run.data.buffer).equals(Buffer.from(before.buffer))).toBe(true);
    expect(volume.data).not.toBe(run.data);
    expect(volume.dims).toEqual(run.dims);
    expect(Array.from(truth.timeCourse)).toEqual(timeCourse.map((x) => x / 2.5));
    let worst = 0, changed = 0;
    for (let v = 0; v < N; v++) {
      let sum = 0;
      for (let t = 0; t < NT; t++) sum += before[v + N * t];
      const baseline = sum / NT;
      if (truth.profile[v] > 0) changed++;
      for (let t = 0; t < NT; t++) {
        const expected = before[v + N * t] + (3 / 100) * baseline * truth.profile[v] * (timeCourse[t] / 2.5);
        const got = volume.data[v + N * t];
        // the result is stored as Float32: allow one unit in the last place of the value (2^-23 relative)
        worst = Math.max(worst, Math.abs(got - expected) / (Math.abs(expected) * 2 ** -23));
      }
    }
    expect(worst, `largest error in float32 ULPs`).toBeLessThanOrEqual(1);
    expect(changed).toBeGreaterThan(0);
  });

  it('is reproducible from its seed and differs between seeds', () => {
    const run = syntheticRun();
    const a = plantActivations(run, base());
    const b = plantActivations(run, base());
    const c = plantActivations(run, base({ seed: 43 }));
    expect(Buffer.from(a.volume.data.buffer).equals(Buffer.from(b.volume.data.buffer))).toBe(true);
    expect(a.truth.centresVoxel).toEqual(b.truth.centresVoxel);
    expect(a.truth.centresVoxel).not.toEqual(c.truth.centresVoxel);
  });

  it('puts centres inside the mask, away from its edge and from each other', () => {
    const run = syntheticRun();
    const mask = boxMask();
    for (const seed of [1, 2, 3, 4, 5]) {
      const { truth } = plantActivations(run, base({ seed, count: 5, separation: 2, marginMm: 6 }));
      expect(truth.blobs).toHaveLength(5);
      for (const [i, j, k] of truth.centresVoxel) {
        // margin 6 mm = 2 voxels: the centre is at least 2 voxels from any face of the box
        expect(mask[i + NX * (j + NY * k)]).toBe(1);
        expect(Math.min(i - 3, NX - 4 - i, j - 3, NY - 4 - j, k - 3, NZ - 4 - k)).toBeGreaterThanOrEqual(2);
      }
      for (let p = 0; p < 5; p++) {
        expect(truth.centresMm[p]).toEqual(applyAffine(run.affine, truth.centresVoxel[p]));
        for (let q = 0; q < p; q++) {
          const d = Math.hypot(...truth.centresMm[p].map((x, a) => x - truth.centresMm[q][a]));
          expect(d).toBeGreaterThanOrEqual(2 * 6);
        }
      }
    }
  });

  it('marks as truth the voxels within half the FWHM of a centre (half maximum)', () => {
    // Gaussian: weight exp(-r^2/(2 sigma^2)) = 1/2 at r = FWHM/2 (definition of FWHM, REFERENCES.md §1)
    expect(blobWeight({ shape: 'gaussian', fwhmMm: 6 }, 3)).toBeCloseTo(0.5, 15);
    const { truth } = plantActivations(syntheticRun(), base({ fwhmMm: 9 }));
    let truthCount = 0;
    for (const blob of truth.blobs) {
      const [ci, cj, ck] = blob.centreVoxel;
      expect(truth.profile[ci + NX * (cj + NY * ck)]).toBeCloseTo(1, 2); // 1 at the centre, plus tails of others (< 1%)
      for (const v of blob.truthVoxels) {
        const k = Math.floor(v / (NX * NY)), j = Math.floor(v / NX) % NY, i = v % NX;
        expect(Math.hypot(i - ci, j - cj, k - ck) * 3).toBeLessThanOrEqual(4.5 + 1e-9);
      }
      // voxel offsets with |d| <= 1.5 voxels on a 3 mm grid: 1 + 6 + 12 = 19 (lattice count)
      expect(blob.truthVoxels.length).toBe(19);
      truthCount += blob.truthVoxels.length;
    }
    expect(truth.mask.reduce((s, m) => s + m, 0)).toBe(truthCount);
  });

  it('plants soft-edged spheres whose half-weight surface is the stated radius', () => {
    const s = { shape: 'sphere' as const, radiusMm: 6, edgeMm: 3 };
    expect([blobWeight(s, 0), blobWeight(s, 4.5), blobWeight(s, 6), blobWeight(s, 7.5), blobWeight(s, 8)]).toEqual([1, 1, 0.5, 0, 0]);
    // raised cosine: a quarter of the way into the edge the weight is (1 + cos(pi/4))/2
    expect(blobWeight(s, 5.25)).toBeCloseTo((1 + Math.SQRT1_2) / 2, 15);
    const { truth } = plantActivations(syntheticRun(), base({ shape: 'sphere', radiusMm: 6, edgeMm: 3, count: 2 }));
    expect(truth.sizeMm).toBe(12);
    // voxel offsets within 2 voxels of the centre: 1 + 6 + 12 + 8 + 6 = 33 (lattice count, |d|^2 <= 4)
    for (const blob of truth.blobs) expect(blob.truthVoxels.length).toBe(33);
  });

  it('measures distances in world mm on anisotropic and oblique grids', () => {
    const spec = { shape: 'gaussian' as const, fwhmMm: 8 };
    const aniso = blobProfile([9, 9, 9], diagonalAffine([2, 2, 4]), [4, 4, 4], spec);
    const at = (p: typeof aniso, v: number) => p.weight[Array.from(p.index).indexOf(v)];
    expect(at(aniso, 4 + 9 * (4 + 9 * 5))).toBeCloseTo(blobWeight(spec, 4), 6); // one slice up = 4 mm
    expect(at(aniso, 5 + 9 * (4 + 9 * 4))).toBeCloseTo(blobWeight(spec, 2), 6); // one column over = 2 mm
    // rotate the grid 30 degrees about z: distances, hence weights, are unchanged
    const c = Math.cos(Math.PI / 6), s = Math.sin(Math.PI / 6);
    const rotated = blobProfile([9, 9, 9], affineFromRows([[2 * c, -2 * s, 0, 5], [2 * s, 2 * c, 0, -3], [0, 0, 4, 1]]), [4, 4, 4], spec);
    expect(Array.from(rotated.index)).toEqual(Array.from(aniso.index));
    for (let m = 0; m < aniso.weight.length; m++) expect(rotated.weight[m]).toBeCloseTo(aniso.weight[m], 6);
  });

  it('keeps centres a margin inside an irregular mask', () => {
    const dims = [7, 7, 7];
    const mask = new Uint8Array(343).fill(1);
    mask[3 + 7 * (3 + 7 * 4)] = 0; // a hole above the middle voxel
    const inner = interiorVoxels(mask, dims, diagonalAffine([1, 1, 1]), 1);
    expect(inner.includes(3 + 7 * (3 + 7 * 3))).toBe(false); // next to the hole
    expect(inner.includes(1 + 7 * (1 + 7 * 1))).toBe(true);
    expect(inner.includes(0)).toBe(false); // at the grid edge
  });

  it('reports what does not fit, masks on other grids and bad sizes with typed errors', () => {
    const run = syntheticRun();
    let fitted = -1;
    try { plantActivations(run, base({ count: 40, fwhmMm: 9 })); } catch (e) {
      expect(isBoldsweepError(e, 'PLANTING_DOES_NOT_FIT')).toBe(true);
      fitted = (e as { details: { fitted: number } }).details.fitted;
      expect((e as Error).message).toMatch(new RegExp(`only ${fitted} of 40`));
    }
    expect(fitted).toBeGreaterThan(0);
    expect(fitted).toBeLessThan(40);
    expect(codeOf(() => plantActivations(run, base({ placementMask: new Uint8Array(N - 1) })))).toBe('GRID_MISMATCH');
    const shifted = makeVolume({ dims: [NX, NY, NZ, 1], spacingMm: [3, 3, 3], trSec: 0, affine: diagonalAffine([3, 3, 3]), data: Float32Array.from(boxMask()) });
    expect(codeOf(() => plantActivations(run, base({ placementMask: shifted })))).toBe('GRID_MISMATCH');
    const sameGridMask = makeVolume({ dims: [NX, NY, NZ, 1], spacingMm: [3, 3, 3], trSec: 0, affine: run.affine, data: Float32Array.from(boxMask()) });
    expect(codeOf(() => plantActivations(run, base({ placementMask: sameGridMask })))).toBe('none');
    for (const bad of [{ fwhmMm: 0 }, { fwhmMm: -2 }, { fwhmMm: Number.NaN }, { count: 0 }, { count: 1.5 }, { amplitudePct: Infinity },
      { timeCourse: timeCourse.slice(1) }, { timeCourse: timeCourse.map(() => 0) }, { truthFraction: 0 }, { separation: -1 },
      { shape: 'sphere' as const, radiusMm: 3, edgeMm: 7 }, { shape: 'sphere' as const }, { seed: -1 }]) {
      expect(codeOf(() => plantActivations(run, base(bad))), JSON.stringify(bad)).toBe('INVALID_ARGUMENT');
    }
    const single = makeVolume({ dims: [NX, NY, NZ, 1], spacingMm: [3, 3, 3], trSec: 2, affine: run.affine, data: new Float32Array(N) });
    expect(codeOf(() => plantActivations(single, base({ timeCourse: [1] })))).toBe('NOT_4D');
  });
});

/** Values whose 32-bit patterns differ between two arrays of the same length. */
function differing(a: Float32Array, b: Float32Array): number {
  const x = new Int32Array(a.buffer, a.byteOffset, a.length);
  const y = new Int32Array(b.buffer, b.byteOffset, b.length);
  let k = 0;
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) k++;
  return k + Math.abs(a.length - b.length);
}

describe('plantActivations with seriesOnly', () => {
  it('returns the run itself and the planted voxels\' series: the planted copy\'s bytes there, the run\'s elsewhere', () => {
    const run = syntheticRun();
    const before = Float32Array.from(run.data);
    const slices = Array.from({ length: NZ }, (_, k) => timeCourse.map((c, t) => (t + k / NZ) % 10 < 5 ? c : -0.5));
    for (const over of [{}, { sliceTimeCourses: slices }, { shape: 'sphere' as const, radiusMm: 5, fwhmMm: undefined }]) {
      const copy = plantActivations(run, base(over));
      const only = plantActivations(run, base({ ...over, seriesOnly: true }));
      expect(only.volume).toBe(run);
      expect(differing(run.data, before)).toBe(0);
      expect(only.truth).toEqual(copy.truth);
      const { voxels, values } = only.plantedSeries!;
      const m = voxels.length;
      expect(values.length).toBe(m * NT);
      const rebuilt = Float32Array.from(run.data);
      for (let t = 0; t < NT; t++) for (let q = 0; q < m; q++) rebuilt[voxels[q] + N * t] = values[t * m + q];
      expect(differing(rebuilt, copy.volume.data)).toBe(0);
      expect(m).toBeGreaterThan(0);
    }
  });
});
