/**
 * Smoothness estimation and thresholds on a run-sized problem.
 *  - estimateSmoothness on seeded smooth residuals 64 x 64 x 36 x 200 (float32, FWHM 2.5 voxels, ellipsoid
 *    mask) against the same computation in numpy (bench/reference/smoothness_numpy.py, Debian's
 *    /usr/bin/python3 with numpy 1.24). Ours: one warm-up, median of 5; numpy: median of 3.
 *  - thresholdFdr, thresholdRft and thresholdClusterExtent on one 64 x 64 x 36 z map in the same mask
 *    (median of 5 each after a warm-up), reported alone (no outside reference does the same work).
 * Prints
 *   bench smoothness-seconds <s> s, bench numpy-smoothness-seconds <s> s, ratio smoothness-vs-numpy <ours/numpy>,
 *   bench smoothness-max-rel-lambda-diff-vs-numpy <d> value, bench fdr-seconds / rft-seconds / cluster-seconds <s> s
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { createRng } from '../src/core/random.js';
import { estimateSmoothness } from '../src/model/smoothness.js';
import { thresholdClusterExtent } from '../src/model/threshold-cluster.js';
import { thresholdFdr } from '../src/model/threshold-fdr.js';
import { thresholdRft } from '../src/model/threshold-rft.js';
import { smoothVolume3d } from '../src/filter/gaussian-smooth.js';
import { packageRoot, timeMedianSec } from './bench-kit.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];
const SPACING: [number, number, number] = [3, 3, 3];
const FWHM_MM = 7.5;

/** Median seconds of 5 calls of `f` after one warm-up call. */
const timeIt = (f: () => unknown) => timeMedianSec(f, { repeats: 5, warmUp: 1 });

/** Ellipsoid mask filling most of the grid, like a brain in a 64 x 64 x 36 EPI raster. */
function ellipsoidMask(): Uint8Array {
  const [nx, ny, nz] = DIMS;
  const mask = new Uint8Array(nx * ny * nz);
  for (let z = 0; z < nz; z++) for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) {
    if (((x - 31.5) / 27) ** 2 + ((y - 31.5) / 29) ** 2 + ((z - 17.5) / 15) ** 2 <= 1) mask[x + nx * (y + ny * z)] = 1;
  }
  return mask;
}

/**
 * Run the smoothness and threshold benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const [nx, ny, nz, nt] = DIMS;
  const n = nx * ny * nz;
  const mask = ellipsoidMask();
  const rng = createRng(11);
  const residuals = new Float32Array(n * nt);
  const noise = new Float32Array(n);
  for (let t = 0; t < nt; t++) {
    rng.fillNormal(noise);
    smoothVolume3d(noise, [nx, ny, nz], SPACING, FWHM_MM, { out: residuals.subarray(t * n, (t + 1) * n) });
  }
  const dof = nt - 6;
  let lambda: number[] = [];
  const smoothSec = await timeIt(() => { lambda = estimateSmoothness(residuals, DIMS, mask, SPACING, { dof }).derivativeVariance; });

  const z = new Float32Array(n);
  rng.fillNormal(noise);
  smoothVolume3d(noise, [nx, ny, nz], SPACING, FWHM_MM, { out: z });
  let ss = 0;
  for (let i = 0; i < n; i++) ss += z[i] * z[i];
  const scale = Math.sqrt(n / ss);
  for (let i = 0; i < n; i++) z[i] *= scale;
  const stat = { kind: 'z' } as const;
  const fdrSec = await timeIt(() => thresholdFdr(z, mask, { q: 0.05, stat }));
  const rftSec = await timeIt(() => thresholdRft(z, mask, [nx, ny, nz], { alpha: 0.05, stat, fwhmMm: FWHM_MM, spacingMm: SPACING }));
  const clusterSec = await timeIt(() => thresholdClusterExtent(z, mask, [nx, ny, nz], { alpha: 0.05, stat, fwhmMm: FWHM_MM, spacingMm: SPACING, formingP: 0.01 }));

  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-bench-smoothness-'));
  try {
    const rIn = join(dir, 'residuals.f32'), mIn = join(dir, 'mask.u8');
    writeFileSync(rIn, new Uint8Array(residuals.buffer, residuals.byteOffset, residuals.byteLength));
    writeFileSync(mIn, mask);
    const script = join(packageRoot(), 'bench', 'reference', 'smoothness_numpy.py');
    const stdout = execFileSync('/usr/bin/python3', [script, rIn, mIn, ...DIMS.map(String), String(dof)], { encoding: 'utf8', maxBuffer: 1 << 20 });
    const sec = /seconds ([0-9.eE+-]+)/.exec(stdout);
    const lam = /lambda ([^\n]+)/.exec(stdout);
    if (!sec || !lam) throw new Error(`smoothness_numpy.py printed no result: ${stdout}`);
    const numpySec = Number(sec[1]);
    const numpyLambda = lam[1].trim().split(/\s+/).map(Number);
    const maxRel = Math.max(...lambda.map((l, a) => Math.abs(l / numpyLambda[a] - 1)));
    console.log(`bench smoothness-seconds ${smoothSec.toFixed(4)} s`);
    console.log(`bench numpy-smoothness-seconds ${numpySec.toFixed(4)} s`);
    console.log(`ratio smoothness-vs-numpy ${(smoothSec / numpySec).toFixed(3)}`);
    console.log(`bench smoothness-max-rel-lambda-diff-vs-numpy ${maxRel.toExponential(2)} value`);
    console.log(`bench fdr-seconds ${fdrSec.toFixed(4)} s`);
    console.log(`bench rft-seconds ${rftSec.toFixed(4)} s`);
    console.log(`bench cluster-seconds ${clusterSec.toFixed(4)} s`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
