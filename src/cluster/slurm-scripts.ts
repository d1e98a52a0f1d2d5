import { join } from 'node:path';
import { fail } from '../core/fail.js';
import { shellQuote } from './shell-quote.js';

/** Everything the Slurm scripts of a sharded sweep are written from (paths absolute). */
export interface SlurmScriptInput {
  /** Job name shown by the scheduler. */
  jobName: string;
  /** Node.js executable the tasks run. */
  nodePath: string;
  /** The boldsweep command-line script (dist/src/cli/main.js). */
  cliPath: string;
  runPath: string;
  specPath: string;
  /** Folder that receives shards/, gathered/ and slurm/. */
  outDir: string;
  shards: number;
  /** Worker threads (and CPUs) per task. */
  workers: number;
  /** Memory per array task, MiB, and the lines that explain it. */
  memMib: number;
  memLines: string[];
  /** Memory for the gather task, MiB. */
  gatherMemMib: number;
  /** Wall-time limit per task as Slurm takes it (e.g. "02:00:00"); omitted: the partition's default. */
  time?: string;
  partition?: string;
  /** Extra `boldsweep sweep` options every shard gets (masks), already with absolute paths. */
  sweepArgs: string[];
  /** Whether the gather job also writes the report. */
  report: boolean;
}

/** The three scripts and where they go. */
export interface SlurmScripts {
  /** Folder of the scripts and the logs: <out>/slurm. */
  dir: string;
  /** Folder of the array tasks' logs. */
  logDir: string;
  files: { array: string; gather: string; submit: string };
  text: { array: string; gather: string; submit: string };
  /** Shard output folders, in shard order. */
  shardDirs: string[];
  /** The merged sweep folder. */
  gatheredDir: string;
}

/**
 * Write (as text) the Slurm job-array script that runs shard `$SLURM_ARRAY_TASK_ID` of N, the gather
 * script that merges the shards (submitted with `--dependency=afterok:<array job>`, so it starts
 * only when every shard succeeded), and a submit script that submits both.
 * @param s - paths, shard count and resource requests
 * @returns the scripts' text and paths
 * @throws BoldsweepError INVALID_ARGUMENT for relative paths or a bad shard count
 * @example const scripts = slurmScripts({ ...paths, shards: 8, workers: 1, memMib: 4096, memLines: [], gatherMemMib: 2048, sweepArgs: [], report: true })
 */
export function slurmScripts(s: SlurmScriptInput): SlurmScripts {
  for (const [k, p] of [['nodePath', s.nodePath], ['cliPath', s.cliPath], ['runPath', s.runPath], ['specPath', s.specPath], ['outDir', s.outDir]] as const) {
    if (!p.startsWith('/')) fail('INVALID_ARGUMENT', `${k} must be an absolute path (the tasks run in another folder), got ${p}`);
  }
  if (!Number.isInteger(s.shards) || s.shards < 1) fail('INVALID_ARGUMENT', `shards must be a positive integer, got ${s.shards}`);
  const dir = join(s.outDir, 'slurm');
  const logDir = join(dir, 'logs');
  const shardDirs = Array.from({ length: s.shards }, (_, i) => join(s.outDir, 'shards', `shard-${i + 1}`));
  const gatheredDir = join(s.outDir, 'gathered');
  const q = shellQuote;
  const common = [
    ...(s.partition ? [`#SBATCH --partition=${s.partition}`] : []),
    ...(s.time ? [`#SBATCH --time=${s.time}`] : []),
  ];
  const array = [
    '#!/bin/bash',
    `# boldsweep sweep, one shard per array task (${s.shards} shards). Written by "boldsweep slurm"; submit with submit.sh`,
    '# (or: sbatch sweep-array.sh, then sbatch --dependency=afterok:<its job id> gather.sh).',
    '# Memory per task:',
    ...s.memLines.map((l) => `#   ${l}`),
    `#SBATCH --job-name=${s.jobName}`,
    `#SBATCH --array=1-${s.shards}`,
    '#SBATCH --ntasks=1',
    `#SBATCH --cpus-per-task=${s.workers}`,
    `#SBATCH --mem=${s.memMib}M`,
    ...common,
    `#SBATCH --output=${join(logDir, 'shard-%a.log')}`,
    'set -euo pipefail',
    `N=${s.shards}`,
    'i=${SLURM_ARRAY_TASK_ID:?"run this script with sbatch (it is a job array)"}',
    `exec ${q(s.nodePath)} ${q(s.cliPath)} sweep ${q(s.runPath)} --spec ${q(s.specPath)} \\`,
    `  --out ${q(join(s.outDir, 'shards'))}/shard-$i --shard "$i/$N" --workers ${s.workers} --no-progress${s.sweepArgs.length ? ' ' + s.sweepArgs.map(q).join(' ') : ''}`,
    '',
  ].join('\n');
  const gather = [
    '#!/bin/bash',
    `# boldsweep: merge the ${s.shards} shard folders into ${gatheredDir}${s.report ? ' and write the report there' : ''}.`,
    '# Submitted after the array job with --dependency=afterok:<array job id> (see submit.sh).',
    `#SBATCH --job-name=${s.jobName}-gather`,
    '#SBATCH --ntasks=1',
    '#SBATCH --cpus-per-task=1',
    `#SBATCH --mem=${s.gatherMemMib}M`,
    ...common,
    `#SBATCH --output=${join(logDir, 'gather.log')}`,
    'set -euo pipefail',
    `${q(s.nodePath)} ${q(s.cliPath)} gather ${shardDirs.map(q).join(' ')} --out ${q(gatheredDir)}`,
    ...(s.report ? [`${q(s.nodePath)} ${q(s.cliPath)} report ${q(gatheredDir)}`] : []),
    '',
  ].join('\n');
  const submit = [
    '#!/bin/bash',
    '# Submit the shards as a job array, then the gather job, which runs only if every shard succeeded',
    '# (afterok; --kill-on-invalid-dep cancels it when a shard fails instead of leaving it pending).',
    'set -euo pipefail',
    `cd ${q(dir)}`,
    'array=$(sbatch --parsable sweep-array.sh)',
    'array=${array%%;*}',
    'gather=$(sbatch --parsable --dependency=afterok:$array --kill-on-invalid-dep=yes gather.sh)',
    'gather=${gather%%;*}',
    'echo "array job $array, gather job $gather"',
    '',
  ].join('\n');
  return {
    dir, logDir, shardDirs, gatheredDir,
    files: { array: join(dir, 'sweep-array.sh'), gather: join(dir, 'gather.sh'), submit: join(dir, 'submit.sh') },
    text: { array, gather, submit },
  };
}
