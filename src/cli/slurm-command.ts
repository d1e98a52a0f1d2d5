import { chmodSync, mkdirSync } from 'node:fs';
import { basename, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Command } from 'commander';
import { findExecutable } from '../cluster/find-executable.js';
import { slurmScripts } from '../cluster/slurm-scripts.js';
import { taskMemory, type StudyMemoryInput } from '../cluster/slurm-task-memory.js';
import { submitSlurmJobs } from '../cluster/submit-slurm-jobs.js';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { readNiftiHeaderFacts } from '../io/read-nifti-header-facts.js';
import { planSweep } from '../sweep/plan.js';
import { readSweepSpec } from '../sweep/read-sweep-spec.js';
import { studyRunPaths } from '../sweep/study-run-paths.js';
import { positiveInt, withExitCodes } from './cli-common.js';

interface SlurmCliOptions {
  spec: string;
  out: string;
  shards: number;
  workers: number;
  time?: string;
  partition?: string;
  submit?: boolean;
  report: boolean;
  mask?: string;
  maskValues?: string;
  placement?: string;
  placementValues?: string;
  exclude?: string;
  excludeAbove?: string;
  excludeGrow?: string;
}

/** Memory for the gather job: it reads the shards' tables, never the run. */
const GATHER_MEM_MIB = 2048;

/**
 * `boldsweep slurm <run> --spec <file> --out <dir> --shards N [--submit]`: write a Slurm job-array
 * script (one shard per task, memory derived from the run's size), a gather script that runs after
 * the array succeeded (afterok), and submit.sh; with --submit, submit both and print the job ids.
 * @param program - the root command
 * @returns the new command
 * @example registerSlurmCommand(program)
 */
export function registerSlurmCommand(program: Command): Command {
  return withExitCodes(program.command('slurm'))
    .description('Write Slurm scripts that run a sweep as a job array of shards and gather them (afterok); --submit submits both.')
    .argument('<run>', 'the 4D NIfTI run (.nii or .nii.gz), on a file system the cluster nodes share')
    .requiredOption('--spec <file>', 'sweep spec, JSON (.json) or YAML (.yaml, .yml)')
    .requiredOption('--out <dir>', 'folder for slurm/ (scripts, logs), shards/ (one folder per shard) and gathered/ (the merged sweep)')
    .requiredOption('--shards <n>', 'number of array tasks; at most the number of planting groups (plant conditions x repeats)', positiveInt)
    .option('--workers <n>', 'worker threads (and CPUs) per task', positiveInt, 1)
    .option('--time <limit>', 'wall-time limit per task as sbatch takes it, e.g. 02:00:00 (default: the partition\'s)')
    .option('--partition <name>', 'Slurm partition (default: the cluster\'s default)')
    .option('--submit', 'submit the array and the gather job with sbatch and print their job ids')
    .option('--no-report', 'the gather job merges only (no "boldsweep report")')
    .option('--mask <file>', 'brain mask image on the run\'s grid, passed to every shard')
    .option('--mask-values <list>', 'values of --mask that count as brain')
    .option('--placement <file>', 'image where planted blobs may be centred, passed to every shard')
    .option('--placement-values <list>', 'values of --placement that allow a blob centre')
    .option('--exclude <file>', 'known-activation image, passed to every shard')
    .option('--exclude-above <value>', 'voxels of --exclude above this value are excluded')
    .option('--exclude-grow <voxels>', 'grow the --exclude region by this many voxels')
    .addHelpText('after', `
Example:
  boldsweep slurm sub-01_task-motor_bold.nii.gz --spec smoothing.yaml --out sweeps/smoothing --shards 8 --submit
  # later, when the gather job has finished:
  boldsweep report sweeps/smoothing/gathered   (already done by the gather job unless --no-report)`)
    .action(async (runArg: string, o: SlurmCliOptions) => {
      const runPath = resolve(runArg);
      // before anything is written: --submit without sbatch is a mistake of where this runs
      const sbatch = o.submit ? findExecutable('sbatch') : null;
      if (o.submit && !sbatch) fail('SBATCH_MISSING', '--submit needs sbatch, and it is not on PATH; nothing was written');
      const spec = readSweepSpec(o.spec);
      const { header, compressed, fileBytes } = await readNiftiHeaderFacts(runPath);
      const [nx, ny, nz, nt] = header.dims4;
      if (nt < 2) fail('NOT_4D', `${runPath} has ${nt} volume(s)`, { file: runPath });
      // group and cell counts depend on the spec alone; the hashes only name cache entries
      const plan = planSweep(spec, { runHash: '', contextHash: '' });
      if (o.shards > plan.groups.length) {
        fail('TOO_MANY_SHARDS', `--shards ${o.shards} is more than the ${plan.groups.length} planting groups of this spec (${plan.cells.length} cells; a shard runs whole groups); use --shards ${plan.groups.length} or fewer`);
      }
      // a study's further runs are opened by every task: their headers give their sizes
      let study: StudyMemoryInput | undefined;
      if (spec.study) {
        const others = [];
        for (const p of studyRunPaths(spec.study.runs, o.spec, runPath)) others.push((await readNiftiHeaderFacts(p)).header.dims4);
        const cellsPerGroup = new Map<number, number>();
        for (const c of plan.cells) cellsPerGroup.set(c.group, (cellsPerGroup.get(c.group) ?? 0) + 1);
        study = {
          otherRunsVoxels4d: others.map(([a, b, c, d]) => a * b * c * d),
          largestVoxels3d: Math.max(nx * ny * nz, ...others.map(([a, b, c]) => a * b * c)),
          subjects: spec.study.subjects,
          settingsPerTask: Math.max(1, ...cellsPerGroup.values()),
        };
      }
      const mem = taskMemory({ voxels4d: nx * ny * nz * nt, voxels3d: nx * ny * nz, fileBytesPerVoxel: header.datatype.bytes, fileBytes, compressed, workers: o.workers, ...(study ? { study } : {}) });
      const sweepArgs: string[] = [];
      const fileOpt = (flag: string, v?: string) => { if (v !== undefined) sweepArgs.push(flag, resolve(v)); };
      const textOpt = (flag: string, v?: string) => { if (v !== undefined) sweepArgs.push(flag, v); };
      fileOpt('--mask', o.mask); textOpt('--mask-values', o.maskValues);
      fileOpt('--placement', o.placement); textOpt('--placement-values', o.placementValues);
      fileOpt('--exclude', o.exclude); textOpt('--exclude-above', o.excludeAbove); textOpt('--exclude-grow', o.excludeGrow);
      const outDir = resolve(o.out);
      const scripts = slurmScripts({
        jobName: `boldsweep-${basename(o.spec).replace(/\.(json|ya?ml)$/i, '').replace(/[^A-Za-z0-9_.-]/g, '_')}`,
        nodePath: process.execPath,
        cliPath: fileURLToPath(new URL('./main.js', import.meta.url)),
        runPath, specPath: resolve(o.spec), outDir,
        shards: o.shards, workers: o.workers, memMib: mem.requestMib, memLines: mem.lines, gatherMemMib: GATHER_MEM_MIB,
        time: o.time, partition: o.partition, sweepArgs, report: o.report,
      });
      mkdirSync(scripts.logDir, { recursive: true });
      for (const k of ['array', 'gather', 'submit'] as const) {
        await writeFileAtomic(scripts.files[k], scripts.text[k]);
        chmodSync(scripts.files[k], 0o755);
      }
      console.log(`${plan.cells.length} cells in ${plan.groups.length} planting groups -> ${o.shards} shards; run ${nx}x${ny}x${nz}x${nt} (${Math.ceil(mem.runMib)} MiB as float32); ${mem.requestMib} MiB and ${o.workers} CPU(s) per task`);
      console.log(`wrote ${scripts.files.array}, ${scripts.files.gather}, ${scripts.files.submit}`);
      if (!o.submit) {
        console.log(`submit with: bash ${scripts.files.submit}`);
        return;
      }
      const jobs = submitSlurmJobs(scripts, sbatch);
      console.log(`submitted array job ${jobs.arrayJobId} (${o.shards} tasks) and gather job ${jobs.gatherJobId} (afterok:${jobs.arrayJobId}); the merged sweep goes to ${scripts.gatheredDir}`);
    });
}
