import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { addOutputFiles, checkOutputFolder, claimOutputFolder, OUTPUT_MARKER, readOutputMarker, settleOutputSet } from '../../src/io/output-folder.js';

// Outputs never destroy what boldsweep did not write: the folder rules, one case each.
let dir: string;
let cwd: string;
beforeEach(() => { dir = mkdtempSync(join(tmpdir(), 'boldsweep-out-')); cwd = process.cwd(); });
afterEach(() => { process.chdir(cwd); rmSync(dir, { recursive: true, force: true }); });

async function codeOf(f: () => unknown): Promise<string | null> {
  try { await f(); return null; } catch (e) { return isBoldsweepError(e) ? e.code : String(e); }
}

describe('claimOutputFolder', () => {
  it('creates a new folder with its marker, and accepts an empty one', async () => {
    await claimOutputFolder(join(dir, 'new'));
    expect(readOutputMarker(join(dir, 'new'))).toEqual({ format: 'boldsweep-output', version: 1, files: [], sets: {} });
    mkdirSync(join(dir, 'empty'));
    await claimOutputFolder(join(dir, 'empty'));
    expect(existsSync(join(dir, 'empty', OUTPUT_MARKER))).toBe(true);
  });

  it('refuses a non-empty folder without the marker, and leaves it as it was', async () => {
    mkdirSync(join(dir, 'theirs'));
    writeFileSync(join(dir, 'theirs', 'notes.txt'), 'mine');
    expect(await codeOf(() => claimOutputFolder(join(dir, 'theirs')))).toBe('OUTPUT_NOT_OURS');
    expect(readdirSync(join(dir, 'theirs'))).toEqual(['notes.txt']);
  });

  it('with force, writes beside files it did not write but never replaces them', async () => {
    mkdirSync(join(dir, 'theirs'));
    writeFileSync(join(dir, 'theirs', 'notes.txt'), 'mine');
    writeFileSync(join(dir, 'theirs', 'findings.json'), 'also mine');
    await claimOutputFolder(join(dir, 'theirs'), { force: true });
    await addOutputFiles(join(dir, 'theirs'), ['series.tsv']);
    expect(await codeOf(() => addOutputFiles(join(dir, 'theirs'), ['findings.json']))).toBe('OUTPUT_FILE_NOT_OURS');
    expect(readFileSync(join(dir, 'theirs', 'findings.json'), 'utf8')).toBe('also mine');
    expect(readOutputMarker(join(dir, 'theirs'))!.files).toEqual(['series.tsv']);
  });

  it('refuses the folder of an input (and one holding it), even with force', async () => {
    mkdirSync(join(dir, 'func'));
    const run = join(dir, 'func', 'sub-01_bold.nii.gz');
    writeFileSync(run, 'x');
    expect(await codeOf(() => claimOutputFolder(join(dir, 'func'), { inputs: [run] }))).toBe('OUTPUT_IS_INPUT_FOLDER');
    expect(await codeOf(() => claimOutputFolder(join(dir, 'func'), { inputs: [run], force: true }))).toBe('OUTPUT_IS_INPUT_FOLDER');
    expect(await codeOf(() => claimOutputFolder(dir, { inputs: [run], force: true }))).toBe('OUTPUT_IS_INPUT_FOLDER');
    // an input folder (a sweep folder given to gather) is guarded itself
    expect(await codeOf(() => claimOutputFolder(join(dir, 'func'), { inputs: [join(dir, 'func')] }))).toBe('OUTPUT_IS_INPUT_FOLDER');
    expect(existsSync(join(dir, 'func', OUTPUT_MARKER))).toBe(false);
  });

  it('refuses the current folder and a folder holding it, even with force', async () => {
    mkdirSync(join(dir, 'work', 'deeper'), { recursive: true });
    process.chdir(join(dir, 'work', 'deeper'));
    expect(await codeOf(() => claimOutputFolder('.', { force: true }))).toBe('OUTPUT_IS_CURRENT_FOLDER');
    expect(await codeOf(() => claimOutputFolder('..', { force: true }))).toBe('OUTPUT_IS_CURRENT_FOLDER');
    expect(() => checkOutputFolder('sub')).not.toThrow();
  });

  it('refuses a file given as the output folder', async () => {
    writeFileSync(join(dir, 'afile'), 'x');
    expect(await codeOf(() => claimOutputFolder(join(dir, 'afile'), { force: true }))).toBe('OUTPUT_NOT_OURS');
  });
});

describe('settleOutputSet', () => {
  it('retires only files the same set wrote before, never other files', async () => {
    const out = join(dir, 'look');
    await claimOutputFolder(out);
    await addOutputFiles(out, ['a.png', 'b.tsv']);
    for (const f of ['a.png', 'b.tsv']) writeFileSync(join(out, f), f);
    await settleOutputSet(out, 'look', ['a.png', 'b.tsv']);
    writeFileSync(join(out, 'user.txt'), 'mine');
    expect(await settleOutputSet(out, 'look', ['b.tsv'])).toEqual(['a.png']);
    expect(readdirSync(out).sort()).toEqual([OUTPUT_MARKER, 'b.tsv', 'user.txt']);
    expect(readOutputMarker(out)!.files).toEqual(['b.tsv']);
  });
});
