import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { applyAffine, composeAffine, invertAffine, type Affine, type Vec3 } from '../../src/core/affine.js';
import { makeVolume } from '../../src/core/volume.js';
import { writeNifti } from '../../src/io/nifti-write.js';
import { plantActivations } from '../../src/plant/plant-activations.js';
import { truthInFrame } from '../../src/score/truth-in-frame.js';
import { alignEstimate, alignStep } from '../../src/steps/align-step.js';
import { parseStepParams } from '../../src/steps/registry.js';
import type { AlignmentEstimate } from '../../src/align/alignment-estimate.js';
import { phantomAcquisitionModel } from '../../src/simulate/phantom-acquisition-model.js';
import { phantomAnatomyGrids } from '../../src/simulate/phantom-anatomy-grids.js';
import { defaultPhantomStructural, defaultPhantomTemplate, resolvePhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { simulatePhantomStructural } from '../../src/simulate/simulate-phantom-structural.js';
import { simulatePhantomTemplate } from '../../src/simulate/simulate-phantom-template.js';
import type { PhantomRun } from '../../src/simulate/phantom-types.js';
import type { StepContext } from '../../src/steps/step-types.js';
import { quietSpec } from '../simulate/phantom-helpers.js';

// a small phantom (the demo's 3.5 mm run grid, 10 volumes; 2.5 mm structural, 4 mm template) so registration takes seconds
const spec = resolvePhantomSpec(quietSpec({
  dims: [44, 52, 34], spacingMm: [3.5, 3.5, 3.5], nVolumes: 10, thermalNoiseSd: 5, rician: true,
  motion: { wanderStepMm: 0.03, wanderStepDeg: 0.03, jerk: { volume: 7, durationVolumes: null, shiftMm: [0.8, -0.5, 1], rotationDeg: [1.5, 0, -1] } },
  structural: { ...defaultPhantomStructural(), dims: [60, 72, 56], spacingMm: [2.5, 2.5, 2.5], supersample: 1 },
  template: { ...defaultPhantomTemplate(), dims: [40, 50, 38], spacingMm: 4, originVoxel: [20, 27, 18], supersample: 1 },
}));

/** Largest distance between where two affines put points of a sphere of radius r (mm) about c. */
function largestPointErrorMm(a: ArrayLike<number>, b: ArrayLike<number>, rMm: number, c: Vec3 = [0, 0, 0]): number {
  let worst = 0;
  for (const d of [[1, 0, 0], [-1, 0, 0], [0, 1, 0], [0, -1, 0], [0, 0, 1], [0, 0, -1], [0, 0, 0]]) {
    const p: Vec3 = [c[0] + rMm * d[0], c[1] + rMm * d[1], c[2] + rMm * d[2]];
    const pa = applyAffine(Float64Array.from(a), p), pb = applyAffine(Float64Array.from(b), p);
    worst = Math.max(worst, Math.hypot(pa[0] - pb[0], pa[1] - pb[1], pa[2] - pb[2]));
  }
  return worst;
}

/** The alignment the phantom was made with (its truth), as an estimate. */
function trueEstimate(run: PhantomRun, poses: readonly Affine[] | null): AlignmentEstimate {
  const g = phantomAnatomyGrids(run.truth.spec);
  return {
    runGrid: g.run, structuralGrid: g.structural!, templateGrid: g.template!,
    structuralFromReference: Array.from(g.structuralFromReference!), templateFromStructural: Array.from(g.templateFromStructural!),
    volumeFromReference: poses ? poses.map((p) => Array.from(p)) : null, diagnostics: {},
  };
}

describe('align step: run -> structural -> template', () => {
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-align-'));
  let run: PhantomRun;
  let context: StepContext;
  const paths = { structural: join(dir, 'sub-x_T1w.nii.gz'), template: join(dir, 'template.nii.gz') };
  beforeAll(async () => {
    run = simulatePhantomRun(spec);
    // another task name than the demo's, so the demo's own files are not taken as defaults
    context = { sidecar: { ...run.sidecar, TaskName: 'phantomtest' }, events: null, mask: null, frame: { kind: 'raw' } };
    await writeNifti(paths.structural, simulatePhantomStructural(spec));
    await writeNifti(paths.template, simulatePhantomTemplate(spec));
  }, 60_000);
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('estimates run mean -> structural and structural -> template close to the phantom\'s true maps', async () => {
    // the two volumes before the jerk: the head is still (to the wander), so the mean is sharp without motion correction
    const n = 44 * 52 * 34;
    const still = makeVolume({ ...run.volume, dims: [44, 52, 34, 2], data: run.volume.data.slice(0, 2 * n) });
    const params = parseStepParams('align', { ...paths, kernel: 'linear', motion: 'none' }) as Parameters<typeof alignEstimate>[1];
    const e = await alignEstimate(still, params, context);
    const g = phantomAnatomyGrids(spec);
    expect(e.volumeFromReference).toBeNull();
    // run mean (3.5 mm) to structural (2.5 mm) by mutual information: within a quarter of a run voxel on a 50 mm sphere
    expect(largestPointErrorMm(e.structuralFromReference, g.structuralFromReference!, 50)).toBeLessThan(0.9);
    // the affine to a 4 mm template: within half a template voxel over the head (70 mm from its centre)
    expect(largestPointErrorMm(e.templateFromStructural, g.templateFromStructural!, 70)).toBeLessThan(2);
    expect(e.templateGrid.dims).toEqual([40, 50, 38]);
  }, 120_000);

  it('with motion \'estimate\' the poses come from the registration engine and match the phantom\'s (the first volume the reference)', async () => {
    // volumes 4-9: past the approach to steady state (a brighter first volume is a poor reference,
    // which is why a recipe drops those volumes first), across the jerk at volume 7
    const n = 44 * 52 * 34;
    const steady = makeVolume({ ...run.volume, dims: [44, 52, 34, 6], data: run.volume.data.slice(4 * n) });
    const params = parseStepParams('align', { ...paths, kernel: 'linear' }) as Parameters<typeof alignEstimate>[1];
    expect(params.motion).toBe('estimate');
    const e = await alignEstimate(steady, params, context);
    const poses = phantomAcquisitionModel(run).poses!;
    const fromVolume4 = poses.slice(4).map((p) => composeAffine(p, invertAffine(poses[4])));
    // least squares on 3.5 mm voxels without physiological noise: 0.25 mm on a 50 mm sphere is a
    // fourteenth of a voxel (the engine's own tests hold 0.1 mm and 0.1 degree separately)
    e.volumeFromReference!.forEach((p, t) => expect(largestPointErrorMm(p, fromVolume4[t], 50), `volume ${t + 4}`).toBeLessThan(0.25));
    expect(e.diagnostics.motionReference).toBe('volume 0');
  }, 120_000);

  it('carries a planted activation to where truthInFrame puts the truth on the template grid (concatenated and per stage)', async () => {
    const model = phantomAcquisitionModel(run);
    const brain = Float32Array.from(run.truth.tissueLabels.data, (l) => (l === 3 || l === 4 ? 1 : 0));
    const nt = run.volume.dims[3];
    const planted = plantActivations(run.volume, { count: 1, fwhmMm: 14, amplitudePct: 5, timeCourse: new Float64Array(nt).fill(1), sliceTimeCourses: Array.from({ length: run.volume.dims[2] }, () => new Float64Array(nt).fill(1)), placementMask: brain, seed: 4, acquisition: model });
    const e = trueEstimate(run, model.poses);
    for (const concatenate of [true, false]) {
      const params = { concatenate, kernel: 'cubic' as const, motion: 'estimate' as const };
      const base = await alignStep(run.volume, params, context, e);
      const withBlob = await alignStep(planted.volume, params, context, e);
      expect(withBlob.frame?.kind).toBe('target');
      const truth = truthInFrame(planted.truth, withBlob.frame!);
      const n = truth.profile.length;
      expect(withBlob.volume.data.length).toBe(n * nt);
      // the planted change relative to the aligned baseline, averaged over volumes (5 % x blob weight)
      const change = new Float64Array(n);
      for (let t = 0; t < nt; t++) for (let v = 0; v < n; v++) {
        const b = base.volume.data[t * n + v];
        if (b > 100) change[v] += (withBlob.volume.data[t * n + v] - b) / b / 0.05 / nt;
      }
      let peak = 0;
      for (let v = 0; v < n; v++) if (change[v] > change[peak]) peak = v;
      const [nx, ny] = truth.dims;
      const at = [peak % nx, Math.floor(peak / nx) % ny, Math.floor(peak / (nx * ny))];
      const c = truth.centresVoxel[0];
      // the peak voxel is the one nearest the truth's centre, or its neighbour (half a voxel of rounding either side)
      at.forEach((x, a) => expect(Math.abs(x - c[a]), `axis ${a}, concatenate ${concatenate}`).toBeLessThanOrEqual(1));
      // and the planted change matches the truth profile: correlation over the voxels near the blob
      let sxy = 0, sxx = 0, syy = 0, sx = 0, sy = 0, m = 0;
      for (let v = 0; v < n; v++) if (truth.profile[v] > 0.05 || change[v] > 0.05) { sx += change[v]; sy += truth.profile[v]; sxy += change[v] * truth.profile[v]; sxx += change[v] ** 2; syy += truth.profile[v] ** 2; m++; }
      const r = (sxy - (sx * sy) / m) / Math.sqrt((sxx - (sx * sx) / m) * (syy - (sy * sy) / m));
      // interpolation and the partial-volume baseline blur the edge a little; a misplaced blob would fall far below
      expect(r, `concatenate ${concatenate}`).toBeGreaterThan(0.9);
      expect(withBlob.note.diagnostics.resamplings).toBe(concatenate ? 1 : 3);
    }
  }, 120_000);

  it('refuses a run without a structural image or template (ALIGN_INPUT_MISSING) and a structural image without sform or qform (STRUCTURAL_AFFINE_UNUSABLE)', async () => {
    const params = { concatenate: true, kernel: 'linear' as const, motion: 'none' as const };
    await expect(alignEstimate(run.volume, params, context)).rejects.toMatchObject({ code: 'ALIGN_INPUT_MISSING' });
    await expect(alignEstimate(run.volume, { ...params, structural: paths.structural }, context)).rejects.toThrow(/template/);
    // the same image with sform_code and qform_code set to 0: only pixdim is left
    const bare = join(dir, 'bare_T1w.nii');
    const bytes = Buffer.from(gunzipSync(readFileSync(paths.structural)));
    bytes.writeInt16LE(0, 252);
    bytes.writeInt16LE(0, 254);
    writeFileSync(bare, bytes);
    await expect(alignEstimate(run.volume, { ...params, structural: bare, template: paths.template }, context)).rejects.toMatchObject({ code: 'STRUCTURAL_AFFINE_UNUSABLE' });
    const onOtherGrid: StepContext = { ...context, frame: { kind: 'target', grid: { dims: [2, 2, 2], affine: run.volume.affine } } };
    await expect(alignEstimate(run.volume, { ...params, ...paths }, onOtherGrid)).rejects.toThrow(/before any step that resamples/);
  });
});

