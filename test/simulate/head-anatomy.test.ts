import { describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { DEFAULT_HEAD_GEOMETRY, headAnatomy, headClassifier } from '../../src/simulate/head-anatomy.js';
import { PHANTOM_TISSUES, TISSUE_LABEL } from '../../src/simulate/tissue-properties.js';

describe('phantom head anatomy', () => {
  const dims: [number, number, number] = [22, 26, 21];
  const affine = diagonalAffine([7, 7, 7], [-73.5, -87.5, -70]);
  const anat = headAnatomy(dims, affine, DEFAULT_HEAD_GEOMETRY, 3);
  const g = DEFAULT_HEAD_GEOMETRY;

  it('fractions are multiples of 1/27, sum to at most 1, and the label is the largest one', () => {
    const n = dims[0] * dims[1] * dims[2];
    for (let v = 0; v < n; v++) {
      let sum = 0, best = 0, bestLabel = 0;
      PHANTOM_TISSUES.forEach((t, idx) => {
        const f = anat.fractions[t][v];
        // 27 points per voxel, stored as float32
        expect(Math.abs(f * 27 - Math.round(f * 27))).toBeLessThan(1e-4);
        sum += f;
        if (f > best) { best = f; bestLabel = idx + 1; }
      });
      expect(sum).toBeLessThanOrEqual(1 + 1e-5);
      if (best > 1 - sum) expect(anat.labels[v]).toBe(bestLabel);
    }
  });

  it('holds every tissue class', () => {
    const present = new Set(anat.labels);
    for (const label of Object.values(TISSUE_LABEL)) expect(present.has(label), `label ${label}`).toBe(true);
  });

  it('the cortex is folded: grey matter reaches the sulcal depth below the envelope, not one shell', () => {
    const at = headClassifier(g);
    const b = g.brain;
    // walk inwards along rays from the brain centre and note the deepest grey matter met before white matter
    const depths: number[] = [];
    for (let a = 0; a < 60; a++) {
      const theta = 0.3 + (1.2 * (a % 10)) / 10, phi = (2 * Math.PI * Math.floor(a / 10)) / 6;
      const dir = [Math.sin(theta) * Math.cos(phi), Math.sin(theta) * Math.sin(phi), Math.cos(theta)];
      const len = 1 / Math.hypot(dir[0] / b.semiAxesMm[0], dir[1] / b.semiAxesMm[1], dir[2] / b.semiAxesMm[2]);
      let deepest = 0;
      for (let d = 0; d < 25; d += 0.25) {
        const r = len - d;
        const l = at(b.centreMm[0] + r * dir[0], b.centreMm[1] + r * dir[1], b.centreMm[2] + r * dir[2]);
        if (l === TISSUE_LABEL['white-matter']) break;
        if (l === TISSUE_LABEL['grey-matter']) deepest = d;
      }
      depths.push(deepest);
    }
    const min = Math.min(...depths), max = Math.max(...depths);
    // a plain shell would give the cortex thickness (3 mm) on every ray; sulci 12 mm deep give more on some
    expect(min).toBeLessThanOrEqual(g.cortexThicknessMm + 0.5);
    expect(max).toBeGreaterThan(g.cortexThicknessMm + 6);
  });

  it('the sinus is air inside the head, below the front of the brain', () => {
    const at = headClassifier(g);
    const c = g.sinus.centreMm;
    expect(at(c[0], c[1], c[2])).toBe(TISSUE_LABEL['sinus-air']);
    expect(at(c[0], c[1], c[2] + g.sinus.radiusMm + 8)).not.toBe(TISSUE_LABEL.air);
    expect(c[1]).toBeGreaterThan(g.brain.centreMm[1]);
    expect(c[2]).toBeLessThan(g.brain.centreMm[2]);
  });
});
