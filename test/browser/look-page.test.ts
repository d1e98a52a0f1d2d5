import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { BrowserContext } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openRun } from '../../src/io/open-run.js';
import { lookAtRun } from '../../src/look/look-at-run.js';
import { writeLookFolder } from '../../src/report/write-look-folder.js';
import { findTool } from '../find-tool.js';
import { launchHeadlessChromium } from './headless-chromium.js';

// look.html of the demo run in a real browser: Debian's headless Chromium driven by playwright-core.
const outDir = join(process.cwd(), 'test', 'output');
let browser: BrowserContext;
let closeBrowser: (() => Promise<void>) | undefined;
let pagePath: string;
let findingCount: number;
const CHROMIUM = findTool('chromium');

describe.skipIf(!CHROMIUM.path)('look.html in headless Chromium', () => {
beforeAll(async () => {
  const run = await openRun(join(process.cwd(), 'data-demo', 'sub-phantom01_task-flicker_bold.nii.gz'));
  const look = lookAtRun(run);
  findingCount = look.findings.length;
  const dir = join(outDir, 'browser-look');
  mkdirSync(outDir, { recursive: true });
  await writeLookFolder(run.volume, look, dir, { source: 'data-demo/sub-phantom01_task-flicker_bold.nii.gz' });
  pagePath = join(dir, 'look.html');
  ({ browser, close: closeBrowser } = await launchHeadlessChromium(CHROMIUM.path!));
}, 120000);

afterAll(async () => {
  await closeBrowser?.();
});

  it('shows the recommendation, every finding with its consequence and advice, the numbers and every figure, fetching nothing', async () => {
    const page = await browser.newPage();
    const requests: string[] = [];
    page.on('request', (r) => { if (!r.url().startsWith('file:') && !r.url().startsWith('data:')) requests.push(r.url()); });
    await page.goto(pathToFileURL(pagePath).href);
    const text = (await page.textContent('body')) ?? '';
    expect(text).toContain('Recommendation');
    expect(text).toMatch(/Drop the first 3 volumes/);
    expect(await page.$$eval('table.findings > tbody > tr', (rows) => rows.length)).toBe(findingCount);
    expect(text).toContain('censored');
    expect(text).toContain('tSNR');
    expect(text).toMatch(/Lemieux/);
    expect(text).toContain('not for clinical or presurgical decisions');
    const figures = await page.$$eval('figure.look-figure', (figs) => figs.map((f) => {
      const svg = f.querySelector('svg');
      const box = svg?.getBoundingClientRect();
      const images = svg ? [...svg.querySelectorAll('image')].filter((im) => (im as SVGImageElement).getBBox().width > 0).length : 0;
      const texts = svg ? [...svg.querySelectorAll('text')].filter((t) => (t as SVGTextElement).getComputedTextLength() > 0).length : 0;
      return { id: f.id, width: box?.width ?? 0, height: box?.height ?? 0, images, texts };
    }));
    expect(figures.length).toBe(9); // five maps, the raster, traces, voxel time courses, the motion edge signature (no motion table: no FD figures)
    for (const f of figures) {
      expect(f.width, f.id).toBeGreaterThan(200);
      expect(f.height, f.id).toBeGreaterThan(150);
      expect(f.texts, f.id).toBeGreaterThan(3); // words laid out by the browser's font renderer
    }
    expect(figures.filter((f) => f.images > 0).length).toBe(6); // five map figures and the voxel raster
    expect(requests).toEqual([]);
    await page.screenshot({ path: join(outDir, 'look.png'), fullPage: true });
    await page.close();
  }, 60000);
});
