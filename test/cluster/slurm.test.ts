import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resolvePhantomSpec, simulatePhantomRun, writePhantomRun } from '../../src/simulate/index.js';
import { findSlurm } from '../find-tool.js';
import { startOneNodeSlurm, type OneNodeSlurm } from './one-node-slurm.js';

// The job-array path on a real Slurm (Debian's slurm-wlm and munge): a one-node cluster started
// for this file, `boldsweep slurm --submit` with two shards, and the gathered scorecard compared
// byte for byte with the one-machine run. Starting the daemons needs root; elsewhere it skips.
const SLURM = findSlurm();
const IS_ROOT = typeof process.getuid === 'function' && process.getuid() === 0;
if (SLURM.exe && !IS_ROOT) console.warn('skipping the Slurm job-array check: starting slurmctld, slurmd and munged for a test cluster needs root');
/** Longest wait for the gather job (the sweep below takes a few seconds per shard). */
const JOB_TIMEOUT_MS = 150_000;
const FINAL_STATES = /^(COMPLETED|FAILED|CANCELLED|TIMEOUT|OUT_OF_MEMORY|NODE_FAIL|PREEMPTED|BOOT_FAIL|DEADLINE)/;

const cli = join(process.cwd(), 'dist', 'src', 'cli', 'main.js');
let dir = '';
let cluster: OneNodeSlurm | null = null;
const jobIds: string[] = [];

function boldsweep(args: string[], env: NodeJS.ProcessEnv = process.env): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', cwd: dir, env, timeout: 120_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe.skipIf(!SLURM.exe || !IS_ROOT)('boldsweep slurm --submit on a one-node Slurm', () => {
  let bold = '';
  let tissue = '';

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'boldsweep-slurm-run-'));
    const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 60, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 8, anatomy: { supersample: 1 } }));
    const files = await writePhantomRun(join(dir, 'data'), sim, 'sub-s01_task-flicker');
    bold = files.bold;
    tissue = files.tissue;
    writeFileSync(join(dir, 'spec.yaml'), [
      'recipe:',
      '  - step: drop-initial-volumes',
      '    params: { count: 3 }',
      '  - step: smooth',
      '    params: { fwhmMm: 0 }',
      'vary:',
      '  smooth.fwhmMm: [0, 8]',
      'plant: { sizesFwhmMm: [10], amplitudesPct: [3], count: 2, marginMm: 0 }',
      'repeats: 2',
      'threshold: { kind: fwe-rft, alpha: 0.05 }',
      'seed: 5',
    ].join('\n'));
    cluster = await startOneNodeSlurm(SLURM.exe!);
  }, 120_000);

  afterAll(async () => {
    // cancel anything still queued or running, then stop exactly the daemons started above
    if (cluster && jobIds.length) cluster.client('scancel', jobIds);
    await cluster?.stop();
    if (dir) rmSync(dir, { recursive: true, force: true });
  }, 60_000);

  it('runs the shards as a job array, gathers after them (afterok), and matches the one-machine scorecard byte for byte', async () => {
    const placement = ['--placement', tissue, '--placement-values', '3'];
    const whole = boldsweep(['sweep', bold, '--spec', 'spec.yaml', '--out', 'whole', '--workers', '1', '--no-progress', ...placement]);
    expect(whole.status, whole.stderr).toBe(0);

    const sub = boldsweep(['slurm', bold, '--spec', 'spec.yaml', '--out', 'cluster', '--shards', '2', '--submit', ...placement], cluster!.env);
    expect(sub.status, `${sub.stdout}${sub.stderr}\n${cluster!.logs()}`).toBe(0);
    const ids = /array job (\d+) .* gather job (\d+) \(afterok:(\d+)\)/.exec(sub.stdout);
    expect(ids, sub.stdout).not.toBeNull();
    const [, arrayId, gatherId, dependsOn] = ids!;
    jobIds.push(arrayId, gatherId);
    expect(dependsOn).toBe(arrayId);
    const arrayScript = readFileSync(join(dir, 'cluster', 'slurm', 'sweep-array.sh'), 'utf8');
    expect(arrayScript).toContain('#SBATCH --array=1-2');
    expect(arrayScript).toContain('#SBATCH --cpus-per-task=1');

    // the scheduler holds the gather job until both array tasks have succeeded
    const deadline = Date.now() + JOB_TIMEOUT_MS;
    let state = '';
    for (;;) {
      const show = cluster!.client('scontrol', ['show', 'job', gatherId]);
      state = /JobState=(\S+)/.exec(show.stdout)?.[1] ?? `unknown (${show.stderr.trim()})`;
      if (FINAL_STATES.test(state)) break;
      if (Date.now() > deadline) break;
      await new Promise((r) => setTimeout(r, 1000));
    }
    const logDir = join(dir, 'cluster', 'slurm', 'logs');
    const logs = ['shard-1.log', 'shard-2.log', 'gather.log'].map((f) => `--- ${f}\n${existsSync(join(logDir, f)) ? readFileSync(join(logDir, f), 'utf8') : '(none)'}`).join('\n');
    expect(state, `gather job ${gatherId}\n${logs}\n${cluster!.logs()}`).toBe('COMPLETED');
    const array = cluster!.client('scontrol', ['show', 'job', arrayId]);
    for (const m of array.stdout.matchAll(/JobState=(\S+)/g)) expect(m[1], array.stdout).toBe('COMPLETED');

    const gathered = readFileSync(join(dir, 'cluster', 'gathered', 'scorecard.tsv'));
    const single = readFileSync(join(dir, 'whole', 'scorecard.tsv'));
    expect(gathered.equals(single), 'gathered scorecard differs from the one-machine scorecard').toBe(true);
    expect(existsSync(join(dir, 'cluster', 'gathered', 'report.html'))).toBe(true);
  }, JOB_TIMEOUT_MS + 60_000);
});
