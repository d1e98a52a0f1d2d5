// Finding the outside tools some tests compare against (Debian's nifti_tool, Chromium, python3 with
// scipy, Slurm, Jupyter, coreutils). A tool is looked up through its environment variable first, then
// on PATH; nothing is assumed at a fixed place, so `npm test` runs on a machine with Node and npm
// alone. A missing tool makes its tests skip with a printed reason, except under
// BOLDSWEEP_REQUIRE_TOOLS=1 (set by .ci/run), where it fails the test file so CI runs everything.
import { spawnSync } from 'node:child_process';
import { accessSync, constants, statSync } from 'node:fs';
import { delimiter, join } from 'node:path';

/** What a test needs from outside the project. */
export type ToolName = 'nifti_tool' | 'chromium' | 'python3-scipy' | 'slurm' | 'jupyter' | 'sha256sum';

/** A tool looked up: its executable when found, else why it is not usable (printed when tests skip). */
export interface FoundTool {
  name: ToolName;
  /** Absolute path of the (main) executable, or null when missing. */
  path: string | null;
  /** Why the tool is missing, including how to provide it; empty when found. */
  reason: string;
}

interface ToolRecipe {
  envVar: string;
  executables: string[];
  debianPackages: string;
  /** Extra check once the executable is found (e.g. python3 can import scipy); returns a problem or ''. */
  check?: (path: string) => string;
}

const RECIPES: Record<ToolName, ToolRecipe> = {
  nifti_tool: { envVar: 'BOLDSWEEP_NIFTI_TOOL', executables: ['nifti_tool'], debianPackages: 'nifti-bin', check: (p) => runs(p, ['-ver']) },
  chromium: { envVar: 'BOLDSWEEP_CHROMIUM', executables: ['chromium', 'chromium-browser'], debianPackages: 'chromium' },
  'python3-scipy': {
    envVar: 'BOLDSWEEP_PYTHON', executables: ['python3'], debianPackages: 'python3-scipy python3-numpy',
    check: (p) => runs(p, ['-c', 'import scipy, numpy']),
  },
  // sbatch is the one a test calls; the daemons a test starts are looked up beside it with slurmTools()
  slurm: { envVar: 'BOLDSWEEP_SBATCH', executables: ['sbatch'], debianPackages: 'slurm-wlm munge' },
  jupyter: { envVar: 'BOLDSWEEP_JUPYTER', executables: ['jupyter'], debianPackages: 'jupyter-nbconvert python3-nbclient jupyter-client python3-ipykernel' },
  sha256sum: { envVar: 'BOLDSWEEP_SHA256SUM', executables: ['sha256sum'], debianPackages: 'coreutils' },
};

/** True when CI asked for every tool to be present (a missing tool then fails instead of skipping). */
export function toolsRequired(): boolean {
  return process.env.BOLDSWEEP_REQUIRE_TOOLS === '1';
}

/**
 * Look a tool up: `$<ENV_VAR>` if set (it must then be usable), else the first of its executable
 * names on PATH. Prints the reason when it is missing; throws when it is missing and
 * BOLDSWEEP_REQUIRE_TOOLS=1.
 * @param name - which tool
 * @returns the tool with its path, or with path null and the reason
 * @example const chromium = findTool('chromium'); describe.skipIf(!chromium.path)('in a browser', ...)
 */
export function findTool(name: ToolName): FoundTool {
  const recipe = RECIPES[name];
  const fromEnv = process.env[recipe.envVar];
  let path: string | null = null;
  let reason = '';
  if (fromEnv) {
    path = isExecutable(fromEnv) ? fromEnv : null;
    if (!path) reason = `${recipe.envVar}=${fromEnv} is not an executable file`;
  } else {
    path = onPath(recipe.executables);
    if (!path) reason = `${recipe.executables.join(' or ')} not found on PATH`;
  }
  if (path && recipe.check) {
    const problem = recipe.check(path);
    if (problem) { reason = `${path}: ${problem}`; path = null; }
  }
  if (path) return { name, path, reason: '' };
  reason += ` (install Debian's ${recipe.debianPackages}, or set ${recipe.envVar} to the executable)`;
  if (toolsRequired()) throw new Error(`BOLDSWEEP_REQUIRE_TOOLS=1 and ${name} is missing: ${reason}`);
  console.warn(`skipping the checks that need ${name}: ${reason}`);
  return { name, path: null, reason };
}

/**
 * The first of `names` found as an executable file in the folders of PATH (plus `extraDirs`).
 * @param names - executable names, in order of preference
 * @param extraDirs - folders searched after PATH (e.g. /usr/sbin for daemons)
 * @returns its absolute path, or null
 * @example onPath(['sbatch'])
 */
export function onPath(names: string[], extraDirs: string[] = []): string | null {
  const dirs = [...(process.env.PATH ?? '').split(delimiter).filter((d) => d.length > 0), ...extraDirs];
  for (const name of names) for (const dir of dirs) {
    const p = join(dir, name);
    if (isExecutable(p)) return p;
  }
  return null;
}

function isExecutable(p: string): boolean {
  try {
    if (!statSync(p).isFile()) return false;
    accessSync(p, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

function runs(path: string, args: string[]): string {
  const r = spawnSync(path, args, { encoding: 'utf8', timeout: 30_000 });
  if (r.status === 0) return '';
  return `\`${[path, ...args].join(' ')}\` failed (${r.error?.message ?? `exit ${r.status}`}${r.stderr ? `: ${r.stderr.trim().split('\n').pop()}` : ''})`;
}

/** The Slurm and munge executables a test cluster needs, found or not. */
export interface FoundSlurm {
  exe: { munged: string; slurmctld: string; slurmd: string; sbatch: string } | null;
  reason: string;
}

/**
 * Find sbatch (see findTool('slurm')) and the daemons munged, slurmctld and slurmd: in
 * `$BOLDSWEEP_SLURM_DAEMONS` (a folder) when set, else on PATH (Debian puts them in /usr/sbin).
 * Prints the reason and returns exe null when one is missing; throws under BOLDSWEEP_REQUIRE_TOOLS=1.
 * @returns the executables, or null and why
 * @example const slurm = findSlurm(); describe.skipIf(!slurm.exe)('on Slurm', ...)
 */
export function findSlurm(): FoundSlurm {
  const sbatch = findTool('slurm');
  if (!sbatch.path) return { exe: null, reason: sbatch.reason };
  const daemonDir = process.env.BOLDSWEEP_SLURM_DAEMONS;
  const find = (n: string) => (daemonDir ? (isExecutable(join(daemonDir, n)) ? join(daemonDir, n) : null) : onPath([n]));
  const munged = find('munged'), slurmctld = find('slurmctld'), slurmd = find('slurmd');
  if (munged && slurmctld && slurmd) return { exe: { munged, slurmctld, slurmd, sbatch: sbatch.path }, reason: '' };
  const missing = [['munged', munged], ['slurmctld', slurmctld], ['slurmd', slurmd]].filter(([, p]) => !p).map(([n]) => n).join(', ');
  const reason = `${missing} not found ${daemonDir ? `in BOLDSWEEP_SLURM_DAEMONS=${daemonDir}` : 'on PATH (add /usr/sbin)'} (install Debian's slurm-wlm munge, or set BOLDSWEEP_SLURM_DAEMONS to their folder)`;
  if (toolsRequired()) throw new Error(`BOLDSWEEP_REQUIRE_TOOLS=1 and the Slurm daemons are missing: ${reason}`);
  console.warn(`skipping the checks that need a Slurm cluster: ${reason}`);
  return { exe: null, reason };
}
