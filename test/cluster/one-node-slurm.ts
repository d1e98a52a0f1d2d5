// A throw-away one-node Slurm cluster for tests: munged, slurmctld and slurmd started as root from
// Debian's slurm-wlm and munge, every file (key, sockets, state, logs, pid files) in one temp
// folder, ports picked free, nothing system-wide touched. stop() ends exactly the daemons it
// started, by the pids in their pid files. Container-friendly settings: proctrack/linuxproc,
// task/none, select/cons_tres with CR_Core; the node's CPUs and memory come from `slurmd -C`.
import { spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { cpus, hostname, totalmem, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';

/** The daemons and client commands a one-node cluster needs (absolute paths). */
export interface SlurmExecutables {
  munged: string;
  slurmctld: string;
  slurmd: string;
  sbatch: string;
}

/** A running one-node cluster. */
export interface OneNodeSlurm {
  dir: string;
  /** Environment for clients (sbatch, squeue, scontrol): SLURM_CONF points at this cluster. */
  env: NodeJS.ProcessEnv;
  /** Run a client command that lives beside sbatch (scontrol, squeue, scancel, sinfo). */
  client: (name: string, args: string[]) => { status: number | null; stdout: string; stderr: string };
  /** The daemons' log files, for a failure message. */
  logs: () => string;
  /** Stop the daemons this cluster started (pid files), then remove its folder. Safe to call twice. */
  stop: () => Promise<void>;
}

const DAEMONS = ['slurmd', 'slurmctld', 'munged'] as const;
const START_TIMEOUT_MS = 30_000;

/**
 * Start munged, slurmctld and slurmd in a fresh temp folder and wait until the node is idle.
 * On any failure the daemons already started are stopped before the error is thrown.
 * @param exe - absolute paths of the daemons and sbatch
 * @returns the running cluster
 * @example const cluster = await startOneNodeSlurm(exe); try { ... } finally { await cluster.stop(); }
 */
export async function startOneNodeSlurm(exe: SlurmExecutables): Promise<OneNodeSlurm> {
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-slurm-'));
  // munged requires every folder on its socket's path to be searchable by all
  chmodSync(dir, 0o755);
  const binDir = dirname(exe.sbatch);
  const conf = join(dir, 'slurm.conf');
  const env = { ...process.env, SLURM_CONF: conf };
  let stopped = false;
  const cluster: OneNodeSlurm = {
    dir, env,
    client: (name, args) => {
      const r = spawnSync(join(binDir, name), args, { env, encoding: 'utf8', timeout: 30_000 });
      return { status: r.status, stdout: r.stdout ?? '', stderr: `${r.stderr ?? ''}${r.error ? r.error.message : ''}` };
    },
    logs: () => ['munged.log', 'slurmctld.log', 'slurmd.log'].map((f) => {
      const p = join(dir, f);
      return `--- ${f}\n${existsSync(p) ? readFileSync(p, 'utf8').split('\n').slice(-25).join('\n') : '(none)'}`;
    }).join('\n'),
    stop: async () => {
      if (stopped) return;
      stopped = true;
      for (const d of DAEMONS) await stopByPidFile(join(dir, `${d}.pid`));
      rmSync(dir, { recursive: true, force: true });
    },
  };
  try {
    writeFileSync(join(dir, 'munge.key'), randomBytes(1024), { mode: 0o400 });
    mkdirSync(join(dir, 'state'));
    mkdirSync(join(dir, 'spool'));
    run(exe.munged, [`--key-file=${join(dir, 'munge.key')}`, `--socket=${join(dir, 'munge.socket')}`, `--pid-file=${join(dir, 'munged.pid')}`,
      `--log-file=${join(dir, 'munged.log')}`, `--seed-file=${join(dir, 'munged.seed')}`], env);
    const node = nodeFacts(exe.slurmd);
    const [ctldPort, slurmdPort] = [await freePort(), await freePort()];
    writeFileSync(conf, slurmConf(dir, node, ctldPort, slurmdPort));
    run(exe.slurmctld, ['-f', conf], env);
    run(exe.slurmd, ['-f', conf, '-N', node.name], env);
    const deadline = Date.now() + START_TIMEOUT_MS;
    for (;;) {
      const s = cluster.client('sinfo', ['-h', '-o', '%t']);
      if (s.status === 0 && /^idle/m.test(s.stdout)) break;
      if (Date.now() > deadline) throw new Error(`the node did not become idle within ${START_TIMEOUT_MS / 1000} s (sinfo: ${s.stdout}${s.stderr})\n${cluster.logs()}`);
      await sleep(500);
    }
    return cluster;
  } catch (e) {
    await cluster.stop();
    throw e;
  }
}

/** Node name, CPUs and memory as slurmd sees this machine (fallback: Node's view). */
function nodeFacts(slurmd: string): { name: string; cpus: number; memMb: number } {
  const name = hostname().split('.')[0] || 'localhost';
  const r = spawnSync(slurmd, ['-C'], { encoding: 'utf8', timeout: 30_000 });
  const cpusSeen = Number(/\bCPUs=(\d+)/.exec(r.stdout ?? '')?.[1]);
  const memSeen = Number(/\bRealMemory=(\d+)/.exec(r.stdout ?? '')?.[1]);
  return {
    name,
    cpus: cpusSeen > 0 ? cpusSeen : cpus().length,
    memMb: memSeen > 0 ? memSeen : Math.floor(totalmem() / 2 ** 20),
  };
}

function slurmConf(dir: string, node: { name: string; cpus: number; memMb: number }, ctldPort: number, slurmdPort: number): string {
  return [
    'ClusterName=boldsweeptest',
    `SlurmctldHost=${node.name}(127.0.0.1)`,
    `SlurmctldPort=${ctldPort}`,
    `SlurmdPort=${slurmdPort}`,
    'SlurmUser=root',
    'SlurmdUser=root',
    'AuthType=auth/munge',
    'CredType=cred/munge',
    `AuthInfo=socket=${join(dir, 'munge.socket')}`,
    `StateSaveLocation=${join(dir, 'state')}`,
    `SlurmdSpoolDir=${join(dir, 'spool')}`,
    `SlurmctldPidFile=${join(dir, 'slurmctld.pid')}`,
    `SlurmdPidFile=${join(dir, 'slurmd.pid')}`,
    `SlurmctldLogFile=${join(dir, 'slurmctld.log')}`,
    `SlurmdLogFile=${join(dir, 'slurmd.log')}`,
    // a container has no cgroup control: track processes by parent pid, bind nothing
    'ProctrackType=proctrack/linuxproc',
    'TaskPlugin=task/none',
    'SelectType=select/cons_tres',
    'SelectTypeParameters=CR_Core',
    'JobAcctGatherType=jobacct_gather/none',
    'AccountingStorageType=accounting_storage/none',
    'JobCompType=jobcomp/none',
    'MpiDefault=none',
    'ReturnToService=2',
    'MinJobAge=600',
    `NodeName=${node.name} NodeAddr=127.0.0.1 CPUs=${node.cpus} RealMemory=${node.memMb} State=UNKNOWN`,
    `PartitionName=boldsweep Nodes=${node.name} Default=YES MaxTime=INFINITE State=UP`,
    '',
  ].join('\n');
}

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv): void {
  // each daemon forks into the background and its starting process exits
  const r = spawnSync(cmd, args, { env, encoding: 'utf8', timeout: START_TIMEOUT_MS });
  if (r.error || r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed (${r.error?.message ?? `exit ${r.status}`}): ${r.stdout}${r.stderr}`);
}

async function stopByPidFile(pidFile: string): Promise<void> {
  if (!existsSync(pidFile)) return;
  const pid = Number(readFileSync(pidFile, 'utf8').trim());
  if (!(pid > 1)) return;
  if (!alive(pid)) return;
  process.kill(pid, 'SIGTERM');
  for (let i = 0; i < 50 && alive(pid); i++) await sleep(200);
  if (alive(pid)) process.kill(pid, 'SIGKILL');
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolvePort(port));
    });
  });
}

function sleep(ms: number): Promise<void> {
  return new Promise((r) => setTimeout(r, ms));
}
