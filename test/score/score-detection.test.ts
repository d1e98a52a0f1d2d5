import { describe, expect, it } from 'vitest';
import { diagonalAffine, type Vec3 } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume } from '../../src/core/volume.js';
import type { PlantTruth } from '../../src/plant/plant-activations.js';
import { clusterCounts } from '../../src/score/cluster-counts.js';
import { diceCoefficient } from '../../src/score/dice.js';
import { effectBias } from '../../src/score/effect-bias.js';
import { blobPeaks } from '../../src/score/blob-peaks.js';
import { rocCurve } from '../../src/score/roc-curve.js';
import { scoreDetection } from '../../src/score/score-detection.js';

// A 10 x 10 x 1 grid of 2 mm voxels; voxel (i, j) is index i + 10 j.
const dims: [number, number, number] = [10, 10, 1];
const affine = diagonalAffine([2, 2, 2]);
const at = (i: number, j: number) => i + 10 * j;

/** A hand-made truth: blob A = 2x2 square at (1..2, 1..2), blob B = 3x1 bar at (6..8, 6). */
function handTruth(): PlantTruth {
  const mask = new Uint8Array(100);
  const profile = new Float32Array(100);
  const a = [at(1, 1), at(2, 1), at(1, 2), at(2, 2)];
  const b = [at(6, 6), at(7, 6), at(8, 6)];
  for (const v of [...a, ...b]) { mask[v] = 1; profile[v] = 0.5; }
  profile[at(1, 1)] = 1; profile[at(7, 6)] = 1;
  const centresVoxel: Vec3[] = [[1, 1, 0], [7, 6, 0]];
  const centresMm: Vec3[] = [[2, 2, 0], [14, 12, 0]];
  return {
    dims, affine, shape: { shape: 'gaussian', fwhmMm: 4 }, sizeMm: 4, amplitudePct: 2, truthFraction: 0.5, seed: 3,
    mask, profile, timeCourse: new Float64Array([0, 1]), centresMm, centresVoxel,
    blobs: [
      { centreVoxel: centresVoxel[0], centreMm: centresMm[0], truthVoxels: Int32Array.from(a) },
      { centreVoxel: centresVoxel[1], centreMm: centresMm[1], truthVoxels: Int32Array.from(b) },
    ],
  };
}

describe('diceCoefficient', () => {
  it('is 2|A∩B| / (|A| + |B|) (Dice 1945 Ecology 26:297-302)', () => {
    const a = new Uint8Array(10), b = new Uint8Array(10);
    [0, 1, 2, 3].forEach((v) => (a[v] = 1));
    [1, 2, 3, 4, 5, 6].forEach((v) => (b[v] = 1));
    expect(diceCoefficient(a, b)).toBe((2 * 3) / (4 + 6));
    expect(diceCoefficient(a, a)).toBe(1);
    expect(diceCoefficient(a, Uint8Array.from([0, 0, 0, 0, 1, 1, 0, 0, 0, 0]))).toBe(0);
    expect(diceCoefficient(new Uint8Array(3), new Uint8Array(3))).toBeNaN();
    // region: ignoring voxels 4..9 leaves A = 4, B = 3, overlap 3 -> 6/7
    expect(diceCoefficient(a, b, [1, 1, 1, 1, 0, 0, 0, 0, 0, 0])).toBe(6 / 7);
  });
});

describe('clusterCounts', () => {
  it('counts clusters that contain no truth voxel as false', () => {
    const truth = handTruth();
    const s = new Uint8Array(100);
    s[at(2, 2)] = s[at(3, 3)] = 1; // one 26-connected cluster touching blob A
    s[at(5, 0)] = 1; // isolated false cluster
    s[at(0, 8)] = s[at(0, 9)] = 1; // second false cluster of 2
    expect(clusterCounts(s, truth.mask, dims, 26)).toEqual({ clusters: 3, trueClusters: 1, falseClusters: 2, falseClusterVoxels: 3 });
    // with face neighbours only, (3,3) splits from (2,2) and becomes a false cluster
    expect(clusterCounts(s, truth.mask, dims, 6)).toEqual({ clusters: 4, trueClusters: 1, falseClusters: 3, falseClusterVoxels: 4 });
  });
});

describe('blobPeaks', () => {
  it('is the world distance from each centre to the largest statistic within the radius', () => {
    const truth = handTruth();
    const stat = new Float32Array(100);
    stat[at(2, 2)] = 5; // sqrt(2) voxels = 2.828 mm from blob A's centre
    stat[at(1, 1)] = 4;
    stat[at(7, 6)] = 9; // blob B's peak on its centre
    stat[at(9, 9)] = 50; // far away: outside both search radii of 4 mm
    const p = blobPeaks(stat, dims, affine, truth.centresVoxel, 4);
    expect(p.errorMm[0]).toBeCloseTo(2 * Math.SQRT2, 12);
    expect(p.errorMm[1]).toBe(0);
    expect(Array.from(p.peakValue)).toEqual([5, 9]);
    expect(Array.from(p.centreValue)).toEqual([4, 9]);
    // a brain mask hiding (2,2) moves blob A's peak back onto its centre
    const brain = new Uint8Array(100).fill(1);
    brain[at(2, 2)] = 0;
    expect(blobPeaks(stat, dims, affine, truth.centresVoxel, 4, brain).errorMm[0]).toBe(0);
  });
});

describe('effectBias', () => {
  it('compares the mean estimated effect with amplitude x profile over truth voxels', () => {
    const truth = handTruth();
    const eff = new Float32Array(100);
    for (let v = 0; v < 100; v++) eff[v] = truth.mask[v] ? 0.75 : 0;
    eff[at(1, 1)] = 1.5; eff[at(7, 6)] = 1.5;
    // planted: 2% x profile -> 2 at the two centres, 1 at the other five truth voxels: mean 9/7
    // estimated: 1.5 at the centres, 0.75 elsewhere: mean (3 + 3.75)/7 = 6.75/7
    const b = effectBias(eff, truth);
    expect(b.plantedPct).toBeCloseTo(9 / 7, 12);
    expect(b.estimatedPct).toBeCloseTo(6.75 / 7, 6); // float32 storage of 0.75 and 1.5 is exact; 1e-6 for the sum
    expect(b.ratio).toBeCloseTo(0.75, 6);
    expect(b.biasPct).toBeCloseTo((6.75 - 9) / 7, 6);
    expect(b.centreEstimatedPct).toBe(1.5);
    expect(b.centreBiasPct).toBe(-0.5);
  });
});

describe('scoreDetection', () => {
  it('gives the hand-counted hits, false alarms, Dice and per-blob detection', () => {
    const truth = handTruth();
    const brain = new Uint8Array(100).fill(1);
    brain[at(9, 0)] = 0; // one voxel outside the brain, holding a survivor that must be ignored
    const survivors = new Uint8Array(100);
    [at(1, 1), at(2, 1), at(1, 2), at(3, 1), at(5, 5), at(9, 0)].forEach((v) => (survivors[v] = 1));
    const stat = makeVolume({ dims: [10, 10, 1, 1], spacingMm: [2, 2, 2], trSec: 0, affine, data: new Float32Array(100) });
    survivors.forEach((s, v) => (stat.data[v] = s ? 4 : 0));
    stat.data[at(1, 1)] = 6; // blob A's peak on its centre
    stat.data[at(8, 6)] = 1; // blob B's peak one voxel (2 mm) from its centre (7,6)
    const row = scoreDetection({ statistic: stat, survivors, truth, brainMask: brain, threshold: 3.5, thresholdMethod: 'hand' });
    // in brain: 99 voxels, 7 truth, survivors 5 (the one at (9,0) is outside), 3 of them truth
    expect(row.brainVoxels).toBe(99);
    expect(row.truthVoxels).toBe(7);
    expect(row.survivorVoxels).toBe(5);
    expect(row.truePositiveVoxels).toBe(3);
    expect(row.falsePositiveVoxels).toBe(2);
    expect(row.hitRate).toBe(3 / 7);
    expect(row.falseAlarmRate).toBe(2 / 92);
    expect(row.dice).toBe((2 * 3) / (5 + 7));
    // blob A hit, blob B missed
    expect([row.blobs, row.blobsDetected, row.blobHitRate]).toEqual([2, 1, 0.5]);
    // clusters: {(1,1),(2,1),(1,2),(3,1)} touches A; {(5,5)} is false
    expect([row.clusters, row.falseClusters]).toEqual([2, 1]);
    // peaks searched within the blob size (4 mm): errors 0 and 2 mm
    expect([row.peakSearchRadiusMm, row.peakErrorMeanMm, row.peakErrorMaxMm]).toEqual([4, 1, 2]);
    expect([row.peakStatisticMean, row.centreStatisticMean]).toEqual([3.5, 3]); // (6 + 1)/2 and (6 + 0)/2
    expect([row.threshold, row.thresholdMethod, row.shape, row.sizeMm, row.amplitudePct, row.plantSeed]).toEqual([3.5, 'hand', 'gaussian', 4, 2, 3]);
    expect(row.effectBiasPct).toBeNaN();
    // every field is a number or a string (a flat table row)
    for (const value of Object.values(row)) expect(['number', 'string']).toContain(typeof value);
  });

  it('ROC area is 1 when the statistic ranks every truth voxel above every other brain voxel', () => {
    const truth = handTruth();
    const stat = Float32Array.from(truth.mask, (m, v) => (m ? 10 + v : v / 100));
    const row = scoreDetection({ statistic: stat, survivors: truth.mask, truth, brainMask: new Uint8Array(100).fill(1) });
    expect(row.rocAuc).toBe(1);
    expect(row.dice).toBe(1);
    expect(row.hitRate).toBe(1);
    expect(row.falseAlarmRate).toBe(0);
    expect(row.falseClusters).toBe(0);
  });

  it('uses a ROC curve the caller computed instead of computing it again (same row when it is the same curve)', () => {
    const truth = handTruth();
    const brain = new Uint8Array(100).fill(1);
    const stat = Float32Array.from(truth.mask, (m, v) => ((v * 37) % 11) + (m ? 3 : 0));
    const own = scoreDetection({ statistic: stat, survivors: truth.mask, truth, brainMask: brain });
    const given = scoreDetection({ statistic: stat, survivors: truth.mask, truth, brainMask: brain, rocCurve: rocCurve(stat, truth.mask, brain) });
    expect(given).toEqual(own);
    expect(own.rocAuc).toBeGreaterThan(0.5);
    expect(own.rocAuc).toBeLessThan(1);
    // a different curve changes only the area: the row takes what it is given
    const flat = { thresholds: Float64Array.of(Infinity, -Infinity), tpr: Float64Array.of(0, 1), fpr: Float64Array.of(0, 1), positives: 7, negatives: 93 };
    expect(scoreDetection({ statistic: stat, survivors: truth.mask, truth, brainMask: brain, rocCurve: flat }).rocAuc).toBe(0.5);
  });

  it('scores a null planting (nothing planted): every survivor is a false alarm, per-blob measures undefined', () => {
    const truth = { ...handTruth(), mask: new Uint8Array(100), profile: new Float32Array(100), centresMm: [], centresVoxel: [], blobs: [] };
    const survivors = new Uint8Array(100);
    survivors[at(4, 4)] = survivors[at(4, 5)] = survivors[at(8, 1)] = 1;
    const row = scoreDetection({ statistic: Float32Array.from(survivors), survivors, truth, brainMask: new Uint8Array(100).fill(1) });
    expect([row.falsePositiveVoxels, row.falseAlarmRate, row.clusters, row.falseClusters, row.dice]).toEqual([3, 3 / 100, 2, 2, 0]);
    for (const k of ['hitRate', 'blobHitRate', 'rocAuc', 'peakErrorMeanMm', 'peakErrorMaxMm', 'centreStatisticMean'] as const) expect(row[k], k).toBeNaN();
  });

  it('refuses maps on another grid', () => {
    const truth = handTruth();
    const codeOf = (f: () => unknown) => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; } return 'none'; };
    const brain = new Uint8Array(100).fill(1);
    expect(codeOf(() => scoreDetection({ statistic: new Float32Array(99), survivors: truth.mask, truth, brainMask: brain }))).toBe('GRID_MISMATCH');
    const shifted = makeVolume({ dims: [10, 10, 1, 1], spacingMm: [2, 2, 2], trSec: 0, affine: diagonalAffine([2, 2, 2], [1, 0, 0]), data: new Float32Array(100) });
    expect(codeOf(() => scoreDetection({ statistic: shifted, survivors: truth.mask, truth, brainMask: brain }))).toBe('GRID_MISMATCH');
  });
});
