import { existsSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';
import type { Command } from 'commander';
import { fail } from '../core/fail.js';
import { summariseVolume } from '../core/summary.js';
import { openRun } from '../io/open-run.js';
import { addOutputFiles, checkOutputFolder, claimOutputFolder } from '../io/output-folder.js';
import { lookAtRun } from '../look/look-at-run.js';
import { RESEARCH_CAUTION } from '../report/caution.js';
import { runFacts } from '../report/run-facts.js';
import { packageRoot } from '../report/software-versions.js';
import { writeSweepFolder } from '../report/sweep-folder.js';
import { TISSUE_LABEL } from '../simulate/tissue-properties.js';
import { defaultSmoothingSpec } from '../sweep/default-spec.js';
import { buildMask, maskFromFile, type MaskSource } from '../sweep/mask-source.js';
import { runSweep } from '../sweep/runner.js';
import { shareVolume } from '../sweep/shared-volume.js';
import { terminalProgress } from '../sweep/terminal-progress.js';
import { FORCE_HELP, positiveInt, withExitCodes } from './cli-common.js';


/** Null designs per setting in the demo sweep (measured family-wise rate in the report). */
const DEMO_NULL_DESIGNS = 20;
/** File name stem of the demo run in data-demo/. */
export const DEMO_RUN_STEM = 'sub-phantom01_task-flicker';

/** Margin around the phantom's own response, in voxel steps (4 x 3.5 mm = 14 mm, the widest kernel swept). */
const EXCLUDE_MARGIN_VOXELS = 4;

interface DemoCliOptions {
  out: string;
  data?: string;
  repeats?: number;
  workers?: number;
  progress: boolean;
  force?: boolean;
}

/**
 * The main job on the demo run, start to finish: open it, look at it, run the default smoothing
 * sweep, and write the report, scorecard, decision record and methods text.
 * @param o - output folder, data folder, repeats, workers, progress bar
 * @returns when every file is written
 * @example await runDemo({ out: 'out/demo', progress: true })
 */
export async function runDemo(o: DemoCliOptions): Promise<void> {
  const dataDir = resolve(o.data ?? join(packageRoot(), 'data-demo'));
  const image = join(dataDir, `${DEMO_RUN_STEM}_bold.nii.gz`);
  if (!existsSync(image)) fail('FILE_NOT_FOUND', `the demo run ${image} is missing (regenerate it with "npm run make-demo-data")`);
  const write = { force: o.force, inputs: [image] };
  checkOutputFolder(o.out, write);
  let run = await openRun(image, { sharedMemory: true });
  // one copy of the run, read straight into shared memory (shareVolume then keeps it as it is)
  run = { ...run, volume: shareVolume(run.volume) };

  // 1. the run and a first look
  console.log(`Run: ${basename(image)}`);
  console.log(`     ${summariseVolume(run.volume)}`);
  const look = lookAtRun(run);
  for (const v of look.verdicts.slice(0, 6)) console.log(`look: ${v}`);
  const drop = look.recommendation.dropInitialVolumes;
  const censor = look.recommendation.censorVolumes;

  // 2. masks: automatic brain mask; blobs in grey matter of the phantom's truth; the phantom's own
  //    occipital response is known, so it is left out of planting and scoring, with a margin as wide as
  //    the widest kernel (smoothing spreads that response beyond its edge)
  const tissue = join(dataDir, `${DEMO_RUN_STEM}_truth-tissue.nii.gz`);
  const activation = join(dataDir, `${DEMO_RUN_STEM}_truth-activation.nii.gz`);
  const masks: { brain: MaskSource; placement: MaskSource; exclude: MaskSource | null } = {
    brain: { kind: 'otsu-mean' },
    placement: existsSync(tissue) ? await maskFromFile(tissue, { values: [TISSUE_LABEL['grey-matter']] }) : { kind: 'brain' },
    exclude: existsSync(activation) ? await maskFromFile(activation, { above: 0, growVoxels: EXCLUDE_MARGIN_VOXELS }) : null,
  };
  const brainMask = await buildMask(masks.brain, run.volume);
  const placementMask = await buildMask(masks.placement, run.volume, { brain: brainMask });
  const excludeMask = masks.exclude ? await buildMask(masks.exclude, run.volume) : undefined;

  // 3. the default smoothing sweep, with null designs
  const base = defaultSmoothingSpec({ dropInitialVolumes: drop, censorVolumes: censor, repeats: o.repeats, workers: o.workers });
  // 20 null designs per width measure the threshold's family-wise rate on this run's own noise (the
  // report's nominal-against-measured table); 19 is the least that holds a 95th percentile
  const spec = { ...base, threshold: { ...base.threshold, nullDesigns: DEMO_NULL_DESIGNS } };
  console.log(`sweep: smoothing FWHM ${spec.vary['smooth.fwhmMm'].join(', ')} mm x ${spec.repeats} plantings of ${spec.plant.count} blobs (${spec.plant.sizesFwhmMm.join(', ')} mm FWHM, ${spec.plant.amplitudesPct.join(', ')} %)${drop ? `, after dropping ${drop} initial volumes` : ''}${censor.length ? `, censoring volumes ${censor.join(', ')}` : ''}`);
  await claimOutputFolder(o.out, write);
  await addOutputFiles(o.out, ['cache/']);
  const bar = o.progress ? terminalProgress() : null;
  let result;
  try {
    result = await runSweep(run, spec, { cacheDir: join(o.out, 'cache'), workers: o.workers, brainMask, placementMask, excludeMask, onProgress: bar?.update });
  } finally {
    bar?.stop();
  }
  const s = result.stats;
  console.log(`sweep: ${s.cellsRun} cells (${s.cellsComputed} computed, ${s.cellsFromCache} from cache) on ${s.workers} worker(s) in ${s.wallSeconds.toFixed(1)} s`);

  // 4. report: its chart code (vega, vega-lite) is loaded only now, so it is not resident while the
  //    sweep runs (about 28 MB of the main thread at the sweep's peak)
  const { writeReport } = await import('../report/write-report.js');
  const folder = { result, run: runFacts(run), masks };
  await writeSweepFolder(o.out, folder, write);
  const { recommendation, files } = await writeReport(o.out, folder, {}, write);
  console.log('');
  console.log(recommendation.summary);
  console.log('');
  console.log(`wrote ${files.report}`);
  console.log(`      ${join(o.out, 'scorecard.tsv')}`);
  console.log(`      ${files.record}`);
  console.log(`      ${files.methods}`);
  console.log('');
  console.log(RESEARCH_CAUTION);
}

/**
 * `boldsweep demo --out <dir>`: the whole job on the bundled demo run.
 * @param program - the root command
 * @returns the new command
 * @example registerDemoCommand(program)
 */
export function registerDemoCommand(program: Command): Command {
  return withExitCodes(program.command('demo'))
    .description('Run the default smoothing sweep on the demo run (an invented digital phantom) and write report.html, scorecard.tsv, decision-record.json and methods.md.')
    .option('--out <dir>', 'output folder: new, empty, or written by boldsweep before', 'out/demo')
    .option('--data <dir>', 'folder holding the demo run (default: the package\'s data-demo/)')
    .option('--repeats <n>', 'plantings per setting (default 20)', positiveInt)
    .option('--workers <n>', 'worker threads (default 2)', positiveInt)
    .option('--no-progress', 'no progress bar or progress lines')
    .option('--force', FORCE_HELP)
    .addHelpText('after', `
Example:
  boldsweep demo --out demo-results --repeats 5

The sweep's stage cache is kept in <out>/cache: run the command again to reuse it, or delete the
folder to start over. An interrupted demo resumes from the cells it finished.`)
    .action(async (o: DemoCliOptions) => runDemo(o));
}
