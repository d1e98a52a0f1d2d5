import { spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { shellQuote } from '../../src/cluster/shell-quote.js';
import { slurmScripts } from '../../src/cluster/slurm-scripts.js';
import { taskMemory } from '../../src/cluster/slurm-task-memory.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { readNiftiHeaderFacts } from '../../src/io/read-nifti-header-facts.js';
import { resolvePhantomSpec, simulatePhantomRun, writePhantomRun } from '../../src/simulate/index.js';

// `boldsweep slurm` without a scheduler: the scripts it writes, the memory it asks for, and its
// typed errors (too many shards, --submit without sbatch, gathering shards of another sweep).
// The real job-array run is test/cluster/slurm.test.ts.
const cli = join(process.cwd(), 'dist', 'src', 'cli', 'main.js');
let dir = '';
let bold = '';

function boldsweep(args: string[], env: NodeJS.ProcessEnv = process.env): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', cwd: dir, env, timeout: 120_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

const spec = (seed: number) => [
  'recipe:', '  - step: drop-initial-volumes', '    params: { count: 3 }', '  - step: smooth', '    params: { fwhmMm: 0 }',
  'vary:', '  smooth.fwhmMm: [0, 8]', 'plant: { sizesFwhmMm: [10], amplitudesPct: [3], count: 2, marginMm: 0 }',
  'repeats: 2', 'threshold: { kind: fwe-rft, alpha: 0.05 }', `seed: ${seed}`,
].join('\n');

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'boldsweep-slurm-cmd-'));
  const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 40, dims: [24, 28, 20], spacingMm: [5, 5, 5], activation: null, seed: 3, anatomy: { supersample: 1 } }));
  bold = (await writePhantomRun(join(dir, 'data'), sim, 'sub-s02_task-flicker')).bold;
  writeFileSync(join(dir, 'spec.yaml'), spec(5));
  writeFileSync(join(dir, 'other.yaml'), spec(6));
});
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

describe('taskMemory', () => {
  it('full-size 2 mm multiband run (104x104x72x600 float32, one worker): terms and request by hand', () => {
    const m = taskMemory({ voxels4d: 104 * 104 * 72 * 600, voxels3d: 104 * 104 * 72, fileBytesPerVoxel: 4, fileBytes: 104 * 104 * 72 * 600 * 4 + 352, compressed: false, workers: 1 });
    // 467,251,200 voxel-volumes x 4 bytes = 1,869,004,800 bytes = 1782.42 MiB
    expect(m.runMib).toBeCloseTo(1782.4219, 3);
    // sweep: 200 + 64 + 2 x 1782.42 + 778,752 x 256 B (190.13 MiB) = 4019.0 MiB; x 1.25 = 5023.7 -> 5120 (20 x 256)
    expect(m.sweepMib).toBeCloseTo(200 + 64 + 2 * 1782.4219 + 190.125, 2);
    expect(m.requestMib).toBe(5120);
    expect(m.lines.join('\n')).toContain('1 run-sized work array(s), one per worker');
  });
  it('a .nii.gz opens with the run alone (it is inflated in pieces straight into the run); more workers add a run each', () => {
    const base = { voxels4d: 1e8, voxels3d: 1e6, fileBytesPerVoxel: 2, fileBytes: 1e8, compressed: true, workers: 1 };
    const one = taskMemory(base);
    // opening: 200 + 381.47 (float32 run, read into shared memory); neither the file nor its int16 bytes are held whole
    expect(one.openMib).toBeCloseTo(200 + 4e8 / 2 ** 20, 6);
    expect(taskMemory({ ...base, compressed: false }).openMib).toBe(one.openMib);
    const two = taskMemory({ ...base, workers: 2 });
    expect(two.sweepMib - one.sweepMib).toBeCloseTo(64 + 4e8 / 2 ** 20 + 256e6 / 2 ** 20, 6);
  });
  it('a study adds its further runs, a second run-sized array per worker and every subject\'s effect map per setting, by hand', () => {
    // the demo study bench's set-up: the demo run (44x52x34x150), subjects cycling through it, 12 subjects x 24 settings, 2 workers
    const v3 = 44 * 52 * 34;
    const m = taskMemory({ voxels4d: v3 * 150, voxels3d: v3, fileBytesPerVoxel: 2, fileBytes: 1.4e7, compressed: true, workers: 2, study: { otherRunsVoxels4d: [], largestVoxels3d: v3, subjects: 12, settingsPerTask: 24 } });
    const run = (v3 * 150 * 4) / 2 ** 20; // 44.51 MiB
    // 200 + 2 x 64 + run + 2 x 2 runs + 2 x 77,792 x 256 B (37.98 MiB) + 2 x 24 x 12 x 77,792 x 4 B (170.93 MiB) = 759.48 MiB
    expect(m.sweepMib).toBeCloseTo(200 + 128 + 5 * run + (2 * v3 * 256) / 2 ** 20 + (2 * 24 * 12 * v3 * 4) / 2 ** 20, 6);
    expect(m.sweepMib).toBeCloseTo(759.48, 2);
    // measured on that bench: 469 MB (447 MiB) peak resident, under the estimate
    expect(m.sweepMib).toBeGreaterThan(469e6 / 2 ** 20);
    // further study runs are held once each; the largest sets the work arrays
    const two = taskMemory({ voxels4d: v3 * 150, voxels3d: v3, fileBytesPerVoxel: 2, fileBytes: 1.4e7, compressed: true, workers: 1, study: { otherRunsVoxels4d: [v3 * 150, v3 * 300], largestVoxels3d: v3, subjects: 12, settingsPerTask: 1 } });
    expect(two.openMib).toBeCloseTo(200 + 4 * run, 6);
    expect(two.sweepMib).toBeCloseTo(200 + 64 + 4 * run + 2 * (2 * run) + (v3 * 256) / 2 ** 20 + (12 * v3 * 4) / 2 ** 20, 6);
    expect(two.lines.join('\n')).toContain('2 study run(s)');
  });
  it('INVALID_ARGUMENT for zero workers', () => {
    let err: unknown;
    try { taskMemory({ voxels4d: 1, voxels3d: 1, fileBytesPerVoxel: 4, fileBytes: 1, compressed: false, workers: 0 }); } catch (e) { err = e; }
    expect(isBoldsweepError(err, 'INVALID_ARGUMENT')).toBe(true);
  });
});

describe('slurmScripts and shellQuote', () => {
  it('quotes words for a POSIX shell', () => {
    expect(shellQuote('/data/sub-01_bold.nii.gz')).toBe('/data/sub-01_bold.nii.gz');
    expect(shellQuote("it's here")).toBe(`'it'\\''s here'`);
  });
  it('refuses relative paths (tasks run in another folder)', () => {
    let err: unknown;
    try { slurmScripts({ jobName: 'x', nodePath: 'node', cliPath: '/a', runPath: '/r', specPath: '/s', outDir: '/o', shards: 2, workers: 1, memMib: 512, memLines: [], gatherMemMib: 512, sweepArgs: [], report: false }); } catch (e) { err = e; }
    expect(isBoldsweepError(err, 'INVALID_ARGUMENT')).toBe(true);
  });
});

describe('boldsweep slurm (no scheduler needed)', () => {
  it('reads only the header of a .nii.gz run', async () => {
    const h = await readNiftiHeaderFacts(bold);
    expect(h.compressed).toBe(true);
    expect(h.header.dims4).toEqual([24, 28, 20, 40]);
  });

  it('writes the array, gather and submit scripts with the stated memory, one worker per task', async () => {
    const r = boldsweep(['slurm', bold, '--spec', 'spec.yaml', '--out', 'plan', '--shards', '2', '--time', '00:30:00']);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toContain('4 cells in 2 planting groups -> 2 shards');
    const h = await readNiftiHeaderFacts(bold);
    const mem = taskMemory({ voxels4d: 24 * 28 * 20 * 40, voxels3d: 24 * 28 * 20, fileBytesPerVoxel: h.header.datatype.bytes, fileBytes: h.fileBytes, compressed: true, workers: 1 });
    const array = readFileSync(join(dir, 'plan', 'slurm', 'sweep-array.sh'), 'utf8');
    expect(array).toContain('#SBATCH --array=1-2');
    expect(array).toContain('#SBATCH --cpus-per-task=1');
    expect(array).toContain(`#SBATCH --mem=${mem.requestMib}M`);
    expect(array).toContain('#SBATCH --time=00:30:00');
    expect(array).toContain('--shard "$i/$N" --workers 1');
    for (const line of mem.lines) expect(array).toContain(line);
    const gather = readFileSync(join(dir, 'plan', 'slurm', 'gather.sh'), 'utf8');
    expect(gather).toContain(`gather ${join(dir, 'plan', 'shards', 'shard-1')} ${join(dir, 'plan', 'shards', 'shard-2')} --out ${join(dir, 'plan', 'gathered')}`);
    expect(gather).toContain(`report ${join(dir, 'plan', 'gathered')}`);
    const submit = readFileSync(join(dir, 'plan', 'slurm', 'submit.sh'), 'utf8');
    expect(submit).toContain('--dependency=afterok:$array');
  });

  it('a study spec: the memory request counts the study\'s runs and subject maps', async () => {
    copyFileSync(bold, join(dir, 'data', 'sub-s03_task-flicker_bold.nii.gz'));
    writeFileSync(join(dir, 'study.yaml'), [spec(7), 'study: { subjects: 6, runs: [data/sub-s03_task-flicker_bold.nii.gz] }'].join('\n'));
    const r = boldsweep(['slurm', bold, '--spec', 'study.yaml', '--out', 'study-plan', '--shards', '2']);
    expect(r.status, r.stderr).toBe(0);
    const h = await readNiftiHeaderFacts(bold);
    const v3 = 24 * 28 * 20;
    const mem = taskMemory({ voxels4d: v3 * 40, voxels3d: v3, fileBytesPerVoxel: h.header.datatype.bytes, fileBytes: h.fileBytes, compressed: true, workers: 1, study: { otherRunsVoxels4d: [v3 * 40], largestVoxels3d: v3, subjects: 6, settingsPerTask: 2 } });
    const array = readFileSync(join(dir, 'study-plan', 'slurm', 'sweep-array.sh'), 'utf8');
    expect(array).toContain(`#SBATCH --mem=${mem.requestMib}M`);
    for (const line of mem.lines) expect(array).toContain(line);
    expect(array).toContain('1 study run(s)');
  });

  it('TOO_MANY_SHARDS when --shards exceeds the planting groups; nothing written', () => {
    const r = boldsweep(['slurm', bold, '--spec', 'spec.yaml', '--out', 'too-many', '--shards', '5']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('TOO_MANY_SHARDS');
    expect(r.stderr).toContain('use --shards 2 or fewer');
    expect(existsSync(join(dir, 'too-many'))).toBe(false);
  });

  it('SBATCH_MISSING for --submit where sbatch is not on PATH; nothing written', () => {
    const r = boldsweep(['slurm', bold, '--spec', 'spec.yaml', '--out', 'no-sbatch', '--shards', '2', '--submit'], { ...process.env, PATH: dirname(process.execPath) === '/usr/bin' ? '/nonexistent' : dirname(process.execPath) });
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('SBATCH_MISSING');
    expect(r.stderr).toContain('leave out --submit');
    expect(existsSync(join(dir, 'no-sbatch'))).toBe(false);
  });

  it('SHARD_SWEEP_MISMATCH when gather gets a shard folder of another spec', () => {
    const a = boldsweep(['sweep', bold, '--spec', 'spec.yaml', '--out', 'mine-1', '--shard', '1/2', '--workers', '1', '--no-progress']);
    expect(a.status, a.stderr).toBe(0);
    const b = boldsweep(['sweep', bold, '--spec', 'other.yaml', '--out', 'other-2', '--shard', '2/2', '--workers', '1', '--no-progress']);
    expect(b.status, b.stderr).toBe(0);
    const g = boldsweep(['gather', 'mine-1', 'other-2', '--out', 'mixed']);
    expect(g.status).toBe(2);
    expect(g.stderr).toContain('SHARD_SWEEP_MISMATCH');
    expect(g.stderr).toContain('Gather only the shard folders of one sweep');
  });
});
