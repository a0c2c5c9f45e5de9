import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

/** Debian's Chromium, headless, with the flags that keep it off the network (it has none here). */
export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--disable-dev-shm-usage',
    ],
  });
}

export const PHONE = { width: 390, height: 844 };
export const DESKTOP = { width: 1366, height: 900 };

/** Writes a full-page screenshot into the test output folder (test-output/screenshots/NAME.png). */
export async function screenshot(page: Page, name: string): Promise<string> {
  const dir = path.join(process.env.PLENUM_TEST_OUTPUT ?? 'test-output', 'screenshots');
  mkdirSync(dir, { recursive: true });
  const file = path.join(dir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** Collects console errors and failed requests, so a journey fails on a broken page. */
export function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(`page error: ${e.message}`));
  page.on('console', (m) => {
    if (m.type() === 'error' && !/Failed to load resource: the server responded with a status of 401/.test(m.text())) errors.push(`console: ${m.text()}`);
  });
  return errors;
}
