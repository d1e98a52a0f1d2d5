import { describe, expect, it } from 'vitest';
import { applyAffine, composeAffine, invertAffine, type Vec3 } from '../../src/core/affine.js';
import { createRng } from '../../src/core/random.js';
import { DEFAULT_HEAD_GEOMETRY } from '../../src/simulate/head-anatomy.js';
import { phantomAnatomyGrids } from '../../src/simulate/phantom-anatomy-grids.js';
import { defaultPhantomStructural, defaultPhantomTemplate, demoPhantomSpec, resolvePhantomSpec } from '../../src/simulate/phantom-spec.js';
import { phantomT1wSignal } from '../../src/simulate/phantom-t1w-signal.js';
import { simulatePhantomStructural } from '../../src/simulate/simulate-phantom-structural.js';
import { simulatePhantomTemplate } from '../../src/simulate/simulate-phantom-template.js';
import { simulatedMotionTable } from '../../src/simulate/simulated-motion-table.js';
import { quietSpec } from './phantom-helpers.js';

/** Value of a 3D volume at the voxel nearest a world point. */
function valueAtWorld(v: { data: Float32Array; dims: number[]; affine: Float64Array }, p: Vec3): number {
  const [i, j, k] = applyAffine(invertAffine(v.affine), p).map(Math.round);
  return v.data[i + v.dims[0] * (j + v.dims[1] * k)];
}

// a small structural (3 mm) and template (4 mm) so the test runs in a second or two
const small = () => quietSpec({
  structural: { ...defaultPhantomStructural(), dims: [50, 60, 46], spacingMm: [3, 3, 3], thermalNoiseSd: 0, biasPercent: 0, supersample: 1 },
  template: { ...defaultPhantomTemplate(), dims: [40, 50, 38], spacingMm: 4, originVoxel: [20, 27, 18], smoothingFwhmMm: 0, supersample: 1 },
});

describe('phantom structural image and template', () => {
  it('T1-weighted contrast: white matter > grey matter > CSF, as the spoiled-GRE steady state gives', () => {
    const s = phantomT1wSignal(resolvePhantomSpec().tissues, { trSec: 0.02, teSec: 0.004, flipAngleDeg: 25 }, 1000);
    // the spoiled-GRE steady state written out by hand (Ernst & Anderson 1966, Rev Sci Instrum 37:93):
    // S = PD sin a (1 - E1) / (1 - E1 cos a) exp(-TE/T2*), grey matter PD 0.8, T1 1.331 s, T2* 50 ms; white matter 0.7, 0.832 s, 45 ms
    const flash = (pd: number, t1: number, t2s: number) => { const a = (25 * Math.PI) / 180, e1 = Math.exp(-0.02 / t1); return (pd * Math.sin(a) * (1 - e1) * Math.exp(-0.004 / t2s)) / (1 - e1 * Math.cos(a)); };
    // float64 arithmetic on both sides: only rounding separates them
    expect(s['grey-matter'] / 1000).toBeCloseTo(flash(0.8, 1.331, 0.05) / flash(0.7, 0.832, 0.045), 12);
    expect(s['white-matter']).toBe(1000);
    expect(s['grey-matter']).toBeLessThan(s['white-matter']);
    expect(s.csf).toBeLessThan(0.5 * s['grey-matter']);
    expect(s['sinus-air']).toBe(0);
  });

  it('the structural image shows the head in its stated pose: the ventricles (CSF) land where structuralFromReference puts them', () => {
    const spec = resolvePhantomSpec(small());
    const t1w = simulatePhantomStructural(spec);
    const g = phantomAnatomyGrids(spec);
    expect(t1w.dims).toEqual([50, 60, 46, 1]);
    expect(Array.from(t1w.affine)).toEqual(Array.from(g.structural!.affine));
    const signal = phantomT1wSignal(spec.tissues, spec.structural!.sequence, 1000);
    for (const v of DEFAULT_HEAD_GEOMETRY.ventricles) {
      const inStructural = applyAffine(g.structuralFromReference!, v.centreMm);
      // at a ventricle's centre the 3 mm voxel is all CSF (the ventricle is 10 mm across)
      expect(valueAtWorld(t1w, inStructural)).toBeCloseTo(signal.csf, 3);
    }
    // a white-matter point (between the ventricles and the cortex) is white matter there too
    const wm: Vec3 = [-25, -20, 20];
    expect(valueAtWorld(t1w, applyAffine(g.structuralFromReference!, wm))).toBeCloseTo(1000, 3);
  });

  it('the template shows the head where templateFromReference puts it, and templateFromStructural is that map after the inverse pose', () => {
    const spec = resolvePhantomSpec(small());
    const tpl = simulatePhantomTemplate(spec);
    const g = phantomAnatomyGrids(spec);
    const signal = phantomT1wSignal(spec.tissues, spec.structural!.sequence, 1000);
    for (const v of DEFAULT_HEAD_GEOMETRY.ventricles) expect(valueAtWorld(tpl, applyAffine(g.templateFromReference!, v.centreMm))).toBeCloseTo(signal.csf, 3);
    const p: Vec3 = [12, -30, 7];
    const direct = applyAffine(g.templateFromReference!, p);
    const viaStructural = applyAffine(g.templateFromStructural!, applyAffine(g.structuralFromReference!, p));
    // float64 products of a few terms
    direct.forEach((x, a) => expect(viaStructural[a]).toBeCloseTo(x, 9));
    expect(Array.from(composeAffine(g.templateFromStructural!, g.structuralFromReference!)).map((x) => Number(x.toFixed(9)) + 0)).toEqual(Array.from(g.templateFromReference!).map((x) => Number(x.toFixed(9)) + 0));
  });

  it('the demo spec has a structural image at 1.5 mm and a 2 mm template; the same seed gives the same structural noise', () => {
    const d = demoPhantomSpec();
    expect(d.structural?.spacingMm).toEqual([1.5, 1.5, 1.5]);
    expect(d.template?.spacingMm).toBe(2);
    const noisy = small();
    noisy.structural = { ...noisy.structural!, thermalNoiseSd: 20 };
    const a = simulatePhantomStructural(noisy), b = simulatePhantomStructural(noisy);
    expect(Buffer.from(a.data.buffer).equals(Buffer.from(b.data.buffer))).toBe(true);
  });

  it('a spec without a structural part or template is refused by the simulators with a typed error', () => {
    expect(() => simulatePhantomStructural(quietSpec())).toThrow(/no structural part/);
    expect(() => simulatePhantomTemplate(quietSpec())).toThrow(/no template part/);
    expect(() => resolvePhantomSpec(quietSpec({ template: { ...defaultPhantomTemplate(), fromReferenceRows: [[1, 0, 0, 0], [0, 1, 0, 0], [0, 0, -1, 0]] } }))).toThrow(/determinant/);
  });
});

describe('realistic head motion', () => {
  const base = { wanderStepMm: 0, wanderStepDeg: 0, jerk: null };
  it('drift is linear from 0 at the first volume to its stated change at the last', () => {
    const rows = simulatedMotionTable(11, { ...base, drift: { shiftMm: [0, 0, -1], rotationDeg: [0.5, 0, 0] } }, createRng(1));
    expect(rows[0].shiftZMm).toBe(0);
    expect(rows[5].shiftZMm).toBeCloseTo(-0.5, 6);
    expect(rows[10].shiftZMm).toBeCloseTo(-1, 6);
    expect(rows[10].rotXDeg).toBeCloseTo(0.5, 6);
  });
  it('several jerks add, each for its own volumes; respiration coupling follows the trace relative to volume 0', () => {
    const trace = [0.5, 1, -1, 0.5, 0.5, 0.5];
    const rows = simulatedMotionTable(6, { ...base, jerk: { volume: 1, durationVolumes: 2, shiftMm: [1, 0, 0], rotationDeg: [0, 0, 0] }, moreJerks: [{ volume: 2, durationVolumes: null, shiftMm: [0.5, 0, 0], rotationDeg: [0, 0, 0] }], respiration: { shiftMm: [0, 0, 0.1], rotationDeg: [0, 0, 0] } }, createRng(1), trace);
    expect(rows.map((r) => r.shiftXMm)).toEqual([0, 1, 1.5, 0.5, 0.5, 0.5]);
    expect(rows.map((r) => r.shiftZMm)).toEqual([0, 0.05, -0.15, 0, 0, 0]);
  });
  it('the demo run: framewise displacement (Power et al. 2012, 50 mm radius) above 0.5 mm only at the jerks; median below 0.25 mm', () => {
    const spec = demoPhantomSpec();
    const trace = Array.from({ length: spec.nVolumes }, (_, n) => Math.sin(0.6 * Math.PI * n));
    const m = simulatedMotionTable(spec.nVolumes, spec.motion!, createRng(3), trace).map((r) => [r.shiftXMm, r.shiftYMm, r.shiftZMm, r.rotXDeg, r.rotYDeg, r.rotZDeg]);
    // FD = sum of |differences| of the six parameters, rotations as arc length on a 50 mm sphere (Power et al. 2012, NeuroImage 59:2142)
    const fd = m.slice(1).map((row, i) => row.reduce((s, v, a) => s + Math.abs(v - m[i][a]) * (a < 3 ? 1 : (Math.PI / 180) * 50), 0));
    const jerkVolumes = new Set([40, 83, 85, 121, 122]);
    fd.forEach((f, i) => { if (!jerkVolumes.has(i + 1)) expect(f, `volume ${i + 1}`).toBeLessThan(0.5); });
    for (const v of [40, 83, 121]) expect(fd[v - 1]).toBeGreaterThan(0.5);
    expect([...fd].sort((a, b) => a - b)[74]).toBeLessThan(0.25);
  });
});
