import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { CSRF_HEADER } from '@common/api/roles';
import { DESKTOP, launchBrowser, PHONE, screenshot, watchErrors } from '../support/browser';

let browser: Browser;
const baseUrl = inject('baseUrl');

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('a source with no reading yet', () => {
  for (const [device, viewport] of [
    ['desktop', DESKTOP],
    ['phone', PHONE],
  ] as const) {
    it(`reads "No reading yet" on Today and on its page, not "Watch", on a ${device}`, async () => {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(baseUrl + '/sign-in');
      await page.getByLabel('E-mail').fill('facilities@plenum.example');
      await page.getByLabel('Password').fill('demo-plenum');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('heading', { name: 'Today', exact: true }).waitFor({ timeout: 20_000 });

      // a new tank set up through the API as this facilities manager, with no reading entered
      const csrf = ((await (await context.request.get(`${baseUrl}/api/auth/csrf`)).json()) as { token: string }).token;
      const sites = (await (await context.request.get(`${baseUrl}/api/sites`)).json()) as { id: number; name: string }[];
      const name = `Standby tank ${device}`;
      const body = { name, type: 'bulk_liquid', gasCode: 'O2', capacityKg: 5000, evaporationPercentPerDay: 0.5 };
      const created = await context.request.post(`${baseUrl}/api/sites/${sites[0].id}/sources`, { headers: { [CSRF_HEADER]: csrf }, data: body });
      expect(created.status()).toBe(200);
      const source = (await created.json()) as { id: number };

      try {
        await page.reload();
        const card = page.getByRole('article').filter({ has: page.getByRole('link', { name }) });
        await card.waitFor({ timeout: 30_000 });
        const text = (await card.textContent()) ?? '';
        expect(text).toMatch(/No reading yet/);
        expect(text).not.toMatch(/Watch/);
        expect(text).not.toMatch(/Lasts the forecast/);
        // its own tile counts it apart from the sources that need watching
        const tiles = page.getByRole('list', { name: 'Sources by status' });
        expect(await tiles.textContent()).toMatch(/No forecast\s*[1-9]/);
        await card.scrollIntoViewIfNeeded();
        await screenshot(page, `no-reading-today-${device}`);

        // its page says the same, and what to do
        await card.getByRole('link', { name }).click();
        await page.getByRole('heading', { level: 1, name }).waitFor({ timeout: 20_000 });
        const status = page.getByRole('region', { name: 'Status' });
        await status.getByText('No reading yet', { exact: true }).waitFor({ timeout: 20_000 });
        expect(await status.textContent()).not.toMatch(/Watch|Lasts the forecast/);
        await page.getByText('enter the contents to forecast this source').first().waitFor();
        expect(errors).toEqual([]);
      } finally {
        // the demo data other browser tests read stays as seeded: the tank leaves the overview again
        const off = await context.request.put(`${baseUrl}/api/sources/${source.id}`, { headers: { [CSRF_HEADER]: csrf }, data: { ...body, active: false } });
        expect(off.status()).toBe(200);
        await context.close();
      }
    });
  }
});
