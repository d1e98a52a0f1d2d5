import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { openRun } from '../../src/io/open-run.js';
import { runFacts } from '../../src/report/run-facts.js';
import { writeReport } from '../../src/report/write-report.js';
import { resolvePhantomSpec, simulatePhantomRun, writePhantomRun } from '../../src/simulate/index.js';
import { buildMask } from '../../src/sweep/mask-source.js';
import { runSweep } from '../../src/sweep/runner.js';

/*
 * A sweep whose planted amplitude (0.01 % of baseline) is far below the run's noise (the phantom's
 * noise is about 1 % of baseline per volume, as in the demo run): nothing planted can be detected at any width, so the
 * decision record must say 'no-detection' and no text may read "Use ...".
 */
let dir = '';
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

describe('a sweep that detects nothing', () => {
  it('gives the status no-detection in the record, the summary, the report and the methods text', async () => {
    dir = mkdtempSync(join(tmpdir(), 'boldsweep-nodetect-'));
    const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 60, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 8, anatomy: { supersample: 1 } }));
    const files = await writePhantomRun(join(dir, 'data'), sim, 'sub-t02_task-flicker');
    const run = await openRun(files.bold);
    const masks = { brain: { kind: 'otsu-mean' as const }, placement: { kind: 'brain' as const }, exclude: null };
    const brainMask = await buildMask(masks.brain, run.volume);
    const result = await runSweep(run, {
      recipe: [{ step: 'smooth', params: { fwhmMm: 0 } }],
      vary: { 'smooth.fwhmMm': [0, 6, 12] },
      plant: { sizesFwhmMm: [10], amplitudesPct: [0.01], count: 3 },
      repeats: 3, threshold: { kind: 'fwe-rft' }, seed: 4,
    }, { workers: 2, brainMask });
    const written = await writeReport(join(dir, 'out'), { result, run: runFacts(run), masks });
    expect(written.record.choice.status).toBe('no-detection');
    expect(written.recommendation.summary).not.toMatch(/^Use /);
    expect(written.record.choice.advice).toMatch(/amplitude/);
    const html = readFileSync(written.files.report, 'utf8');
    expect(html).toContain('data-status="no-detection"');
    expect(html).not.toMatch(/\(recommended\)/);
    // no chart marks a setting as recommended
    expect(html).not.toMatch(/>recommended</);
    const methods = readFileSync(written.files.methods, 'utf8');
    expect(methods).toMatch(/no setting is recommended/);
    expect(methods).not.toMatch(/was chosen:/);
  }, 300_000);
});

describe('a null sweep (nothing planted)', () => {
  it('gives the status nothing-planted, lists false clusters per setting and recommends nothing', async () => {
    const nullDir = mkdtempSync(join(tmpdir(), 'boldsweep-nullsweep-'));
    try {
      const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 60, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 8, anatomy: { supersample: 1 } }));
      const files = await writePhantomRun(join(nullDir, 'data'), sim, 'sub-t03_task-rest');
      const run = await openRun(files.bold);
      const masks = { brain: { kind: 'otsu-mean' as const }, placement: { kind: 'brain' as const }, exclude: null };
      const brainMask = await buildMask(masks.brain, run.volume);
      const result = await runSweep(run, {
        recipe: [{ step: 'smooth', params: { fwhmMm: 0 } }],
        vary: { 'smooth.fwhmMm': [0, 8] },
        plant: { sizesFwhmMm: [8], amplitudesPct: [0], count: 0 },
        repeats: 2, threshold: { kind: 'fwe-rft' }, seed: 4,
        events: { kind: 'random-blocks', onSec: 20, offMinSec: 20, offMaxSec: 40, trialType: 'null-task' },
      }, { workers: 2, brainMask });
      const written = await writeReport(join(nullDir, 'out'), { result, run: runFacts(run), masks });
      expect(written.record.choice.status).toBe('nothing-planted');
      expect(written.recommendation.summary).toMatch(/^No choice: Nothing was planted/);
      expect(written.recommendation.summary).toMatch(/false clusters per run smoothing FWHM 0 mm: [0-9.]+; smoothing FWHM 8 mm: [0-9.]+/);
      expect(written.methods.paragraphs.join(' ')).toMatch(/counted as a false alarm/);
      expect(written.methods.paragraphs.join(' ')).not.toMatch(/was chosen/);
    } finally {
      rmSync(nullDir, { recursive: true, force: true });
    }
  });
});
