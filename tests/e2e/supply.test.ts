import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { DESKTOP, launchBrowser, PHONE, screenshot, watchErrors } from '../support/browser';

let browser: Browser;
const baseUrl = inject('baseUrl');

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('a facilities manager reads the bulk tank’s forecast and enters a level reading', () => {
  for (const [device, viewport, level] of [
    ['desktop', DESKTOP, '58.4'],
    ['phone', PHONE, '57.9'],
  ] as const) {
    it(`on a ${device}`, async () => {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(baseUrl + '/sign-in');
      await page.getByLabel('E-mail').fill('facilities@plenum.example');
      await page.getByLabel('Password').fill('demo-plenum');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('heading', { name: 'Today', exact: true }).waitFor({ timeout: 20_000 });

      // Today's card of the demo tank opens its page
      await page
        .getByRole('link', { name: /Main VIE/ })
        .first()
        .click({ timeout: 20_000 });
      await page.waitForURL(/\/sources\/\d+/, { timeout: 20_000 });
      await page.getByRole('heading', { level: 1, name: /Main VIE/ }).waitFor({ timeout: 20_000 });

      // the depletion chart (its text alternative names the reorder level) and the method with its caution
      const chart = page.getByRole('img', { name: /Projected contents from/ });
      await chart.waitFor({ timeout: 30_000 });
      expect(await chart.getAttribute('aria-label')).toMatch(/Reorder level [\d,]+ kg/);
      await page.getByRole('heading', { name: 'How this forecast is made' }).waitFor();
      await page.getByText('Planning estimate only').first().waitFor();
      await page.getByRole('heading', { name: 'Demand lines' }).waitFor();
      await screenshot(page, `supply-source-${device}`);

      // a level reading, by hand, taken now
      await page.getByRole('button', { name: 'Enter a reading' }).first().click();
      await page.getByRole('textbox', { name: 'Level', exact: true }).fill(level);
      await page.getByRole('button', { name: 'Save reading' }).click();
      await page.getByText(/Reading saved/).waitFor({ timeout: 20_000 });

      // it heads the readings table, entered by hand by this person
      const row = page.getByRole('row').filter({ hasText: `${level} % level` });
      await row.first().waitFor({ timeout: 20_000 });
      await expect(row.first().textContent()).resolves.toMatch(/Read by hand/);
      await expect(row.first().textContent()).resolves.toMatch(/You/);
      await row.first().scrollIntoViewIfNeeded();
      await screenshot(page, `supply-reading-saved-${device}`);

      expect(errors).toEqual([]);
      await context.close();
    });
  }
});
