import { join } from 'node:path';
import type { Command } from 'commander';
import { openRun } from '../io/open-run.js';
import { runFacts } from '../report/run-facts.js';
import { readSweepFolder, writeSweepFolder } from '../report/sweep-folder.js';
import { gatherResults } from '../sweep/gather.js';
import { buildMask, maskFromFile, type MaskSource } from '../sweep/mask-source.js';
import { readSweepSpec } from '../sweep/read-sweep-spec.js';
import { runSweep } from '../sweep/runner.js';
import { shareVolume } from '../sweep/shared-volume.js';
import { terminalProgress } from '../sweep/terminal-progress.js';
import { numberList, positiveInt, withExitCodes } from './cli-common.js';

interface SweepCliOptions {
  spec: string;
  out: string;
  workers?: number;
  shard?: string;
  cache?: string;
  mask?: string;
  maskValues: number[];
  placement?: string;
  placementValues: number[];
  exclude?: string;
  excludeAbove?: number;
  excludeGrow?: number;
  progress: boolean;
}

/**
 * `boldsweep sweep <run> --spec <file> --out <dir>`: run a sweep and write its folder (scorecard.tsv,
 * timings.tsv, roc.tsv, sweep.json); `boldsweep report <dir>` then writes the report.
 * @param program - the root command
 * @returns the new command
 * @example registerSweepCommand(program)
 */
export function registerSweepCommand(program: Command): Command {
  return withExitCodes(program.command('sweep'))
    .description('Run a sweep on a run: every setting of the spec, on repeated plantings, scored against the planted truth.')
    .argument('<run>', 'the 4D NIfTI run (.nii or .nii.gz); its BIDS sidecar JSON and events TSV are read from beside it')
    .requiredOption('--spec <file>', 'sweep spec, JSON (.json) or YAML (.yaml, .yml)')
    .requiredOption('--out <dir>', 'output folder (created when missing)')
    .option('--workers <n>', 'worker threads (default: the spec\'s workers)', positiveInt)
    .option('--shard <i/N>', 'run only shard i of N (1-based), e.g. one task of a cluster job array; merge with "boldsweep gather"')
    .option('--cache <dir>', 'stage cache folder; an interrupted sweep resumes from it (default: <out>/cache)')
    .option('--mask <file>', 'brain mask image on the run\'s grid (default: automatic mask of the mean image)')
    .option('--mask-values <list>', 'values of --mask that count as brain', numberList, [1])
    .option('--placement <file>', 'image on the run\'s grid where planted blobs may be centred, e.g. a grey-matter label map (default: the brain mask)')
    .option('--placement-values <list>', 'values of --placement that allow a blob centre', numberList, [1])
    .option('--exclude <file>', 'image on the run\'s grid marking voxels that already respond to the task (known activation); they get no blob and are left out of scoring')
    .option('--exclude-above <value>', 'voxels of --exclude above this value are excluded', Number, 0)
    .option('--exclude-grow <voxels>', 'grow the --exclude region by this many voxels (smoothing spreads a response beyond its edge)', positiveInt)
    .option('--no-progress', 'do not draw the progress bar')
    .addHelpText('after', `
Example:
  boldsweep sweep sub-01_task-motor_bold.nii.gz --spec smoothing.yaml --out sweeps/smoothing --workers 2
  boldsweep report sweeps/smoothing`)
    .action(async (runPath: string, o: SweepCliOptions) => {
      const spec = readSweepSpec(o.spec);
      let run = await openRun(runPath, { sharedMemory: true });
      run = { ...run, volume: shareVolume(run.volume) };
      const masks: { brain: MaskSource; placement: MaskSource; exclude: MaskSource | null } = {
        brain: o.mask ? await maskFromFile(o.mask, { values: o.maskValues }) : { kind: 'otsu-mean' },
        placement: o.placement ? await maskFromFile(o.placement, { values: o.placementValues }) : { kind: 'brain' },
        exclude: o.exclude ? await maskFromFile(o.exclude, { above: o.excludeAbove ?? 0, growVoxels: o.excludeGrow }) : null,
      };
      const brainMask = await buildMask(masks.brain, run.volume);
      const placementMask = await buildMask(masks.placement, run.volume, { brain: brainMask });
      const excludeMask = masks.exclude ? await buildMask(masks.exclude, run.volume) : undefined;
      const bar = o.progress ? terminalProgress() : null;
      let result;
      try {
        result = await runSweep(run, spec, { workers: o.workers, shard: o.shard ?? null, cacheDir: o.cache ?? join(o.out, 'cache'), brainMask, placementMask, excludeMask, onProgress: bar?.update });
      } finally {
        bar?.stop();
      }
      await writeSweepFolder(o.out, { result, run: runFacts(run), masks });
      const s = result.stats;
      console.log(`${s.cellsRun} cells (${s.cellsComputed} computed, ${s.cellsFromCache} from cache) in ${s.wallSeconds.toFixed(1)} s; wrote ${join(o.out, 'scorecard.tsv')}`);
    });
}

/**
 * `boldsweep gather <dirs...> --out <dir>`: merge the folders of a sharded sweep into one.
 * @param program - the root command
 * @returns the new command
 * @example registerGatherCommand(program)
 */
export function registerGatherCommand(program: Command): Command {
  return withExitCodes(program.command('gather'))
    .description('Merge the folders of the shards of one sweep ("boldsweep sweep --shard i/N") into one folder.')
    .argument('<dirs...>', 'shard output folders')
    .requiredOption('--out <dir>', 'folder for the merged sweep')
    .option('--allow-partial', 'accept missing cells (the report then covers only what ran)')
    .action(async (dirs: string[], o: { out: string; allowPartial?: boolean }) => {
      const folders = dirs.map(readSweepFolder);
      const result = gatherResults(folders.map((f) => f.result), { allowPartial: o.allowPartial });
      await writeSweepFolder(o.out, { result, run: folders[0].run, masks: folders[0].masks });
      console.log(`gathered ${result.scorecard.rows.length} of ${result.stats.cellsInPlan} cells from ${dirs.length} folder(s) into ${o.out}`);
    });
}
