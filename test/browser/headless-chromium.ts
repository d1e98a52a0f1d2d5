import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

/** A headless Chromium with its own throw-away profile; `close` shuts it and removes the profile. */
export interface HeadlessChromium {
  browser: BrowserContext;
  close: () => Promise<void>;
}

/**
 * Launch Debian's Chromium headless, as every browser test does: a fresh profile per launch
 * (playwright takes the user-data folder as an argument, not a flag), no sandbox (CI runs as root),
 * no GPU, no network of its own (updates, sync, QUIC), so a page can only fetch what it names.
 * @param executablePath - the chromium binary (findTool('chromium').path)
 * @returns the browser context and its closer
 * @example const { browser, close } = await launchHeadlessChromium(CHROMIUM.path!)
 */
export async function launchHeadlessChromium(executablePath: string): Promise<HeadlessChromium> {
  const userDataDir = mkdtempSync(join(tmpdir(), 'boldsweep-chromium-'));
  const browser = await chromium.launchPersistentContext(userDataDir, {
    executablePath,
    headless: true,
    viewport: { width: 1200, height: 900 },
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  return {
    browser,
    close: async () => {
      await browser.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}
