import { mkdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { BrowserContext } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runFacts } from '../../src/report/run-facts.js';
import { writeSweepFolder } from '../../src/report/sweep-folder.js';
import { writeReport } from '../../src/report/write-report.js';
import { runSweep } from '../../src/sweep/runner.js';
import { findTool } from '../find-tool.js';
import { launchHeadlessChromium } from './headless-chromium.js';
import { smallPhantom } from '../sweep/sweep-test-runs.js';

// The HTML report in a real browser: Debian's headless Chromium driven by playwright-core.
const CHROMIUM = findTool('chromium');
const outDir = join(process.cwd(), 'test', 'output');
let browser: BrowserContext;
let closeBrowser: (() => Promise<void>) | undefined;
let reportPath: string;

describe.skipIf(!CHROMIUM.path)('HTML report in headless Chromium', () => {
  beforeAll(async () => {
    const run = smallPhantom();
    const result = await runSweep(run, {
      recipe: [{ step: 'drop-initial-volumes', params: { count: 3 } }, { step: 'smooth', params: { fwhmMm: 0 } }],
      vary: { 'smooth.fwhmMm': [0, 5, 10] },
      plant: { sizesFwhmMm: [10], amplitudesPct: [3], count: 3 },
      repeats: 3, threshold: { kind: 'fwe-rft' }, seed: 9,
    }, { workers: 2, placementMask: run.greyMatter });
    const dir = join(outDir, 'browser-report');
    // the test's own folder, made afresh (a folder from before output markers would be refused)
    rmSync(dir, { recursive: true, force: true });
    mkdirSync(dir, { recursive: true });
    const folder = { result, run: runFacts({ volume: run.volume, sidecar: run.sidecar }), masks: { brain: { kind: 'otsu-mean' as const }, placement: { kind: 'brain' as const }, exclude: null } };
    await writeSweepFolder(dir, folder);
    reportPath = (await writeReport(dir, folder)).files.report;
    ({ browser, close: closeBrowser } = await launchHeadlessChromium(CHROMIUM.path!));
  });

  afterAll(async () => {
    await closeBrowser?.();
  });

  it('draws every chart, shows the recommendation and the caution, and is saved as a screenshot', async () => {
    const page = await browser.newPage();
    const requests: string[] = [];
    page.on('request', (r) => { if (!r.url().startsWith('file:')) requests.push(r.url()); });
    await page.goto(pathToFileURL(reportPath).href);
    const charts = await page.$$eval('figure.chart', (figs) => figs.map((f) => {
      const svg = f.querySelector('svg');
      const box = svg?.getBoundingClientRect();
      // drawn marks: vega writes each mark as a path, line or symbol inside a "mark-*" group
      const marks = svg ? [...svg.querySelectorAll('g[class^="mark-"] path, g[class^="mark-"] line, g[class^="mark-"] rect')] : [];
      const sized = marks.filter((m) => { const b = (m as SVGGraphicsElement).getBBox(); return b.width > 0 || b.height > 0; });
      return { id: f.id, width: box?.width ?? 0, height: box?.height ?? 0, marks: marks.length, sized: sized.length };
    }));
    expect(charts.map((c) => c.id)).toEqual(['chart-detection', 'chart-false-alarms', 'chart-tsnr', 'chart-smoothness', 'chart-theory', 'chart-roc']);
    for (const c of charts) {
      expect(c.width, c.id).toBeGreaterThan(100);
      expect(c.height, c.id).toBeGreaterThan(100);
      expect(c.sized, c.id).toBeGreaterThan(0);
    }
    const text = await page.textContent('body');
    expect(text).toContain('Recommendation');
    expect(text).toContain('not for clinical or presurgical decisions');
    expect(text).toMatch(/Use smoothing FWHM \d+ mm/);
    expect(requests).toEqual([]); // self-contained: nothing fetched
    mkdirSync(outDir, { recursive: true });
    await page.screenshot({ path: join(outDir, 'report.png'), fullPage: true });
    await page.close();
  });
});
