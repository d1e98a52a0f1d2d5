import { z } from 'zod';
import { beforeAll, describe, expect, it } from 'vitest';
import { affineFromRows, composeAffine, invertAffine, type Affine } from '../../src/core/affine.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import type { BoldEvent } from '../../src/io/run-types.js';
import { contrastMaps } from '../../src/model/contrast.js';
import { buildDesign } from '../../src/model/design.js';
import { fitGlm } from '../../src/model/glm-ols.js';
import { plantActivations, type PlantTruth } from '../../src/plant/plant-activations.js';
import { plantTimeCourse } from '../../src/plant/plant-time-course.js';
import { trilinearResample } from '../../src/resample/trilinear-resample.js';
import { scoreDetection, type ScoreRow } from '../../src/score/score-detection.js';
import { truthInFrame } from '../../src/score/truth-in-frame.js';
import { registerStep } from '../../src/steps/registry.js';
import { runRecipeStep } from '../../src/sweep/recipe-step.js';
import { gaussianNullRun } from './sweep-test-runs.js';

// The head's pose in each volume is a known rigid transform of world space (reference head -> head
// at that volume). The raw run sees the planted activation where the moved head put it; a geometric
// step that applies the inverse pose brings every volume back to the reference frame, where the
// truth lives, so scoring there must find the blobs where they were planted. (The sweep's own
// frame-aware planting, which pushes blobs through each volume's pose, comes with src/acquire; this
// test moves an already planted run instead.)

/** Rigid transform: rotation by `deg` about the z axis through `centre`, then translation `t` (mm). */
function pose(deg: number, t: [number, number, number], centre: [number, number, number]): Affine {
  const c = Math.cos((deg * Math.PI) / 180), s = Math.sin((deg * Math.PI) / 180);
  const [x, y] = centre;
  return affineFromRows([
    [c, -s, 0, x - c * x + s * y + t[0]],
    [s, c, 0, y - s * x - c * y + t[1]],
    [0, 0, 1, t[2]],
  ]);
}

/** Each volume resampled through a world transform: out(w) = in(worldMap(w)) (trilinear, edge repeated). */
function moveVolumes(v: Volume, worldMaps: Affine[]): Volume {
  const [nx, ny, nz, nt] = v.dims;
  const n = nx * ny * nz;
  const data = new Float32Array(v.data.length);
  for (let t = 0; t < nt; t++) {
    const srcFromOut = composeAffine(invertAffine(v.affine), composeAffine(worldMaps[t], v.affine));
    trilinearResample(v.data.subarray(t * n, (t + 1) * n), [nx, ny, nz], srcFromOut, [nx, ny, nz], data.subarray(t * n, (t + 1) * n), { mode: 'nearest' });
  }
  return makeVolume({ ...v, data });
}

// the user's geometric step: the known inverse pose of every volume (a motion correction whose
// estimate is exact), output in the reference frame on the run's grid
interface UndoPoseParams { poses: number[][] }
registerStep<UndoPoseParams>('undo-known-pose', {
  schema: z.object({ poses: z.array(z.array(z.number()).length(16)) }).strict(),
  version: 1,
  kind: 'geometric',
  labels: {},
  outputFrame: () => ({ kind: 'reference' }),
  describe: () => 'undo known pose',
  apply: (volume, params) => ({
    // raw(w) = reference(P^-1 w), so reference(w) = raw(P w)
    volume: moveVolumes(volume, params.poses.map((p) => Float64Array.from(p))),
    note: { step: 'undo-known-pose', params, summary: 'known inverse pose applied', diagnostics: {}, methodsText: 'Each volume was moved back by its known pose.', citations: [] },
  }),
}, { replace: true });

const nt = 80;
const events: BoldEvent[] = [0, 1, 2, 3].map((b) => ({ onsetSec: 20 + 40 * b, durationSec: 20, trialType: 'task', modulation: 1 }));
let run: ReturnType<typeof gaussianNullRun>;
let truth: PlantTruth;
let raw: Volume;
let poses: Affine[];

/** OLS fit, t map, survivors at t >= 4.5 in the mask, scored against a truth. */
function detect(v: Volume, t: PlantTruth): ScoreRow {
  const design = buildDesign(events, { nt, trSec: v.trSec, drift: { kind: 'none' } });
  const maps = contrastMaps(fitGlm(v, design, { mask: run.mask }), { task: 1 }, { name: 'task' });
  const survivors = Uint8Array.from(maps.t.data, (x, i) => (run.mask[i] && x >= 4.5 ? 1 : 0));
  return scoreDetection({ statistic: maps.t, survivors, truth: t, brainMask: run.mask, threshold: 4.5, thresholdMethod: 'fixed t' });
}

beforeAll(() => {
  run = gaussianNullRun({ dims: [32, 32, 24], nt, fwhmMm: 6, seed: 5 });
  const planted = plantActivations(run.volume, { count: 3, fwhmMm: 10, amplitudePct: 4, timeCourse: plantTimeCourse(events, nt, run.volume.trSec, { condition: 'task' }), placementMask: run.mask, seed: 8, separation: 2, marginMm: 12 });
  truth = planted.truth;
  // a head that drifts to 6 mm and 4 degrees away from the reference pose over the run
  const centre: [number, number, number] = [16 * 3, 16 * 3, 12 * 3];
  poses = Array.from({ length: nt }, (_, t) => pose(4 * (t / (nt - 1)), [6 * (t / (nt - 1)), -4 * (t / (nt - 1)), 3 * (t / (nt - 1))], centre));
  raw = moveVolumes(planted.volume, poses.map((p) => invertAffine(p)));
});

describe('planting under known non-identity poses, scored in the reference frame', () => {
  it('after the inverse pose, scoring in the reference frame finds the blobs where they were planted', async () => {
    const r = await runRecipeStep({ step: 'undo-known-pose', params: { poses: poses.map((p) => Array.from(p)) } }, raw, { sidecar: null, events, mask: run.mask, frame: { kind: 'raw' } });
    expect(r.frame).toEqual({ kind: 'reference' });
    expect(r.context.frame).toEqual({ kind: 'reference' });
    const inReference = detect(r.volume, truthInFrame(truth, r.frame));
    expect(inReference.blobHitRate).toBe(1);
    // the peak sits on, or next to, the planted centre (3 mm voxels; two trilinear passes blur a little)
    expect(inReference.peakErrorMaxMm).toBeLessThanOrEqual(3 * Math.SQRT2 + 1e-9);
    // without undoing the pose the blobs are smeared over the path the head took: worse localisation
    // and a lower peak statistic
    const inRaw = detect(raw, truth);
    expect(inRaw.peakStatisticMean).toBeLessThan(inReference.peakStatisticMean);
    expect(inRaw.hitRate).toBeLessThan(inReference.hitRate);
  });
});
