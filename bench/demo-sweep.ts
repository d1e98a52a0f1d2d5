/**
 * The default demo sweep (smoothing FWHM 0-14 mm in 8 steps x 20 plantings x 1 planted size) on the
 * demo run, each measurement in a fresh child process so its peak memory is its own:
 *   bench demo-sweep-seconds <s> s           wall time, 2 workers, empty stage cache
 *   bench demo-sweep-cpu-seconds <s> s       processor time of all threads (wall time on 2 idle cores is about half)
 *   bench demo-sweep-peak-x-run <x> x        peak resident memory (maxRSS) / the run's float32 size
 *   bench demo-sweep-peak-mb <mb> MB         the same peak in MB, and the process before the run was read
 *   bench demo-sweep-warm-seconds <s> s      the same sweep again: every cell from the cache (a resumed sweep)
 *   ratio demo-sweep-cache <x>               stages recomputed for every cell / stages reused (same sweep,
 *                                            4 plantings, median of 3): the speed-up from caching stages
 *   ratio demo-sweep-2-vs-1-workers <x>      1 worker / 2 workers (4 plantings, median of 3)
 * With 1 worker the sweep runs in the main thread, where the smoothing step itself still uses the
 * machine's cores; the ratio is therefore the gain of running cells side by side.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runBytes } from '../src/core/volume.js';
import { openRun } from '../src/io/open-run.js';
import { TISSUE_LABEL } from '../src/simulate/tissue-properties.js';
import { defaultSmoothingSpec } from '../src/sweep/default-spec.js';
import { buildMask, maskFromFile } from '../src/sweep/mask-source.js';
import { runSweep } from '../src/sweep/runner.js';
import { shareVolume } from '../src/sweep/shared-volume.js';

const STEM = 'sub-phantom01_task-flicker';
const here = dirname(fileURLToPath(import.meta.url));

interface ChildResult { seconds: number; cpuSeconds: number; maxRssBytes: number; baselineRssBytes: number; runBytes: number; computed: number; cached: number }

/** The demo data folder: the package's data-demo/, or the same phantom written to a temp folder. */
async function demoData(): Promise<{ dir: string; temp: boolean }> {
  let root = here;
  while (!existsSync(join(root, 'package.json'))) root = dirname(root);
  const dir = join(root, 'data-demo');
  if (existsSync(join(dir, `${STEM}_bold.nii.gz`))) return { dir, temp: false };
  const tmp = mkdtempSync(join(tmpdir(), 'boldsweep-demo-data-'));
  // loaded only here: the measured child should hold what the demo command holds, not the phantom code
  const { demoPhantomSpec } = await import('../src/simulate/phantom-spec.js');
  const { simulatePhantomRun } = await import('../src/simulate/simulate-phantom-run.js');
  const { writePhantomRun } = await import('../src/simulate/write-phantom-run.js');
  await writePhantomRun(tmp, simulatePhantomRun(demoPhantomSpec()), STEM);
  return { dir: tmp, temp: true };
}

/** In the child: one sweep, as the demo command runs it (minus the look and the report). */
async function child(args: string[]): Promise<void> {
  const [dataDir, cacheDir, workers, repeats, reuse] = args;
  const baselineRssBytes = process.memoryUsage().rss;
  const t0 = performance.now();
  let run = await openRun(join(dataDir, `${STEM}_bold.nii.gz`), { sharedMemory: true });
  run = { ...run, volume: shareVolume(run.volume) };
  const brainMask = await buildMask({ kind: 'otsu-mean' }, run.volume);
  const placementMask = await buildMask(await maskFromFile(join(dataDir, `${STEM}_truth-tissue.nii.gz`), { values: [TISSUE_LABEL['grey-matter']] }), run.volume);
  const excludeMask = await buildMask(await maskFromFile(join(dataDir, `${STEM}_truth-activation.nii.gz`), { above: 0, growVoxels: 4 }), run.volume);
  // the look's findings on the demo run: 3 volumes to drop, volumes 83, 112, 113 to censor
  const spec = defaultSmoothingSpec({ dropInitialVolumes: 3, censorVolumes: [83, 112, 113], repeats: Number(repeats), workers: Number(workers) });
  const r = await runSweep(run, spec, { cacheDir, brainMask, placementMask, excludeMask, reuseStages: reuse === 'true' });
  const cpu = process.cpuUsage();
  const out: ChildResult = {
    seconds: (performance.now() - t0) / 1000, cpuSeconds: (cpu.user + cpu.system) / 1e6, maxRssBytes: process.resourceUsage().maxRSS * 1024, baselineRssBytes,
    runBytes: runBytes(run.volume.dims), computed: r.stats.cellsComputed, cached: r.stats.cellsFromCache,
  };
  process.stdout.write(`${JSON.stringify(out)}\n`);
}

function measure(dataDir: string, cacheDir: string, workers: number, repeats: number, reuse = true): ChildResult {
  const text = execFileSync(process.execPath, [fileURLToPath(import.meta.url), '--child', dataDir, cacheDir, String(workers), String(repeats), String(reuse)], { encoding: 'utf8', maxBuffer: 1 << 20 });
  return JSON.parse(text.trim().split('\n').pop()!) as ChildResult;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[(s.length - 1) >> 1];
}

/**
 * Run the benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const data = await demoData();
  const scratch = mkdtempSync(join(tmpdir(), 'boldsweep-bench-sweep-'));
  let k = 0;
  const fresh = () => join(scratch, `cache-${k++}`);
  try {
    // 1. the default demo sweep, cold, then warm (everything from the cache)
    const cache = fresh();
    const cold = measure(data.dir, cache, 2, 20);
    const warm = measure(data.dir, cache, 2, 20);
    console.log(`bench demo-sweep-seconds ${cold.seconds.toFixed(1)} s`);
    console.log(`bench demo-sweep-cpu-seconds ${cold.cpuSeconds.toFixed(1)} s`);
    console.log(`bench demo-sweep-peak-x-run ${(cold.maxRssBytes / cold.runBytes).toFixed(2)} x`);
    console.log(`bench demo-sweep-peak-mb ${(cold.maxRssBytes / 2 ** 20).toFixed(0)} MB`);
    console.log(`bench demo-sweep-baseline-mb ${(cold.baselineRssBytes / 2 ** 20).toFixed(0)} MB`);
    console.log(`bench demo-sweep-run-mb ${(cold.runBytes / 2 ** 20).toFixed(1)} MB`);
    console.log(`bench demo-sweep-warm-seconds ${warm.seconds.toFixed(1)} s`);
    // 2. what reusing stages saves, and what a second worker adds (4 plantings, median of 3; the
    //    three set-ups take turns so a change in machine load touches them alike)
    const times: Record<'reused' | 'recomputed' | 'one', number[]> = { reused: [], recomputed: [], one: [] };
    for (let i = 0; i < 3; i++) {
      times.reused.push(measure(data.dir, fresh(), 2, 4, true).seconds);
      times.recomputed.push(measure(data.dir, fresh(), 2, 4, false).seconds);
      times.one.push(measure(data.dir, fresh(), 1, 4, true).seconds);
    }
    const reused = median(times.reused);
    const recomputed = median(times.recomputed);
    const one = median(times.one);
    console.log(`ratio demo-sweep-cache ${(recomputed / reused).toFixed(2)}`);
    console.log(`ratio demo-sweep-2-vs-1-workers ${(one / reused).toFixed(2)}`);
  } finally {
    rmSync(scratch, { recursive: true, force: true });
    if (data.temp) rmSync(data.dir, { recursive: true, force: true });
  }
}

if (process.argv[2] === '--child') await child(process.argv.slice(3));
else if (process.argv[1] === fileURLToPath(import.meta.url)) await main();
