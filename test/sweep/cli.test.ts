import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resolvePhantomSpec, simulatePhantomRun, writePhantomRun } from '../../src/simulate/index.js';

// The command line over the built package (npm test builds first): sweep in two shards, gather,
// report; and the documented exit codes.
const cli = join(process.cwd(), 'dist', 'src', 'cli', 'main.js');
let dir: string;
let bold: string;
let tissue: string;

function boldsweep(...args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', cwd: dir });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'boldsweep-cli-'));
  const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 60, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 8, anatomy: { supersample: 1 } }));
  const files = await writePhantomRun(join(dir, 'data'), sim, 'sub-c01_task-flicker');
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
  writeFileSync(join(dir, 'bad.yaml'), 'recipe:\n  - step: sharpen\nplant: { sizesFwhmMm: [8], amplitudesPct: [1], count: 1 }\nrepeats: 1\nthreshold: { kind: fdr }\nseed: 1\n');
});
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

describe('boldsweep sweep / gather / report', () => {
  it('runs a sharded sweep, gathers it and writes the report', () => {
    const common = ['--spec', 'spec.yaml', '--placement', tissue, '--placement-values', '3', '--no-progress'];
    const a = boldsweep('sweep', bold, ...common, '--out', 'shard1', '--shard', '1/2', '--workers', '1');
    expect(a.status, a.stderr).toBe(0);
    const b = boldsweep('sweep', bold, ...common, '--out', 'shard2', '--shard', '2/2', '--workers', '1');
    expect(b.status, b.stderr).toBe(0);
    const whole = boldsweep('sweep', bold, ...common, '--out', 'whole');
    expect(whole.status, whole.stderr).toBe(0);
    const g = boldsweep('gather', 'shard1', 'shard2', '--out', 'gathered');
    expect(g.status, g.stderr).toBe(0);
    expect(g.stdout).toContain('gathered 4 of 4 cells');
    expect(readFileSync(join(dir, 'gathered', 'scorecard.tsv'), 'utf8')).toBe(readFileSync(join(dir, 'whole', 'scorecard.tsv'), 'utf8'));
    const r = boldsweep('report', 'gathered');
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/Use smoothing FWHM \d+ mm/);
    for (const f of ['report.html', 'methods.md', 'decision-record.json']) expect(existsSync(join(dir, 'gathered', f))).toBe(true);
  });

  it('exits 2 on bad input and 0 for help', () => {
    const bad = boldsweep('sweep', bold, '--spec', 'bad.yaml', '--out', 'x', '--no-progress');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('UNKNOWN_STEP');
    expect(boldsweep('sweep', bold, '--out', 'x').status).toBe(2); // --spec missing
    expect(boldsweep('sweep', bold, '--spec', 'spec.yaml', '--out', 'x', '--workers', 'two').status).toBe(2);
    expect(boldsweep('report', 'no-such-folder').status).toBe(2);
    expect(boldsweep('gather', 'shard1', '--out', 'partial').status).toBe(2); // cells missing
    const help = boldsweep('sweep', '--help');
    expect(help.status).toBe(0);
    expect(help.stdout).toContain('Exit codes');
    expect(boldsweep('demo', '--help').status).toBe(0);
  });
});
