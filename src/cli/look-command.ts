import type { Command } from 'commander';
import { basename } from 'node:path';
import { hashFile } from '../io/hash-file.js';
import { readMotionTable } from '../io/motion-table-tsv.js';
import { readNifti } from '../io/nifti-read.js';
import { openRun } from '../io/open-run.js';
import { checkOutputFolder } from '../io/output-folder.js';
import { lookAtRun, type LookOptions } from '../look/look-at-run.js';
import { lookConsoleLines } from '../look/look-console-lines.js';
import { FORCE_HELP, finiteNumber, nonNegativeInt, positiveNumber, withExitCodes } from './cli-common.js';

interface LookCliOptions {
  out: string;
  mask?: string;
  drop?: number;
  detrendOrder: number;
  volumeCutoffZ: number;
  sliceCutoffZ: number;
  spikeCutoffZ: number;
  t1Sec?: number;
  flipAngleDeg?: number;
  figures: boolean;
  force?: boolean;
  motionTable?: string;
  estimateMotion?: boolean;
  fdThresholdMm: number;
}

/**
 * Register `boldsweep look <run> --out <dir>`: look at a run and write maps (NIfTI), figures
 * (PNG/SVG), series.tsv and findings.json to a folder of boldsweep's own.
 * @param program - the commander program
 * @returns the new command
 * @example registerLook(program)
 */
export function registerLook(program: Command): Command {
  return withExitCodes(program.command('look'))
    .description('Step 1. Look at a run before choosing anything: tSNR maps, brain mask, DVARS, outlier volumes and slices, spikes, steady state.')
    .argument('<run>', 'the 4D run (.nii or .nii.gz); a BIDS sidecar .json beside it is read for RepetitionTime and FlipAngle')
    .requiredOption('--out <dir>', 'output folder: new, empty, or written by boldsweep before (never the run\'s own folder)')
    .option('--mask <file>', 'brain mask to use instead of the one made from the run (same grid)')
    .option('--drop <n>', 'initial volumes to drop instead of the recommendation', nonNegativeInt)
    .option('--detrend-order <n>', 'polynomial drift order removed before SDs and outlier scores', nonNegativeInt, 2)
    .option('--volume-cutoff-z <z>', 'robust z cutoff for volume outliers (DVARS, global mean)', finiteNumber, 5)
    .option('--slice-cutoff-z <z>', 'robust z cutoff for slice outliers', finiteNumber, 5)
    .option('--spike-cutoff-z <z>', 'robust z cutoff for single-voxel spikes', finiteNumber, 6)
    .option('--t1-sec <s>', 'T1 for the steady-state model check (default grey matter at 3 T, 1.331 s)', positiveNumber)
    .option('--flip-angle-deg <deg>', 'flip angle when the sidecar has none', positiveNumber)
    .option('--motion-table <file>', 'the head\'s position at each volume (TSV: shiftXMm shiftYMm shiftZMm rotXDeg rotYDeg rotZDeg, one row per volume): framewise displacement, its finding and figures')
    .option('--estimate-motion', 'without --motion-table, estimate the head motion as a quick screen (rigid, least squares, to the middle volume, coarse levels 4 and 2 only; takes longer than the rest of the look)')
    .option('--fd-threshold-mm <mm>', 'framewise displacement above which a volume is reported (0.5 mm: common practice, and Power et al. 2012\'s)', positiveNumber, 0.5)
    .option('--no-figures', 'write maps, series and findings only')
    .option('--force', FORCE_HELP)
    .addHelpText('after', `
Example:
  boldsweep look sub-01/func/sub-01_task-motor_bold.nii.gz --out look-sub-01
  boldsweep spec look-sub-01 --out smoothing.yaml      (next: a starting spec from the findings)`)
    .action(async (path: string, opts: LookCliOptions) => {
      // refuse an unsafe output folder before the work, not after it
      checkOutputFolder(opts.out, { force: opts.force, inputs: [path, opts.mask, opts.motionTable] });
      const run = await openRun(path);
      const options: LookOptions = {
        detrendOrder: opts.detrendOrder, volumeCutoffZ: opts.volumeCutoffZ, sliceCutoffZ: opts.sliceCutoffZ, spikeCutoffZ: opts.spikeCutoffZ,
        dropInitialVolumes: opts.drop ?? 'auto',
      };
      if (opts.t1Sec !== undefined) options.t1Sec = opts.t1Sec;
      if (opts.flipAngleDeg !== undefined) options.flipAngleDeg = opts.flipAngleDeg;
      if (opts.mask) options.mask = (await readNifti(opts.mask)).volume;
      options.fdThresholdMm = opts.fdThresholdMm;
      if (opts.motionTable) {
        options.motionTable = await readMotionTable(opts.motionTable);
        options.motionTableMethod = `given: ${basename(opts.motionTable)}`;
      }
      let look = lookAtRun(run, options);
      if (opts.estimateMotion && !opts.motionTable) {
        // the registration code loads only when asked for
        const { estimateLookMotion } = await import('../look/estimate-look-motion.js');
        const { withLookMotion } = await import('../look/with-look-motion.js');
        const { table, method } = await estimateLookMotion(run.volume, look.mask.mask, look.recommendation.dropInitialVolumes);
        look = withLookMotion(look, run.volume, table, 'estimated', method);
      }
      const source = run.files.image ?? path;
      // the figure code (vega, vega-lite) loads only now: no other command holds it
      const { writeLookFolder } = await import('../report/write-look-folder.js');
      const files = await writeLookFolder(run.volume, look, opts.out, { source, sourceSha256: await hashFile(source), figures: opts.figures, force: opts.force, inputs: [path, opts.mask, opts.motionTable] });
      console.log(lookConsoleLines(look, path).join('\n'));
      console.log(`recommendation: drop ${look.recommendation.dropInitialVolumes} initial volume(s); censor ${look.recommendation.censorVolumes.length ? look.recommendation.censorVolumes.join(', ') : 'none'}`);
      console.log(`tSNR in the mask: median ${look.summaries.tsnr.median.toFixed(1)} (quartiles ${look.summaries.tsnr.q1.toFixed(1)}-${look.summaries.tsnr.q3.toFixed(1)})`);
      console.log(`wrote ${files.length} files to ${opts.out}`);
      console.log(`next: boldsweep spec ${opts.out} --out smoothing.yaml`);
    });
}
