import { spawn } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
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
let otherBold: string;

// asynchronous, so the test worker stays responsive to vitest while a command runs
function boldsweep(...args: string[]): Promise<{ status: number | null; stdout: string; stderr: string }> {
  return new Promise((done, failed) => {
    const child = spawn(process.execPath, [cli, ...args], { cwd: dir });
    let stdout = '';
    let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (t: string) => { stdout += t; });
    child.stderr.setEncoding('utf8').on('data', (t: string) => { stderr += t; });
    child.on('error', failed);
    child.on('close', (status) => done({ status, stdout, stderr }));
  });
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'boldsweep-cli-'));
  const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 60, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 8, anatomy: { supersample: 1 } }));
  const files = await writePhantomRun(join(dir, 'data'), sim, 'sub-c01_task-flicker');
  bold = files.bold;
  tissue = files.tissue;
  const other = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 60, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 9, anatomy: { supersample: 1 } }));
  otherBold = (await writePhantomRun(join(dir, 'other'), other, 'sub-c02_task-flicker')).bold;
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
  it('runs a sharded sweep, gathers it and writes the report', async () => {
    const common = ['--spec', 'spec.yaml', '--placement', tissue, '--placement-values', '3', '--no-progress'];
    const a = await boldsweep('sweep', bold, ...common, '--out', 'shard1', '--shard', '1/2', '--workers', '1');
    expect(a.status, a.stderr).toBe(0);
    const b = await boldsweep('sweep', bold, ...common, '--out', 'shard2', '--shard', '2/2', '--workers', '1');
    expect(b.status, b.stderr).toBe(0);
    // without --no-progress and with stderr not a terminal: plain progress lines, as a cluster log shows them
    const whole = await boldsweep('sweep', bold, ...common.filter((a) => a !== '--no-progress'), '--out', 'whole');
    expect(whole.status, whole.stderr).toBe(0);
    expect(whole.stderr).toContain('sweep 4/4 cells (100 %)');
    expect(whole.stdout.trim().split('\n').pop()).toBe('next: boldsweep report whole');
    expect(a.stdout).toContain('next: when all 2 shards are done: boldsweep gather');
    // scorecard.tsv starts with its header; every column name is a plain identifier
    const header = readFileSync(join(dir, 'whole', 'scorecard.tsv'), 'utf8').split('\n')[0].split('\t');
    expect(header[0]).toBe('cell');
    expect(header).toContain('smooth_fwhmMm');
    for (const f of ['scorecard.tsv', 'timings.tsv', 'roc.tsv']) {
      for (const c of readFileSync(join(dir, 'whole', f), 'utf8').split('\n')[0].split('\t')) expect(c, f).toMatch(/^[A-Za-z][A-Za-z0-9_]*$/);
    }
    const g = await boldsweep('gather', 'shard1', 'shard2', '--out', 'gathered');
    expect(g.status, g.stderr).toBe(0);
    expect(g.stdout).toContain('gathered 4 of 4 cells');
    expect(readFileSync(join(dir, 'gathered', 'scorecard.tsv'), 'utf8')).toBe(readFileSync(join(dir, 'whole', 'scorecard.tsv'), 'utf8'));
    const r = await boldsweep('report', 'gathered');
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/Use smoothing FWHM \d+ mm/);
    // reports and records name the inputs by file, never by a local folder
    for (const f of ['decision-record.json', 'sweep.json', 'report.html', 'methods.md']) expect(readFileSync(join(dir, 'gathered', f), 'utf8')).not.toContain(dir);
    for (const f of ['report.html', 'methods.md', 'decision-record.json']) expect(existsSync(join(dir, 'gathered', f))).toBe(true);
  });

  it('exits 2 on bad input and 0 for help', async () => {
    const bad = await boldsweep('sweep', bold, '--spec', 'bad.yaml', '--out', 'x', '--no-progress');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('UNKNOWN_STEP');
    expect((await boldsweep('sweep', bold, '--out', 'x')).status).toBe(2); // --spec missing
    expect((await boldsweep('sweep', bold, '--spec', 'spec.yaml', '--out', 'x', '--workers', 'two')).status).toBe(2);
    expect((await boldsweep('report', 'no-such-folder')).status).toBe(2);
    const partial = await boldsweep('gather', 'shard1', '--out', 'partial'); // cells missing
    expect(partial.status).toBe(2);
    expect(partial.stderr).toContain('--allow-partial');
    const help = await boldsweep('sweep', '--help');
    expect(help.status).toBe(0);
    expect(help.stdout).toContain('Exit codes');
    expect((await boldsweep('demo', '--help')).status).toBe(0);
  });

  it('exits 2 on bad usage everywhere, prints its version, and every help has an example', async () => {
    const [unknownCommand, unknownOption, missingArgument, badValue, neg] = await Promise.all([
      boldsweep('frobnicate'),
      boldsweep('look', bold, '--out', 'l', '--bogus'),
      boldsweep('spec'),
      boldsweep('report', 'x', '--prefer', 'middle'),
      boldsweep('look', bold, '--out', 'l', '--drop', '-1'),
    ]);
    for (const r of [unknownCommand, unknownOption, missingArgument, badValue]) expect(r.status, r.stderr).toBe(2);
    expect(neg.status).toBe(2);
    expect(neg.stderr).toContain('must be a whole number, 0 or more');
    const v = await boldsweep('--version');
    expect(v.status).toBe(0);
    expect(v.stdout.trim()).toBe(JSON.parse(readFileSync('package.json', 'utf8')).version);
    const top = (await boldsweep('--help')).stdout;
    const order = ['boldsweep look', 'boldsweep spec', 'boldsweep sweep', 'boldsweep report'].map((c) => top.indexOf(`${c} `, top.indexOf('order of work')));
    expect(order.every((i, k) => i > 0 && (k === 0 || i > order[k - 1]))).toBe(true);
    const commands = ['look', 'spec', 'sweep', 'gather', 'report', 'demo'];
    const helps = await Promise.all(commands.map((c) => boldsweep(c, '--help')));
    helps.forEach((h, k) => expect(h.stdout, commands[k]).toMatch(/Example:\n  boldsweep /));
  });

  it('names the missing events file and the option', async () => {
    mkdirSync(join(dir, 'noevents'), { recursive: true });
    copyFileSync(bold, join(dir, 'noevents', 'sub-c01_task-flicker_bold.nii.gz'));
    const r = await boldsweep('sweep', join('noevents', 'sub-c01_task-flicker_bold.nii.gz'), '--spec', 'spec.yaml', '--out', 'ne', '--no-progress');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('EVENTS_MISSING');
    expect(r.stderr).toContain('sub-c01_task-flicker_events.tsv');
    expect(r.stderr).toContain('--events');
    expect(existsSync(join(dir, 'ne'))).toBe(false);
  });
});

describe('outputs never destroy what boldsweep did not write', () => {
  const listing = (p: string) => readdirSync(join(dir, p)).sort();

  it('look refuses the run\'s own folder (even with --force) and the current folder', async () => {
    const before = listing('data');
    for (const extra of [[], ['--force']]) {
      const r = await boldsweep('look', bold, '--out', 'data', ...extra);
      expect(r.status).toBe(2);
      expect(r.stderr).toContain('OUTPUT_IS_INPUT_FOLDER');
    }
    const here = await boldsweep('look', bold, '--out', '.', '--force');
    expect(here.status).toBe(2);
    expect(here.stderr).toContain('OUTPUT_IS_CURRENT_FOLDER');
    expect(listing('data')).toEqual(before);
  });

  it('look refuses a non-empty folder it did not write; --force adds its files and leaves the others', async () => {
    mkdirSync(join(dir, 'notes'), { recursive: true });
    writeFileSync(join(dir, 'notes', 'todo.txt'), 'mine');
    const r = await boldsweep('look', bold, '--out', 'notes');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('OUTPUT_NOT_OURS');
    expect(listing('notes')).toEqual(['todo.txt']);
    const f = await boldsweep('look', bold, '--out', 'notes', '--force', '--no-figures');
    expect(f.status, f.stderr).toBe(0);
    expect(readFileSync(join(dir, 'notes', 'todo.txt'), 'utf8')).toBe('mine');
    expect(listing('notes')).toContain('findings.json');
    // its own folder again: no --force needed, the user's file still there
    expect((await boldsweep('look', bold, '--out', 'notes', '--no-figures')).status).toBe(0);
    expect(readFileSync(join(dir, 'notes', 'todo.txt'), 'utf8')).toBe('mine');
  });

  it('even with --force, a file of the same name that boldsweep did not write is never replaced', async () => {
    mkdirSync(join(dir, 'mixed'), { recursive: true });
    writeFileSync(join(dir, 'mixed', 'findings.json'), '{"mine": true}');
    const r = await boldsweep('look', bold, '--out', 'mixed', '--force', '--no-figures');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('OUTPUT_FILE_NOT_OURS');
    expect(readFileSync(join(dir, 'mixed', 'findings.json'), 'utf8')).toBe('{"mine": true}');
    expect(listing('mixed').filter((f) => !f.startsWith('.boldsweep'))).toEqual(['findings.json']);
  });

  it('sweep, report and demo refuse a non-empty folder they did not write', async () => {
    mkdirSync(join(dir, 'theirs'), { recursive: true });
    writeFileSync(join(dir, 'theirs', 'data.csv'), '1,2');
    const s = await boldsweep('sweep', bold, '--spec', 'spec.yaml', '--out', 'theirs', '--no-progress');
    expect(s.status).toBe(2);
    expect(s.stderr).toContain('OUTPUT_NOT_OURS');
    const sd = await boldsweep('sweep', bold, '--spec', 'spec.yaml', '--out', 'data', '--force', '--no-progress');
    expect(sd.stderr).toContain('OUTPUT_IS_INPUT_FOLDER');
    const d = await boldsweep('demo', '--out', 'theirs', '--no-progress');
    expect(d.status).toBe(2);
    expect(d.stderr).toContain('OUTPUT_NOT_OURS');
    // a sweep folder without the marker (copied by hand): report refuses it unless --force
    mkdirSync(join(dir, 'copied'), { recursive: true });
    for (const f of ['scorecard.tsv', 'timings.tsv', 'roc.tsv', 'sweep.json']) copyFileSync(join(dir, 'whole', f), join(dir, 'copied', f));
    const r = await boldsweep('report', 'copied');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('OUTPUT_NOT_OURS');
    expect((await boldsweep('report', 'copied', '--force')).status).toBe(0);
    expect(listing('theirs')).toEqual(['data.csv']);
  });
});

describe('look -> spec -> sweep -> report, reading only --help', () => {
  it('goes from a look to a report, with the look\'s findings in the sweep', async () => {
    expect((await boldsweep('look', bold, '--out', 'look1', '--no-figures')).status).toBe(0);
    const sp = await boldsweep('spec', 'look1', '--out', 'start.yaml');
    expect(sp.status, sp.stderr).toBe(0);
    expect(sp.stdout).toContain('next: boldsweep sweep');
    const text = readFileSync(join(dir, 'start.yaml'), 'utf8');
    expect(text).toContain('count: 3'); // the look's bright first volumes
    // a small sweep: fewer widths, repeats and blobs than the starting spec
    writeFileSync(join(dir, 'small.yaml'), text.replace(/smooth\.fwhmMm: \[[^\]]*\]/, 'smooth.fwhmMm: [ 0, 8 ]').replace(/repeats: \d+/, 'repeats: 1').replace(/count: 6/, 'count: 2').replace(/marginMm: null/, 'marginMm: 0'));
    // the spec file is not replaced unless it is boldsweep's own and --force is given
    expect((await boldsweep('spec', 'look1', '--out', 'start.yaml')).status).toBe(2);
    expect((await boldsweep('spec', 'look1', '--out', 'small.yaml', '--force')).status).toBe(0);
    writeFileSync(join(dir, 'mine.yaml'), 'recipe: []\n');
    const own = await boldsweep('spec', 'look1', '--out', 'mine.yaml', '--force');
    expect(own.stderr).toContain('SPEC_FILE_EXISTS');
    expect(readFileSync(join(dir, 'mine.yaml'), 'utf8')).toBe('recipe: []\n');
    writeFileSync(join(dir, 'small.yaml'), text.replace(/smooth\.fwhmMm: \[[^\]]*\]/, 'smooth.fwhmMm: [ 0, 8 ]').replace(/repeats: \d+/, 'repeats: 1').replace(/count: 6/, 'count: 2').replace(/marginMm: null/, 'marginMm: 0'));
    const sw = await boldsweep('sweep', bold, '--spec', 'small.yaml', '--look', 'look1', '--out', 'flow', '--workers', '1', '--placement', tissue, '--placement-values', '3');
    expect(sw.status, sw.stderr).toBe(0);
    expect(sw.stderr).not.toContain('warning');
    expect(sw.stdout).toContain('next: boldsweep report flow');
    const rep = await boldsweep('report', 'flow');
    expect(rep.status, rep.stderr).toBe(0);
    expect(existsSync(join(dir, 'flow', 'report.html'))).toBe(true);
  });

  it('refuses a look folder from another run, and warns about untreated findings without one', async () => {
    expect((await boldsweep('look', otherBold, '--out', 'look-other', '--no-figures')).status).toBe(0);
    const r = await boldsweep('sweep', bold, '--spec', 'spec.yaml', '--look', 'look-other', '--out', 'mismatch', '--no-progress');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('LOOK_FROM_OTHER_RUN');
    expect(r.stderr).toContain('sub-c02_task-flicker_bold.nii.gz');
    // a spec that does not drop the look's bright first volumes: a warning naming them and the way out
    writeFileSync(join(dir, 'nodrop.yaml'), readFileSync(join(dir, 'spec.yaml'), 'utf8').replace(/  - step: drop-initial-volumes\n    params: \{ count: 3 \}\n/, '').replace('[0, 8]', '[0]').replace('repeats: 2', 'repeats: 1'));
    const w = await boldsweep('sweep', bold, '--spec', 'nodrop.yaml', '--out', 'nodrop', '--no-progress', '--workers', '1', '--placement', tissue, '--placement-values', '3');
    expect(w.status, w.stderr).toBe(0);
    expect(w.stderr).toMatch(/warning: the first 3 volume\(s\) are brighter/);
    expect(w.stderr).toContain('--look');
  });
});
