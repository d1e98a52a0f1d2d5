/**
 * Voxelwise OLS GLM over a whole run: fitGlm (betas, residual variance, temporal means) against
 * numpy.linalg.lstsq (bench/reference/glm_numpy.py, Debian's /usr/bin/python3 with numpy 1.24) on
 * the same seeded 64 x 64 x 36 x 200 float32 run reshaped (200, voxels) and the same 6-column design
 * (two event conditions, linear and quadratic drift, intercept, plus one nuisance column). Both fit
 * every voxel, no mask. Ours: one warm-up call, then the median of 5; numpy: median of 3.
 * Also times fitGlmAr1 (OLS pass, Worsley-corrected rho, 0.01 bins, refit) on the same run, median
 * of 3, for information (numpy has no counterpart). Prints
 *   bench glm-seconds <s> s, bench glm-ar1-seconds <s> s, bench numpy-lstsq-seconds <s> s,
 *   ratio glm-vs-numpy <ours / numpy>, bench glm-max-rel-beta-diff-vs-numpy <d> value
 * numpy's time depends on its BLAS/LAPACK build (and on OPENBLAS_CORETYPE if that is OpenBLAS);
 * the backend (Debian's libblas alternative, here OpenBLAS) and OPENBLAS_CORETYPE are printed on a
 * `# numpy backend: ...` comment line.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { createRng } from '../src/core/random.js';
import type { Volume } from '../src/core/volume.js';
import type { BoldEvent } from '../src/io/run-types.js';
import { buildDesign } from '../src/model/design.js';
import type { DesignMatrix } from '../src/model/design-matrix.js';
import { fitGlmAr1 } from '../src/model/glm-ar1.js';
import { fitGlm } from '../src/model/glm-ols.js';
import { noisyHeadRun, packageRoot, timeMedianSec } from './bench-kit.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];
const TR_SEC = 2;

/** Two alternating 10 s block conditions, polynomial drift to order 2, one nuisance column, intercept: p = 6. */
function benchDesign(): DesignMatrix {
  const events: BoldEvent[] = [];
  for (let k = 0; k < 10; k++) {
    events.push({ onsetSec: 40 * k + 4, durationSec: 10, trialType: 'a', modulation: 1 });
    events.push({ onsetSec: 40 * k + 24, durationSec: 10, trialType: 'b', modulation: 1 });
  }
  const rng = createRng(7);
  const nuisance = Float64Array.from({ length: DIMS[3] }, () => rng.normal(0, 0.1));
  return buildDesign(events, { nt: DIMS[3], trSec: TR_SEC, drift: { kind: 'polynomial', order: 2 }, nuisance: [{ name: 'shift_x', values: nuisance }] });
}

/** A seeded run: baseline ~1000 in an ellipsoid (20 outside), noise sd 20, a 2 % response to 'a'. */
function benchRun(design: DesignMatrix): Volume {
  // volume t is noise + head * (1 + 0.02 * a(t)), a = the design's first column
  return noisyHeadRun({ dims: DIMS, spacingMm: [3, 3, 3], seed: 20240602, noiseSd: 20, trSec: TR_SEC, headScaleAt: (t) => 1 + 0.02 * design.x[t * design.p] });
}

/**
 * Run the GLM benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const design = benchDesign();
  const run = benchRun(design);
  const n = DIMS[0] * DIMS[1] * DIMS[2];
  let fit = fitGlm(run, design); // warm-up: lets the JIT compile the kernels
  // `fit` keeps the last timed result for the comparison with numpy
  const oursSec = await timeMedianSec(() => { fit = fitGlm(run, design); }, { repeats: 5, warmUp: 0 });
  const ar1Sec = await timeMedianSec(() => fitGlmAr1(run, design), { repeats: 3, warmUp: 0 });

  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-bench-glm-'));
  try {
    const rawIn = join(dir, 'run.f32');
    const rawX = join(dir, 'design.f64');
    const rawBetas = join(dir, 'betas.f64');
    writeFileSync(rawIn, new Uint8Array(run.data.buffer, run.data.byteOffset, run.data.byteLength));
    writeFileSync(rawX, new Uint8Array(design.x.buffer, design.x.byteOffset, design.x.byteLength));
    const script = join(packageRoot(), 'bench', 'reference', 'glm_numpy.py');
    const stdout = execFileSync('/usr/bin/python3', [script, rawIn, String(n), String(DIMS[3]), rawX, String(design.p), rawBetas], { encoding: 'utf8' });
    const m = /seconds ([0-9.eE+-]+)/.exec(stdout);
    if (!m) throw new Error(`glm_numpy.py printed no timing: ${stdout}`);
    const numpySec = Number(m[1]);
    const blas = /blas (\S+)/.exec(stdout)?.[1] ?? 'unknown';
    const coretype = /coretype (\S+)/.exec(stdout)?.[1] ?? 'unknown';
    const buf = readFileSync(rawBetas);
    const ref = new Float64Array(buf.buffer, buf.byteOffset, buf.byteLength / 8);
    let maxRel = 0;
    for (let i = 0; i < ref.length; i++) maxRel = Math.max(maxRel, Math.abs(ref[i] - fit.betas[i]) / Math.max(1, Math.abs(ref[i])));
    console.log(`bench glm-seconds ${oursSec.toFixed(4)} s`);
    console.log(`bench glm-ar1-seconds ${ar1Sec.toFixed(4)} s`);
    console.log(`bench numpy-lstsq-seconds ${numpySec.toFixed(4)} s`);
    console.log(`# numpy backend: ${blas}, OPENBLAS_CORETYPE ${coretype}`);
    console.log(`ratio glm-vs-numpy ${(oursSec / numpySec).toFixed(3)}`);
    console.log(`bench glm-max-rel-beta-diff-vs-numpy ${maxRel.toExponential(2)} value`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
