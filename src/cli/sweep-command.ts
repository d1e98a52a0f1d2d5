import { basename, join, resolve } from 'node:path';
import type { Command } from 'commander';
import { fail } from '../core/fail.js';
import { hashFile } from '../io/hash-file.js';
import { openRun } from '../io/open-run.js';
import { addOutputFiles, checkOutputFolder, claimOutputFolder } from '../io/output-folder.js';
import { siblingCandidates } from '../io/run-siblings.js';
import { lookAtRun } from '../look/look-at-run.js';
import { readLookFolder } from '../report/read-look-folder.js';
import { runFacts } from '../report/run-facts.js';
import { applyLookToSpec } from '../sweep/apply-look-to-spec.js';
import { untreatedFindings } from '../sweep/untreated-findings.js';
import { readSweepFolder, writeSweepFolder } from '../report/sweep-folder.js';
import { gatherResults } from '../sweep/gather.js';
import { buildMask, maskFromFile, type MaskSource } from '../sweep/mask-source.js';
import { readSweepSpec } from '../sweep/read-sweep-spec.js';
import { runSweep } from '../sweep/runner.js';
import { shareVolume } from '../sweep/shared-volume.js';
import { terminalProgress } from '../sweep/terminal-progress.js';
import { readMotionTable } from '../io/motion-table-tsv.js';
import { readNifti } from '../io/nifti-read.js';
import { assertSameGrid, voxelsPerVolume } from '../core/volume.js';
import { FORCE_HELP, numberList, positiveInt, withExitCodes } from './cli-common.js';

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
  look?: string;
  events?: string;
  sidecar?: string;
  motionTable?: string;
  estimateMotion: boolean;
  fieldMap?: string;
  force?: boolean;
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
    .description('Step 3. Run a sweep on a run: every setting of the spec, on repeated plantings, scored against the planted truth.')
    .argument('<run>', 'the 4D NIfTI run (.nii or .nii.gz); its BIDS sidecar JSON and events TSV are read from beside it')
    .requiredOption('--spec <file>', 'sweep spec, YAML (.yaml, .yml) or JSON (.json); "boldsweep spec" writes a commented one')
    .requiredOption('--out <dir>', 'output folder: new, empty, or written by boldsweep before (never the run\'s own folder)')
    .option('--look <dir>', 'look folder of this run ("boldsweep look"): its bright first volumes are dropped and abrupt changes censored where the spec leaves them open')
    .option('--events <file>', 'events TSV (onset, duration, trial_type) when it is not beside the run as <name>_events.tsv')
    .option('--sidecar <file>', 'BIDS sidecar JSON when it is not beside the run as <name>.json')
    .option('--motion-table <file>', 'the head\'s position at each volume (TSV: shiftXMm shiftYMm shiftZMm rotXDeg rotYDeg rotZDeg, one row per volume): planted activations move with the head, and the model\'s motion regressors and FD censoring use it')
    .option('--no-estimate-motion', 'without --motion-table, keep the planted activations still instead of estimating the run\'s motion (rigid, least squares, to the middle volume; cached) and planting with it')
    .option('--field-map <file>', 'B0 field map in Hz on the run\'s grid: planted activations are displaced along phase encode (needs PhaseEncodingDirection and TotalReadoutTime or EffectiveEchoSpacing in the sidecar)')
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
    .option('--no-progress', 'no progress bar or progress lines')
    .option('--force', FORCE_HELP)
    .addHelpText('after', `
Progress goes to stderr: a bar on a terminal, plain lines (every 10 % or 10 s) in a log file.

Example:
  boldsweep sweep sub-01_task-motor_bold.nii.gz --spec smoothing.yaml --look look-sub-01 --out sweep-sub-01
  boldsweep report sweep-sub-01      (next: the recommendation and the report)`)
    .action(async (runPath: string, o: SweepCliOptions) => {
      const inputs = [runPath, o.mask, o.placement, o.exclude, o.events, o.sidecar, o.look, o.motionTable, o.fieldMap];
      checkOutputFolder(o.out, { force: o.force, inputs });
      let spec = readSweepSpec(o.spec);
      let run = await openRun(runPath, { sharedMemory: true, ...(o.events ? { events: o.events } : {}), ...(o.sidecar ? { sidecar: o.sidecar } : {}) });
      if (spec.events.kind === 'run' && !run.events?.length) {
        const expected = basename(siblingCandidates(runPath).events[0]);
        fail('EVENTS_MISSING', `the spec plants and models the run's own task timing, but ${o.events ? `${o.events} holds no events` : `there is no events file ${expected} beside ${basename(runPath)}`} (pass one with --events <file>)`);
      }
      const motionTable = o.motionTable ? await readMotionTable(o.motionTable) : null;
      if (o.look) {
        const look = readLookFolder(o.look);
        const sha = await hashFile(run.files.image ?? runPath);
        const sameRun = look.runSha256 ? look.runSha256 === sha : look.dims.join('x') === run.volume.dims.join('x');
        if (!sameRun) fail('LOOK_FROM_OTHER_RUN', `the look folder ${o.look} was made from ${look.runFile ?? 'another run'}${look.runSha256 ? ` (SHA-256 ${look.runSha256.slice(0, 12)}...)` : ''}, not from ${basename(runPath)} (SHA-256 ${sha.slice(0, 12)}...)`);
        const applied = applyLookToSpec(spec, look);
        spec = applied.spec;
        for (const n of applied.notes) console.log(`look: ${n}`);
        if (!applied.notes.length) console.log(`look: the spec treats the look's findings (drop ${look.dropInitialVolumes}, censor ${look.censorVolumes.join(', ') || 'none'})`);
        // what applying the look does not settle (volumes moved above the FD threshold: a model choice)
        for (const w of untreatedFindings(spec, look)) console.error(`warning: ${w}`);
      } else {
        const own = lookAtRun(run, { motionTable });
        const warnings = untreatedFindings(spec, { ...own.recommendation, movedVolumes: own.motion.aboveThreshold, fdThresholdMm: own.motion.fdThresholdMm });
        for (const w of warnings) console.error(`warning: ${w}`);
        if (warnings.length) console.error(`warning: the sweep runs as the spec says; to treat these, pass --look <dir> (from "boldsweep look ${basename(runPath)} --out <dir>") or edit ${o.spec}`);
      }
      run = { ...run, volume: shareVolume(run.volume) };
      const masks: { brain: MaskSource; placement: MaskSource; exclude: MaskSource | null } = {
        brain: o.mask ? await maskFromFile(o.mask, { values: o.maskValues }) : { kind: 'otsu-mean' },
        placement: o.placement ? await maskFromFile(o.placement, { values: o.placementValues }) : { kind: 'brain' },
        exclude: o.exclude ? await maskFromFile(o.exclude, { above: o.excludeAbove ?? 0, growVoxels: o.excludeGrow }) : null,
      };
      let fieldMapHz: Float32Array | null = null;
      if (o.fieldMap) {
        const field = (await readNifti(o.fieldMap)).volume;
        assertSameGrid(field, run.volume, ['field map', 'run']);
        fieldMapHz = field.data.subarray(0, voxelsPerVolume(field));
      }
      const brainMask = await buildMask(masks.brain, run.volume);
      const placementMask = await buildMask(masks.placement, run.volume, { brain: brainMask });
      const excludeMask = masks.exclude ? await buildMask(masks.exclude, run.volume) : undefined;
      // the cache is the sweep's own: inside the output folder by default, else a folder of its own
      await claimOutputFolder(o.out, { force: o.force, inputs });
      const cacheDir = o.cache ?? join(o.out, 'cache');
      if (o.cache && resolve(o.cache) !== resolve(o.out, 'cache')) await claimOutputFolder(o.cache, { force: o.force, inputs, optionName: '--cache' });
      else await addOutputFiles(o.out, ['cache/']);
      const bar = o.progress ? terminalProgress() : null;
      let result;
      try {
        result = await runSweep(run, spec, { workers: o.workers, shard: o.shard ?? null, cacheDir, brainMask, placementMask, excludeMask, motionTable, estimateMotion: o.estimateMotion, fieldMapHz, onProgress: bar?.update });
      } finally {
        bar?.stop();
      }
      await writeSweepFolder(o.out, { result, run: runFacts(run), masks }, { force: o.force, inputs });
      const s = result.stats;
      if (result.motion?.source === 'estimated') console.log(`planted activations move with the run's estimated motion (${result.motion.method}; ${result.motion.fromCache ? 'from the cache' : `${result.motion.seconds.toFixed(1)} s`})`);
      console.log(`${s.cellsRun} cells (${s.cellsComputed} computed, ${s.cellsFromCache} from cache) in ${s.wallSeconds.toFixed(1)} s; wrote ${join(o.out, 'scorecard.tsv')}`);
      if (result.shard && result.shard.count > 1) console.log(`next: when all ${result.shard.count} shards are done: boldsweep gather <shard folders...> --out <folder>, then boldsweep report <folder>`);
      else console.log(`next: boldsweep report ${o.out}`);
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
    .requiredOption('--out <dir>', 'folder for the merged sweep: new, empty, or written by boldsweep before (not one of the shard folders)')
    .option('--allow-partial', 'accept missing cells (the report then covers only what ran)')
    .option('--force', FORCE_HELP)
    .addHelpText('after', `
Example:
  boldsweep gather sweep-part1 sweep-part2 sweep-part3 --out sweep-all
  boldsweep report sweep-all`)
    .action(async (dirs: string[], o: { out: string; allowPartial?: boolean; force?: boolean }) => {
      checkOutputFolder(o.out, { force: o.force, inputs: dirs });
      const folders = dirs.map(readSweepFolder);
      const result = gatherResults(folders.map((f) => f.result), { allowPartial: o.allowPartial });
      await writeSweepFolder(o.out, { result, run: folders[0].run, masks: folders[0].masks }, { force: o.force, inputs: dirs });
      console.log(`gathered ${result.scorecard.rows.length} of ${result.stats.cellsInPlan} cells from ${dirs.length} folder(s) into ${o.out}`);
      console.log(`next: boldsweep report ${o.out}`);
    });
}
