/**
 * Whole look (no figures) on a seeded 64 x 64 x 36 x 200 float32 run against the floor: one plain
 * pass summing every value of the run (what any whole-run measure must at least read). Both run in
 * this process on the same data; one warm-up each, then the median of 5.
 * Prints
 *   bench look-seconds <s> s, bench one-pass-seconds <s> s, ratio look-vs-one-pass <look / pass>
 * Goal: ratio < 3 (the look reads the run twice, the mask voxels once more, and does its per-voxel
 * arithmetic in cache).
 */
import { pathToFileURL } from 'node:url';
import { diagonalAffine } from '../src/core/affine.js';
import { createRng } from '../src/core/random.js';
import { makeVolume, type Volume } from '../src/core/volume.js';
import { lookAtRun } from '../src/look/look-at-run.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];

/** Baseline ~1000 in an ellipsoid (20 outside), noise sd 15, three bright start volumes, one spike. */
function benchRun(): Volume {
  const [nx, ny, nz, nt] = DIMS;
  const n = nx * ny * nz;
  const base = new Float32Array(n);
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const r2 = ((i - 31.5) / 26) ** 2 + ((j - 31.5) / 30) ** 2 + ((k - 17.5) / 16) ** 2;
    base[i + nx * (j + ny * k)] = r2 <= 1 ? 1000 * (1 - 0.3 * r2) : 20;
  }
  const data = new Float32Array(n * nt);
  createRng(20240605).fillNormal(data, 0, 15);
  const excess = [0.22, 0.011, 0.0006];
  for (let t = 0; t < nt; t++) {
    const g = 1 + (excess[t] ?? 0);
    for (let v = 0; v < n; v++) data[t * n + v] += base[v] * g;
  }
  data[120 * n + 32 + nx * (32 + ny * 18)] += 400;
  return makeVolume({ dims: DIMS, spacingMm: [3, 3, 3.5], trSec: 2, affine: diagonalAffine([3, 3, 3.5], [-94.5, -94.5, -61.25]), data });
}

/** The floor: one pass over every value. */
function onePass(run: Volume): number {
  const d = run.data;
  let s = 0;
  for (let i = 0; i < d.length; i++) s += d[i];
  return s;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
}

function timeIt(fn: () => unknown, repeats: number): number {
  fn(); // warm-up (JIT)
  const times: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    fn();
    times.push((performance.now() - t0) / 1000);
  }
  return median(times);
}

/** Run the look benchmark and print its lines. */
export async function main(): Promise<void> {
  const run = benchRun();
  let sink = 0;
  const pass = timeIt(() => { sink += onePass(run); }, 5);
  const look = timeIt(() => { sink += lookAtRun(run, { flipAngleDeg: 77 }).findings.length; }, 5);
  if (!Number.isFinite(sink)) console.log('');
  console.log(`bench look-seconds ${look.toFixed(4)} s`);
  console.log(`bench one-pass-seconds ${pass.toFixed(4)} s`);
  console.log(`ratio look-vs-one-pass ${(look / pass).toFixed(2)}`);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await main();
