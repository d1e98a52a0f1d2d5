import { spawn } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { resolvePhantomSpec, simulatePhantomRun, writePhantomRun } from '../../src/simulate/index.js';
import { studyRunPaths } from '../../src/sweep/study-run-paths.js';

const cli = join(process.cwd(), 'dist', 'src', 'cli', 'main.js');
let dir = '';
const bold: string[] = [];

function boldsweep(...args: string[]): Promise<{ status: number | null; stdout: string; stderr: string }> {
  return new Promise((done, failed) => {
    const child = spawn(process.execPath, [cli, ...args], { cwd: dir });
    let stdout = '', stderr = '';
    child.stdout.setEncoding('utf8').on('data', (t: string) => { stdout += t; });
    child.stderr.setEncoding('utf8').on('data', (t: string) => { stderr += t; });
    child.on('error', failed);
    child.on('close', (status) => done({ status, stdout, stderr }));
  });
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'boldsweep-study-cli-'));
  // a BIDS folder of three phantom runs from different seeds (one grid), and one on another grid
  for (const [i, seed] of [[1, 8], [2, 9], [3, 10]] as const) {
    const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 60, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed, anatomy: { supersample: 1 } }));
    bold.push((await writePhantomRun(join(dir, 'bids', `sub-0${i}`, 'func'), sim, `sub-0${i}_task-flicker`)).bold);
  }
  const odd = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 60, dims: [30, 36, 20], spacingMm: [5, 5, 5], activation: null, seed: 11, anatomy: { supersample: 1 } }));
  await writePhantomRun(join(dir, 'odd', 'sub-09', 'func'), odd, 'sub-09_task-flicker');
  mkdirSync(join(dir, 'specs'));
  const spec = (runs: string) => [
    'recipe:', '  - step: smooth', '    params: { fwhmMm: 0 }',
    'vary:', '  smooth.fwhmMm: [0, 8]', '  study.misregistrationMm: [0, 4]',
    'plant: { sizesFwhmMm: [8], amplitudesPct: [3], count: 2 }',
    'repeats: 2', 'threshold: { kind: fwe-rft }', 'seed: 3', 'workers: 2',
    `study: { subjects: 5, runs: ${runs} }`,
  ].join('\n') + '\n';
  writeFileSync(join(dir, 'specs', 'study.yaml'), spec('{ bids: ../bids, task: flicker }'));
  writeFileSync(join(dir, 'specs', 'odd.yaml'), spec('[../odd/sub-09/func/sub-09_task-flicker_bold.nii.gz]'));
}, 120_000);
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

describe('study runs from a spec', () => {
  it('a BIDS folder and task: every matching run in name order, the sweep\'s own run left out; missing ones named', () => {
    expect(studyRunPaths({ bids: '../bids', task: 'flicker' }, join(dir, 'specs', 'study.yaml'), bold[0])).toEqual([bold[1], bold[2]]);
    expect(studyRunPaths(['../bids/sub-03/func/sub-03_task-flicker_bold.nii.gz'], join(dir, 'specs', 'study.yaml'), bold[0])).toEqual([bold[2]]);
    const code = (f: () => unknown) => { try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : String(e); } return undefined; };
    expect(code(() => studyRunPaths({ bids: '../bids', task: 'rest' }, join(dir, 'specs', 'study.yaml'), bold[0]))).toBe('STUDY_RUNS_MISSING');
    expect(code(() => studyRunPaths(['nope.nii.gz'], join(dir, 'specs', 'study.yaml'), bold[0]))).toBe('STUDY_RUNS_MISSING');
  });
  it('boldsweep sweep with a study spec runs the study on three runs and boldsweep report writes the side-by-side optima', async () => {
    const s = await boldsweep('sweep', bold[0], '--spec', join('specs', 'study.yaml'), '--out', 'study-out');
    expect(s.status, s.stderr.slice(-1200)).toBe(0);
    expect(s.stdout).toContain('study: 3 runs');
    const json = JSON.parse(readFileSync(join(dir, 'study-out', 'sweep.json'), 'utf8'));
    expect(json.study.runs).toBe(3);
    const r = await boldsweep('report', 'study-out');
    expect(r.status, r.stderr).toBe(0);
    expect(readFileSync(join(dir, 'study-out', 'report.html'), 'utf8')).toContain('Single-run optimum');
  }, 300_000);
  it('runs on another grid stop with STUDY_GRID_MISMATCH (exit 2)', async () => {
    const s = await boldsweep('sweep', bold[0], '--spec', join('specs', 'odd.yaml'), '--out', 'odd-out');
    expect(s.status).toBe(2);
    expect(s.stderr).toContain('STUDY_GRID_MISMATCH');
  }, 120_000);
});
