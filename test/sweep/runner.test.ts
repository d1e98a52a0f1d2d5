import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { gatherResults } from '../../src/sweep/gather.js';
import { parseSweepSpec } from '../../src/sweep/parse-sweep-spec.js';
import { runSweep, type SweepResult } from '../../src/sweep/runner.js';
import { scorecardToTsv, readScorecardTsv, scorecardMeta, timingsToTsv } from '../../src/sweep/scorecard-tsv.js';
import { scorecardFrame } from '../../src/sweep/scorecard-frame.js';
import { scorecardColumns } from '../../src/sweep/scorecard.js';
import type { SweepSpecInput } from '../../src/sweep/spec.js';
import { smallPhantom } from './sweep-test-runs.js';

// The sweep runs worker threads from dist/ (npm test builds first); these checks need a current build.
const spec: SweepSpecInput = {
  recipe: [{ step: 'drop-initial-volumes', params: { count: 3 } }, { step: 'smooth', params: { fwhmMm: 0 } }],
  vary: { 'smooth.fwhmMm': [0, 8] },
  plant: { sizesFwhmMm: [10], amplitudesPct: [3], count: 3 },
  repeats: 2,
  threshold: { kind: 'fwe-rft' },
  seed: 4,
};

let run: ReturnType<typeof smallPhantom>;
let cache: string;
let one: SweepResult;
beforeAll(async () => {
  run = smallPhantom();
  cache = mkdtempSync(join(tmpdir(), 'boldsweep-runner-'));
  one = await runSweep(run, spec, { workers: 1, placementMask: run.greyMatter });
});
afterAll(() => rmSync(cache, { recursive: true, force: true }));

async function codeOf(f: () => Promise<unknown>): Promise<string | undefined> {
  try { await f(); } catch (e) { return isBoldsweepError(e) ? e.code : String(e); }
  return undefined;
}

describe('runSweep', () => {
  it('gives one scorecard row per setting x repeat with the planted truth scored', () => {
    expect(one.scorecard.rows).toHaveLength(2 * 2);
    expect(one.scorecard.rows.map((r) => r.cell)).toEqual([0, 1, 2, 3]);
    for (const r of one.scorecard.rows) {
      expect(r.blobs).toBe(3);
      expect(r.truthVoxels as number).toBeGreaterThan(0);
      expect(r.rocAuc as number).toBeGreaterThan(0.5);
      expect(r.tsnrMedian as number).toBeGreaterThan(1);
    }
    // smoothing an 8 mm kernel makes the residuals smoother than no smoothing (Gaussians add in quadrature)
    const sm = (s: number) => one.scorecard.rows.filter((r) => r['smooth.fwhmMm'] === s).map((r) => r.smoothnessFwhmMm as number);
    for (let i = 0; i < 2; i++) expect(sm(8)[i]).toBeGreaterThan(sm(0)[i]);
    expect(one.curves.rows).toHaveLength(4);
    expect(one.notes.map((n) => n.notes.map((s) => s.step))).toEqual([['drop-initial-volumes', 'smooth'], ['drop-initial-volumes', 'smooth']]);
  });

  it('same spec and seed: byte-identical scorecard TSV with 1 and 2 workers, and in this thread', async () => {
    const two = await runSweep(run, spec, { workers: 2, placementMask: run.greyMatter });
    expect(two.stats.workers).toBe(2);
    expect(scorecardToTsv(two.scorecard)).toBe(scorecardToTsv(one.scorecard));
    const here = await runSweep(run, spec, { inThisThread: true, placementMask: run.greyMatter });
    expect(scorecardToTsv(here.scorecard)).toBe(scorecardToTsv(one.scorecard));
  });

  it('same scorecard whichever way a group stage is kept: patched, whole in memory, whole on disk, or recomputed', async () => {
    // grand-mean-scale rescales every voxel, so its stage cannot be a patch of the unplanted run
    const whole: SweepSpecInput = { ...spec, recipe: [spec.recipe[0], { step: 'grand-mean-scale', params: {} }, spec.recipe[1]] };
    const ref = scorecardToTsv((await runSweep(run, whole, { workers: 1, placementMask: run.greyMatter, reuseStages: false })).scorecard);
    const inMemory = await runSweep(run, whole, { workers: 2, placementMask: run.greyMatter });
    expect(scorecardToTsv(inMemory.scorecard)).toBe(ref);
    const dir = mkdtempSync(join(tmpdir(), 'boldsweep-runner-whole-'));
    try {
      const onDisk = await runSweep(run, whole, { workers: 2, placementMask: run.greyMatter, cacheDir: dir, keepStages: true });
      expect(scorecardToTsv(onDisk.scorecard)).toBe(ref);
      expect(readdirSync(join(dir, 'groups')).filter((f) => f.endsWith('.f32'))).toHaveLength(2); // one whole stage per repeat
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
    const recomputed = await runSweep(run, spec, { workers: 2, placementMask: run.greyMatter, reuseStages: false });
    expect(scorecardToTsv(recomputed.scorecard)).toBe(scorecardToTsv(one.scorecard));
  });

  it('resumes from its cache: only missing cells are computed, with the same result', async () => {
    const first = await runSweep(run, spec, { workers: 2, placementMask: run.greyMatter, cacheDir: cache });
    expect(first.stats.cellsComputed).toBe(4);
    // no group stage is left once its cells are done (a stage kept as a patch is never written); cell results stay
    const groups = join(cache, 'groups');
    expect(existsSync(groups) ? readdirSync(groups) : []).toEqual([]);
    // an interrupted sweep: two finished cells lost
    const cells = readdirSync(join(cache, 'cells'));
    expect(cells).toHaveLength(4);
    for (const f of cells.slice(0, 2)) rmSync(join(cache, 'cells', f));
    const resumed = await runSweep(run, spec, { workers: 1, placementMask: run.greyMatter, cacheDir: cache });
    expect(resumed.stats.cellsComputed).toBe(2);
    expect(resumed.stats.cellsFromCache).toBe(2);
    expect(scorecardToTsv(resumed.scorecard)).toBe(scorecardToTsv(one.scorecard));
  });

  it('shards gathered give the same scorecard as the whole sweep', async () => {
    const a = await runSweep(run, spec, { workers: 1, placementMask: run.greyMatter, shard: '1/2' });
    const b = await runSweep(run, spec, { workers: 1, placementMask: run.greyMatter, shard: { index: 2, count: 2 } });
    expect(a.scorecard.rows.length + b.scorecard.rows.length).toBe(4);
    const whole = gatherResults([b, a]);
    expect(scorecardToTsv(whole.scorecard)).toBe(scorecardToTsv(one.scorecard));
    expect(await codeOf(async () => gatherResults([a]))).toBe('INVALID_ARGUMENT');
    expect(await codeOf(async () => gatherResults([a, a]))).toBe('INVALID_ARGUMENT');
  });

  it('gives the scorecard as a danfo.js DataFrame with the seconds each cell took', async () => {
    const df = await scorecardFrame(one.scorecard);
    expect(df.shape).toEqual([4, scorecardColumns(one.scorecard).length + 1]);
    expect(df.columns).toContain('seconds');
    expect(df.column('hitRate').values).toEqual(one.scorecard.rows.map((r) => r.hitRate));
  });

  it('round-trips the scorecard through TSV exactly', () => {
    const tsv = scorecardToTsv(one.scorecard);
    // the first line is the header of plain identifiers; the sweep key and varied keys live in sweep.json
    expect(tsv.split('\n')[0].split('\t').every((c) => /^[A-Za-z][A-Za-z0-9_]*$/.test(c))).toBe(true);
    expect(tsv.split('\n')[0]).toContain('smooth_fwhmMm');
    const back = readScorecardTsv(tsv, scorecardMeta(one.scorecard), timingsToTsv(one.scorecard));
    expect(scorecardToTsv(back)).toBe(tsv);
    expect(back.rows[1]).toEqual(one.scorecard.rows[1]);
    expect(back.seconds[0]).toBeCloseTo(one.scorecard.seconds[0], 3);
  });

  it('refuses bad input with typed errors', async () => {
    expect(await codeOf(() => runSweep({ ...run, events: null }, spec))).toBe('EVENTS_INVALID');
    expect(await codeOf(() => runSweep(run, spec, { placementMask: new Uint8Array(5) }))).toBe('GRID_MISMATCH');
    expect(await codeOf(() => runSweep(run, { ...spec, recipe: [{ step: 'sharpen', params: {} }] }))).toBe('UNKNOWN_STEP');
    expect(await codeOf(() => runSweep(run, { ...spec, vary: { 'smooth.widthMm': [1] } }))).toBe('UNKNOWN_PARAMETER');
    expect(await codeOf(() => runSweep(run, { ...spec, vary: { 'smooth.fwhmMm': [-2] } }))).toBe('SPEC_INVALID');
    expect(await codeOf(() => runSweep(run, { ...spec, vary: { 'highpass.cutoffSec': [100] } }))).toBe('SPEC_INVALID');
    expect(await codeOf(() => runSweep(run, { ...spec, vary: { 'model.colour': [1] } }))).toBe('UNKNOWN_PARAMETER');
  });
});

describe('parseSweepSpec', () => {
  it('fills step defaults from the registry and keeps the input unmodified', () => {
    const input = JSON.parse(JSON.stringify(spec)) as SweepSpecInput;
    const s = parseSweepSpec(input);
    expect(s.recipe[1].params).toEqual({ fwhmMm: 0, mode: 'reflect', withinMask: false });
    expect(input).toEqual(spec);
    expect(s.events).toEqual({ kind: 'run' });
  });
});
