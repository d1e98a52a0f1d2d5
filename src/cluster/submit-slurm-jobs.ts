import { spawnSync } from 'node:child_process';
import { fail } from '../core/fail.js';
import { findExecutable } from './find-executable.js';
import type { SlurmScripts } from './slurm-scripts.js';

/** Job ids the scheduler gave the two submissions. */
export interface SubmittedJobs {
  arrayJobId: string;
  gatherJobId: string;
}

/**
 * Submit the job array with `sbatch`, then the gather job with `--dependency=afterok:<array id>`
 * (and `--kill-on-invalid-dep=yes`, so a failed shard cancels it instead of leaving it pending).
 * @param scripts - written scripts (from slurmScripts, already on disk)
 * @param sbatch - the sbatch executable (default: found on PATH)
 * @returns both job ids
 * @throws BoldsweepError SBATCH_MISSING when sbatch is not on PATH; SBATCH_FAILED when it refuses a script
 * @example const { arrayJobId, gatherJobId } = submitSlurmJobs(scripts)
 */
export function submitSlurmJobs(scripts: SlurmScripts, sbatch: string | null = findExecutable('sbatch')): SubmittedJobs {
  if (!sbatch) fail('SBATCH_MISSING', `--submit needs sbatch, and it is not on PATH; the scripts are written in ${scripts.dir}`);
  const arrayJobId = runSbatch(sbatch, ['--parsable', scripts.files.array], scripts.dir);
  const gatherJobId = runSbatch(sbatch, ['--parsable', `--dependency=afterok:${arrayJobId}`, '--kill-on-invalid-dep=yes', scripts.files.gather], scripts.dir);
  return { arrayJobId, gatherJobId };
}

function runSbatch(sbatch: string, args: string[], cwd: string): string {
  const r = spawnSync(sbatch, args, { cwd, encoding: 'utf8', timeout: 120_000 });
  const said = `${r.stdout ?? ''}${r.stderr ?? ''}`.trim();
  if (r.error || r.status !== 0) fail('SBATCH_FAILED', `sbatch ${args.join(' ')} failed (${r.error?.message ?? `exit ${r.status}`})${said ? `: ${said}` : ''}`);
  // --parsable prints "<id>" or "<id>;<cluster>"
  const id = (r.stdout ?? '').trim().split(/\r?\n/).pop()?.split(';')[0] ?? '';
  if (!/^\d+$/.test(id)) fail('SBATCH_FAILED', `sbatch ${args.join(' ')} printed no job id: ${said}`);
  return id;
}
