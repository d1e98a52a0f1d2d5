/**
 * Planting and scoring on generated data (a 64 x 64 x 36 run of 150 volumes, 3 mm voxels).
 * plant: plantActivations (6 Gaussian blobs, FWHM 6 mm) vs copying the run once (the floor: planting
 * must return a new run). plant-posed: the same planting following a motion table in which the head
 * moves at every volume (slow wander plus a jerk), vs planting in fixed voxels (goal: at most 2x);
 * plant-posed-b0-timed: also a field map (displacement along phase encode) and interleaved slice times. score: scoreDetection (exact ROC over ~50k brain voxels, clusters, peaks)
 * vs sorting the brain's statistics once (what the exact ROC needs at least).
 * Prints `bench NAME VALUE UNIT` and `ratio NAME VALUE` lines; medians of 5 repeats.
 */
import { acquisitionModel } from '../src/acquire/acquisition-model.js';
import { interleavedSliceTiming } from '../src/acquire/interleaved-slice-timing.js';
import { diagonalAffine } from '../src/core/affine.js';
import { childSeed, createRng } from '../src/core/random.js';
import { simulatedMotionTable } from '../src/simulate/simulated-motion-table.js';
import { makeVolume } from '../src/core/volume.js';
import { plantActivations } from '../src/plant/plant-activations.js';
import { scoreDetection } from '../src/score/score-detection.js';
import { median, timeMedianSec } from './bench-kit.js';

/** Median milliseconds of 5 calls of `f`, no warm-up call. */
const medianMs = async (f: () => unknown) => 1e3 * (await timeMedianSec(f, { repeats: 5, warmUp: 0 }));

/**
 * Run the planting and scoring benchmarks and print their lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const [nx, ny, nz, nt] = [64, 64, 36, 150];
  const n = nx * ny * nz;
  const rng = createRng(1);
  const data = new Float32Array(n * nt);
  rng.fillNormal(data, 500, 10);
  const run = makeVolume({ dims: [nx, ny, nz, nt], spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data });
  const brain = new Uint8Array(n);
  for (let k = 4; k < nz - 4; k++) for (let j = 8; j < ny - 8; j++) for (let i = 8; i < nx - 8; i++) brain[i + nx * (j + ny * k)] = 1;
  const timeCourse = Array.from({ length: nt }, (_, t) => (t % 20 < 10 ? 1 : 0));
  const options = { count: 6, fwhmMm: 6, amplitudePct: 1, timeCourse, placementMask: brain, seed: 3 };

  const plantMs = await medianMs(() => plantActivations(run, options));
  const copyMs = await medianMs(() => new Float32Array(run.data));
  console.log(`bench plant-6-blobs-64x64x36x150 ${plantMs.toFixed(1)} ms`);
  console.log(`ratio plant-vs-copy-run ${(plantMs / copyMs).toFixed(2)}`);

  // the head moves at every volume: a 0.05 mm / 0.05 deg random walk and a 1.5 mm, 1 deg jerk
  const motionTable = simulatedMotionTable(nt, { wanderStepMm: 0.05, wanderStepDeg: 0.05, jerk: { volume: 70, shiftMm: [1.5, -1, 0.5], rotationDeg: [1, 0, -0.5] } }, createRng(childSeed(1, 'motion')));
  const posed = acquisitionModel({ volume: run, sidecar: null }, { motionTable });
  // plus a field map (a smooth +-60 Hz pattern), 25 ms readout along j, interleaved slice times
  const fieldMapHz = Float32Array.from({ length: n }, (_, v) => 60 * Math.sin((v % nx) / 9) * Math.cos(Math.floor(v / (nx * ny)) / 7));
  const full = acquisitionModel({ volume: run, sidecar: { PhaseEncodingDirection: 'j', TotalReadoutTime: 0.025 } }, { motionTable, fieldMapHz, sliceTimesSec: interleavedSliceTiming(nz, 2) });
  const sliceTimeCourses = Array.from({ length: nz }, () => timeCourse);
  // the three plantings take turns, so a change in the machine's load falls on all of them alike
  const kinds = [
    () => plantActivations(run, options),
    () => plantActivations(run, { ...options, acquisition: posed }),
    () => plantActivations(run, { ...options, acquisition: full, sliceTimeCourses }),
  ];
  const times: number[][] = kinds.map(() => []);
  for (let r = 0; r < 7; r++) kinds.forEach((f, i) => { const t0 = performance.now(); f(); times[i].push(performance.now() - t0); });
  const [fixedMs, posedMs, fullMs] = times.map(median);
  console.log(`bench plant-posed-6-blobs-64x64x36x150 ${posedMs.toFixed(1)} ms`);
  console.log(`ratio plant-posed-vs-plant ${(posedMs / fixedMs).toFixed(2)}`);
  console.log(`bench plant-posed-b0-timed-6-blobs-64x64x36x150 ${fullMs.toFixed(1)} ms`);
  console.log(`ratio plant-posed-b0-timed-vs-plant ${(fullMs / fixedMs).toFixed(2)}`);

  const { truth } = plantActivations(run, options);
  const stat = new Float32Array(n);
  rng.fillNormal(stat);
  for (let v = 0; v < n; v++) stat[v] += 4 * truth.profile[v];
  const survivors = Uint8Array.from(stat, (s) => (s > 3.1 ? 1 : 0));
  const scoreMs = await medianMs(() => scoreDetection({ statistic: stat, survivors, truth, brainMask: brain }));
  const brainStats = Float64Array.from(stat.filter((_, v) => brain[v] === 1));
  const sortMs = await medianMs(() => new Float64Array(brainStats).sort());
  console.log(`bench score-64x64x36 ${scoreMs.toFixed(1)} ms`);
  console.log(`ratio score-vs-sort-brain ${(scoreMs / sortMs).toFixed(2)}`);
}
