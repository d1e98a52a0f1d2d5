/**
 * A study sweep on the demo run (subjects cycling through it): smoothing FWHM 0-21 mm in 8 steps x
 * misregistration SD 0, 3, 6 mm x repeats x 12 subjects, each measurement in a fresh child process
 * so its peak memory is its own:
 *   bench study-sweep-seconds <s> s                 wall time, 2 workers, empty stage cache
 *   bench study-sweep-peak-x-run <x> x              peak resident memory (maxRSS) / the run's float32 size
 *   bench study-sweep-subject-cells <n>             subject-cells computed (widths x levels x repeats x subjects)
 *   ratio study-subject-cell-vs-run-cell <x>        processor seconds per subject-cell / per cell of a
 *                                                   single-run sweep (3 widths; the study at 1 level,
 *                                                   1 repeat, 12 subjects = 36 subject-cells; the single
 *                                                   run 12 repeats = 36 cells; alternating, median of 2);
 *                                                   target within 1.2 (the wall-time ratio is printed too)
 *   bench study-optimum-* <mm> mm                   the single-run and group optima with their 95 %
 *                                                   bootstrap intervals (studyOptima)
 * BOLDSWEEP_STUDY_REPEATS sets the repeats (default 10, the full size: 2880 subject-cells; on a loaded
 * machine run a reduced size and say so); BOLDSWEEP_STUDY_RATIO_ONLY=1 measures the ratio alone.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runBytes } from '../src/core/volume.js';
import { openRun } from '../src/io/open-run.js';
import { TISSUE_LABEL } from '../src/simulate/tissue-properties.js';
import { demoPhantomSpec } from '../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../src/simulate/simulate-phantom-run.js';
import { writePhantomRun } from '../src/simulate/write-phantom-run.js';
import { defaultSmoothingSpec } from '../src/sweep/default-spec.js';
import { buildMask, maskFromFile } from '../src/sweep/mask-source.js';
import { runSweep } from '../src/sweep/runner.js';
import { shareVolume } from '../src/sweep/shared-volume.js';
import { studyOptima } from '../src/decide/study-optima.js';
import type { SweepSpec } from '../src/sweep/spec.js';

const STEM = 'sub-phantom01_task-flicker';
const here = dirname(fileURLToPath(import.meta.url));
const WIDTHS = [0, 3, 6, 9, 12, 15, 18, 21];
const LEVELS = [0, 3, 6];
const SUBJECTS = 12;

interface ChildResult { seconds: number; cpuSeconds: number; maxRssBytes: number; runBytes: number; cells: number; optima: ReturnType<typeof studyOptima> | null; designCorrelation: number | null }

async function demoData(): Promise<{ dir: string; temp: boolean }> {
  let root = here;
  while (!existsSync(join(root, 'package.json'))) root = dirname(root);
  const dir = join(root, 'data-demo');
  if (existsSync(join(dir, `${STEM}_bold.nii.gz`))) return { dir, temp: false };
  const tmp = mkdtempSync(join(tmpdir(), 'boldsweep-demo-data-'));
  await writePhantomRun(tmp, simulatePhantomRun(demoPhantomSpec()), STEM);
  return { dir: tmp, temp: true };
}

/** Widths and levels of the time-per-cell comparison (a ratio: a smaller grid measures it as well). */
const RATIO_WIDTHS = [0, 6, 12];
const RATIO_LEVELS = [3];

/** The demo's smoothing spec (look findings applied), as a study when `study` is true; `size` 'ratio' takes the small grid. */
function spec(repeats: number, study: boolean, size: string): SweepSpec {
  const base = defaultSmoothingSpec({ dropInitialVolumes: 3, censorVolumes: [83, 112, 113], repeats, workers: 2, fwhmsMm: size === 'ratio' ? RATIO_WIDTHS : WIDTHS });
  if (!study) return base;
  return { ...base, vary: { ...base.vary, 'study.misregistrationMm': size === 'ratio' ? RATIO_LEVELS : LEVELS }, study: { subjects: SUBJECTS, runs: null, misregistrationMm: 3, amplitudeSpread: 0.3, design: { onSec: 20, offMinSec: 10, offMaxSec: 40 } } };
}

/** In the child: one sweep on the demo run (as the sweep command runs it, minus the look and the report). */
async function child(args: string[]): Promise<void> {
  const [dataDir, cacheDir, repeats, study, size] = args;
  const t0 = performance.now();
  let run = await openRun(join(dataDir, `${STEM}_bold.nii.gz`), { sharedMemory: true });
  run = { ...run, volume: shareVolume(run.volume) };
  const brainMask = await buildMask({ kind: 'otsu-mean' }, run.volume);
  const placementMask = await buildMask(await maskFromFile(join(dataDir, `${STEM}_truth-tissue.nii.gz`), { values: [TISSUE_LABEL['grey-matter']] }), run.volume);
  const excludeMask = await buildMask(await maskFromFile(join(dataDir, `${STEM}_truth-activation.nii.gz`), { above: 0, growVoxels: 4 }), run.volume);
  const r = await runSweep(run, spec(Number(repeats), study === 'true', size ?? 'full'), { cacheDir, brainMask, placementMask, excludeMask });
  const cpu = process.cpuUsage();
  const out: ChildResult = {
    seconds: (performance.now() - t0) / 1000, cpuSeconds: (cpu.user + cpu.system) / 1e6, maxRssBytes: process.resourceUsage().maxRSS * 1024,
    runBytes: runBytes(run.volume.dims), cells: r.stats.cellsComputed,
    optima: study === 'true' ? studyOptima(r.scorecard) : null, designCorrelation: r.study?.designCorrelation.meanAbs ?? null,
  };
  process.stdout.write(`${JSON.stringify(out)}\n`);
}

function measure(dataDir: string, cacheDir: string, repeats: number, study: boolean, size = 'full'): ChildResult {
  const text = execFileSync(process.execPath, [fileURLToPath(import.meta.url), '--child', dataDir, cacheDir, String(repeats), String(study), size], { encoding: 'utf8', maxBuffer: 1 << 24 });
  return JSON.parse(text.trim().split('\n').pop()!) as ChildResult;
}

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); return s[(s.length - 1) >> 1]; };
// the child's JSON turns NaN (an optimum or interval the repeats leave undefined) into null
const mmNumber = (x: number | null) => (x === null || !Number.isFinite(x) ? 'NaN' : x.toFixed(2));
const mmText = (o: { value: number | null; low: number | null; high: number | null }) => `${mmNumber(o.value)} mm (95 % interval ${mmNumber(o.low)} to ${mmNumber(o.high)}${o.value === null || o.low === null || o.high === null ? '; undefined where the repeats detect nothing at any width' : ''})`;

/**
 * Run the benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const data = await demoData();
  const repeats = Number(process.env.BOLDSWEEP_STUDY_REPEATS ?? 10);
  const scratch = mkdtempSync(join(tmpdir(), 'boldsweep-bench-study-'));
  let k = 0;
  const fresh = () => join(scratch, `cache-${k++}`);
  try {
    // BOLDSWEEP_STUDY_RATIO_ONLY=1: the time-per-cell comparison alone (on a loaded machine)
    if (process.env.BOLDSWEEP_STUDY_RATIO_ONLY !== '1') await studyFigures(data.dir, fresh(), repeats);
    // seconds per subject-cell against seconds per single-run cell, alternating, median of 2: the study
    // at 3 widths x 1 level x 1 repeat x 12 subjects (36 subject-cells), the single run at 3 widths x 12 repeats
    // processor time (all threads) per cell: the work a cell costs. Wall time per cell also carries how
    // the tasks fill the 2 workers (the one study group is split into 3 tasks of 1 cell, each planting
    // all 12 subjects, and 3 tasks on 2 workers leave one idle for a third of the time), so it is
    // printed too but not taken as the ratio
    const cpuSubject: number[] = [], cpuRun: number[] = [], wallSubject: number[] = [], wallRun: number[] = [];
    for (let i = 0; i < 2; i++) {
      const s = measure(data.dir, fresh(), 1, true, 'ratio');
      cpuSubject.push(s.cpuSeconds / (s.cells * SUBJECTS));
      wallSubject.push(s.seconds / (s.cells * SUBJECTS));
      const r = measure(data.dir, fresh(), 12, false, 'ratio');
      cpuRun.push(r.cpuSeconds / r.cells);
      wallRun.push(r.seconds / r.cells);
    }
    console.log(`bench study-subject-cell-cpu-seconds ${median(cpuSubject).toFixed(3)} s`);
    console.log(`bench run-cell-cpu-seconds ${median(cpuRun).toFixed(3)} s`);
    console.log(`ratio study-subject-cell-vs-run-cell ${(median(cpuSubject) / median(cpuRun)).toFixed(2)}`);
    console.log(`ratio study-subject-cell-vs-run-cell-wall ${(median(wallSubject) / median(wallRun)).toFixed(2)}`);
  } finally {
    rmSync(scratch, { recursive: true, force: true });
    if (data.temp) rmSync(data.dir, { recursive: true, force: true });
  }
}

/** The study sweep at full size (or BOLDSWEEP_STUDY_REPEATS repeats): time, memory, optima. */
async function studyFigures(dataDir: string, cacheDir: string, repeats: number): Promise<void> {
  const study = measure(dataDir, cacheDir, repeats, true);
  console.log(`bench study-sweep-seconds ${study.seconds.toFixed(1)} s`);
  console.log(`bench study-sweep-cpu-seconds ${study.cpuSeconds.toFixed(1)} s`);
  console.log(`bench study-sweep-peak-x-run ${(study.maxRssBytes / study.runBytes).toFixed(2)} x`);
  console.log(`bench study-sweep-peak-mb ${(study.maxRssBytes / 2 ** 20).toFixed(0)} MB`);
  console.log(`bench study-sweep-subject-cells ${study.cells * SUBJECTS} (${WIDTHS.length} widths x ${LEVELS.length} levels x ${repeats} repeats x ${SUBJECTS} subjects)`);
  if (study.designCorrelation !== null) console.log(`bench study-design-correlation-mean-abs ${study.designCorrelation.toFixed(3)}`);
  if (study.optima) {
    console.log(`bench study-optimum-single-run ${mmText(study.optima.singleRun.optimum)}`);
    for (const l of study.optima.levels) {
      console.log(`bench study-optimum-group-${l.levelMm}mm ${mmText(l.optimum)}`);
      console.log(`bench study-optimum-wider-by-${l.levelMm}mm ${mmText(l.widerBy)}`);
    }
  }
}

if (process.argv[2] === '--child') await child(process.argv.slice(3));
else if (process.argv[1] === fileURLToPath(import.meta.url)) await main();
