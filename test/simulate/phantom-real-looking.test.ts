import { describe, expect, it } from 'vitest';
import { defaultLowBaselineVoxels, defaultPhantomEyes, resolvePhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';

// The optional parts of a real-looking run: eyes with optic nerves, and edge voxels of near-zero
// baseline. Each has its own seeded stream, so the rest of the run keeps its values to the bit.
describe('phantom: eyes and near-zero-baseline edge voxels', () => {
  // no head motion here: its resampling spreads any change of the image to neighbouring voxels
  const base = { nVolumes: 24, seed: 11, physio: null, smoothNoise: null, motion: null };
  const plain = simulatePhantomRun(base);
  const real = simulatePhantomRun({ ...base, eyes: defaultPhantomEyes(), lowBaselineVoxels: { ...defaultLowBaselineVoxels(), excursionsPerVoxel: 4 } });
  const n = 44 * 52 * 34;

  it('puts bright globes in front of the brain and leaves voxels far from them unchanged', () => {
    const eye = real.truth.eyeFraction!.data;
    let brighter = 0, inEye = 0, changedFar = 0;
    const low = new Set(real.truth.lowBaselineVoxels!.map(({ voxel: [i, j, k] }) => i + 44 * (j + 52 * k)));
    for (let v = 0; v < n; v++) {
      if (eye[v] > 0.9) { inEye++; if (real.volume.data[10 * n + v] > plain.volume.data[10 * n + v] + 200) brighter++; }
      // far from the eyes (fraction 0 in the voxel and its neighbours) and not a low-baseline voxel: same bits
      if (eye[v] === 0 && eye[v + 1] === 0 && eye[v - 1] === 0 && eye[v + 44] === 0 && eye[v - 44] === 0 && eye[v + 44 * 52] === 0 && eye[v - 44 * 52] === 0 && !low.has(v)) {
        if (real.volume.data[10 * n + v] !== plain.volume.data[10 * n + v]) changedFar++;
      }
    }
    expect(inEye).toBeGreaterThan(50);
    expect(brighter / inEye).toBeGreaterThan(0.9);
    expect(changedFar).toBe(0);
  });

  it('gives each low-baseline voxel its baseline and about zero at its listed volumes', () => {
    for (const { voxel: [i, j, k], volumes } of real.truth.lowBaselineVoxels!) {
      const v = i + 44 * (j + 52 * k);
      expect(real.truth.tissueLabels.data[v]).toBe(3); // a grey-matter voxel on the brain's surface
      expect(volumes.length).toBe(4);
      for (let t = 0; t < 24; t++) {
        const x = real.volume.data[t * n + v];
        if (volumes.includes(t)) expect(x).toBeLessThan(6); // |noise| of SD 1.5: below 4 SD
        else expect(Math.abs(x - 25)).toBeLessThan(6);
      }
    }
  });

  it('checks the new fields', () => {
    expect(() => resolvePhantomSpec({ eyes: { ...defaultPhantomEyes(), radiusMm: 0 } })).toThrow(/eyes/);
    expect(() => resolvePhantomSpec({ lowBaselineVoxels: { ...defaultLowBaselineVoxels(), count: -1 } })).toThrow(/lowBaselineVoxels/);
  });
});
