import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { openRun } from '../../src/io/open-run.js';
import { runFacts } from '../../src/report/run-facts.js';
import { writeReport } from '../../src/report/write-report.js';
import { readSweepFolder, writeSweepFolder } from '../../src/report/sweep-folder.js';
import { resolvePhantomSpec, simulatePhantomRun, writePhantomRun } from '../../src/simulate/index.js';
import { buildMask } from '../../src/sweep/mask-source.js';
import { runSweep } from '../../src/sweep/runner.js';
import { curvePeak } from '../../src/decide/curve-peak.js';
import { studyOptima } from '../../src/decide/study-optima.js';
import type { Scorecard } from '../../src/sweep/scorecard.js';

let dir = '';
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

describe('optimum of a sampled curve', () => {
  it('the three-point parabola finds the vertex of a quadratic exactly, on uneven spacing too', () => {
    // y = -(x - 5.3)^2: the vertex of the interpolating parabola is the quadratic's own (common practice, no source)
    const x = [0, 2, 4, 7, 10];
    expect(curvePeak(x, x.map((v) => -((v - 5.3) ** 2)))).toBeCloseTo(5.3, 12);
    expect(curvePeak([0, 1, 2], [3, 2, 1])).toBe(0);
    expect(curvePeak([0, 1, 2], [1, 1, 1])).toBeNaN();
  });
  it('studyOptima: paired bootstrap intervals around known peaks (synthetic scorecard)', () => {
    const widths = [0, 2, 4, 6, 8, 10, 12];
    const rows: Scorecard['rows'] = [];
    let cell = 0;
    for (const level of [0, 4]) for (let rep = 0; rep < 6; rep++) for (const w of widths) {
      const jitter = 0.002 * ((rep * 7 + w) % 5);
      rows.push({ cell: cell++, 'smooth.fwhmMm': w, 'study.misregistrationMm': level, plantSizeMm: 6, plantAmplitudePct: 1, repeat: rep,
        hitRate: 0.9 - 0.004 * (w - (level ? 10 : 6)) ** 2 + jitter, firstLevelHitRate: 0.8 - 0.004 * (w - 5) ** 2 + jitter });
    }
    const o = studyOptima({ sweepKey: 'k', varied: ['smooth.fwhmMm', 'study.misregistrationMm'], metrics: ['hitRate', 'firstLevelHitRate'], rows, seconds: rows.map(() => 0) }, { resamples: 200 })!;
    // peaks of the quadratics up to the small jitter: 0.2 mm
    expect(Math.abs(o.singleRun.optimum.value - 5)).toBeLessThan(0.2);
    expect(Math.abs(o.levels[0].optimum.value - 6)).toBeLessThan(0.2);
    expect(Math.abs(o.levels[1].widerBy.value - 5)).toBeLessThan(0.3);
    for (const l of o.levels) expect(l.optimum.low).toBeLessThanOrEqual(l.optimum.value + 1e-9);
    for (const l of o.levels) expect(l.optimum.high).toBeGreaterThanOrEqual(l.optimum.value - 1e-9);
  });
});

describe('a study sweep report', () => {
  it('puts the single-run and group optima side by side, says which question it answers, draws detection per misregistration level', async () => {
    dir = mkdtempSync(join(tmpdir(), 'boldsweep-study-report-'));
    const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 80, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 8, anatomy: { supersample: 1 } }));
    const files = await writePhantomRun(join(dir, 'data'), sim, 'sub-t03_task-flicker');
    const run = await openRun(files.bold, { sharedMemory: true });
    const masks = { brain: { kind: 'otsu-mean' as const }, placement: { kind: 'brain' as const }, exclude: null };
    const brainMask = await buildMask(masks.brain, run.volume);
    const result = await runSweep(run, {
      recipe: [{ step: 'smooth', params: { fwhmMm: 0 } }],
      vary: { 'smooth.fwhmMm': [0, 6, 12], 'study.misregistrationMm': [0, 5] },
      plant: { sizesFwhmMm: [8], amplitudesPct: [3], count: 2 },
      repeats: 3, threshold: { kind: 'fwe-rft' }, seed: 4,
      study: { subjects: 5, misregistrationMm: 5 },
    }, { workers: 2, brainMask });
    await writeSweepFolder(join(dir, 'sweep'), { result, run: runFacts(run), masks });
    const back = readSweepFolder(join(dir, 'sweep'));
    expect(back.result.study).toEqual(JSON.parse(JSON.stringify(result.study)));
    expect(back.result.scorecard.metrics).toContain('firstLevelHitRate');
    const written = await writeReport(join(dir, 'out'), back);
    expect(written.recommendation.summary).toMatch(/^This recommendation answers the group question/);
    expect(written.recommendation.summary).toMatch(/misaligned by 5 mm/);
    const html = readFileSync(written.files.report, 'utf8');
    expect(html).toContain('Single-run optimum');
    expect(html).toContain('Group optimum at misregistration 0 mm');
    expect(html).toContain('Group optimum at misregistration 5 mm');
    expect(html).toContain('chart-study');
    const methods = readFileSync(written.files.methods, 'utf8');
    expect(methods).toContain('Holmes & Friston 1998');
    expect(methods).toContain('one-sample t-test');
  }, 180_000);
});
