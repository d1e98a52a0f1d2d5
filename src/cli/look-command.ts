import type { Command } from 'commander';
import { fail } from '../core/fail.js';
import { readNifti } from '../io/nifti-read.js';
import { openRun } from '../io/open-run.js';
import { lookAtRun, type LookOptions } from '../look/look-at-run.js';
import { lookConsoleLines } from '../look/look-console-lines.js';
import { writeLookFolder } from '../report/write-look-folder.js';

function numberOption(name: string, integer: boolean) {
  return (value: string): number => {
    const x = Number(value);
    if (!Number.isFinite(x) || (integer && !Number.isInteger(x))) fail('INVALID_ARGUMENT', `--${name} must be ${integer ? 'an integer' : 'a number'}, got '${value}'`);
    return x;
  };
}

/**
 * Register `boldsweep look <run> --out <dir>`: look at a run and write maps (NIfTI), figures
 * (PNG/SVG), series.tsv and findings.json to a folder, atomically.
 * @param program - the commander program
 * @example registerLook(program)
 */
export function registerLook(program: Command): void {
  program
    .command('look')
    .description('Look at a run before choosing anything: tSNR maps, brain mask, DVARS, outlier volumes and slices, spikes, steady state')
    .argument('<run>', 'the 4D run (.nii or .nii.gz); a BIDS sidecar .json beside it is read for RepetitionTime and FlipAngle')
    .requiredOption('--out <dir>', 'output folder (replaced as a whole when the look is complete)')
    .option('--mask <file>', 'brain mask to use instead of the one made from the run (same grid)')
    .option('--drop <n>', 'initial volumes to drop instead of the recommendation', numberOption('drop', true))
    .option('--detrend-order <n>', 'polynomial drift order removed before SDs and outlier scores', numberOption('detrend-order', true), 2)
    .option('--volume-cutoff-z <z>', 'robust z cutoff for volume outliers (DVARS, global mean)', numberOption('volume-cutoff-z', false), 5)
    .option('--slice-cutoff-z <z>', 'robust z cutoff for slice outliers', numberOption('slice-cutoff-z', false), 5)
    .option('--spike-cutoff-z <z>', 'robust z cutoff for single-voxel spikes', numberOption('spike-cutoff-z', false), 6)
    .option('--t1-sec <s>', 'T1 for the steady-state model check (default grey matter at 3 T, 1.331 s)', numberOption('t1-sec', false))
    .option('--flip-angle-deg <deg>', 'flip angle when the sidecar has none', numberOption('flip-angle-deg', false))
    .option('--no-figures', 'write maps, series and findings only')
    .action(async (path: string, opts: { out: string; mask?: string; drop?: number; detrendOrder: number; volumeCutoffZ: number; sliceCutoffZ: number; spikeCutoffZ: number; t1Sec?: number; flipAngleDeg?: number; figures: boolean }) => {
      const run = await openRun(path);
      const options: LookOptions = {
        detrendOrder: opts.detrendOrder, volumeCutoffZ: opts.volumeCutoffZ, sliceCutoffZ: opts.sliceCutoffZ, spikeCutoffZ: opts.spikeCutoffZ,
        dropInitialVolumes: opts.drop ?? 'auto',
      };
      if (opts.t1Sec !== undefined) options.t1Sec = opts.t1Sec;
      if (opts.flipAngleDeg !== undefined) options.flipAngleDeg = opts.flipAngleDeg;
      if (opts.mask) options.mask = (await readNifti(opts.mask)).volume;
      const look = lookAtRun(run, options);
      const files = await writeLookFolder(run.volume, look, opts.out, { source: run.files.image, figures: opts.figures });
      console.log(lookConsoleLines(look, path).join('\n'));
      console.log(`recommendation: drop ${look.recommendation.dropInitialVolumes} initial volume(s); censor ${look.recommendation.censorVolumes.length ? look.recommendation.censorVolumes.join(', ') : 'none'}`);
      console.log(`tSNR in the mask: median ${look.summaries.tsnr.median.toFixed(1)} (quartiles ${look.summaries.tsnr.q1.toFixed(1)}-${look.summaries.tsnr.q3.toFixed(1)})`);
      console.log(`wrote ${files.length} files to ${opts.out}`);
    });
}
