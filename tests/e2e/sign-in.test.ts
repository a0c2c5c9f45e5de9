import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { DESKTOP, launchBrowser, PHONE, screenshot, watchErrors } from '../support/browser';

const DEMO = [
  ['facilities@plenum.example', 'facilities'],
  ['ward@plenum.example', 'ward'],
  ['purchasing@plenum.example', 'purchasing'],
  ['biomed@plenum.example', 'biomed'],
  ['admin@plenum.example', 'admin'],
] as const;

let browser: Browser;
const baseUrl = inject('baseUrl');

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('sign in as each demo role, reach the overview, sign out', () => {
  for (const [email, name] of DEMO) {
    for (const [device, viewport] of [
      ['desktop', DESKTOP],
      ['phone', PHONE],
    ] as const) {
      it(`${name} on a ${device}`, async () => {
        const context = await browser.newContext({ viewport });
        context.setDefaultTimeout(45_000);
        const page = await context.newPage();
        const errors = watchErrors(page);
        await page.goto(baseUrl + '/', { waitUntil: 'domcontentloaded' });
        // Signed out, the app sends us to the sign-in page.
        await page.getByLabel('E-mail').waitFor();
        expect(page.url()).toMatch(/\/sign-in/);
        await page.getByLabel('E-mail').fill(email);
        await page.getByLabel('Password').fill('demo-plenum');
        await page.getByRole('button', { name: 'Sign in' }).click();
        await page.getByRole('heading', { name: 'Today', exact: true }).waitFor({ timeout: 20_000 });
        // The overview lists the demo sources with their status in words.
        await page
          .getByText(/Main VIE|Clinic oxygen manifold/)
          .first()
          .waitFor({ timeout: 20_000 });
        await screenshot(page, `overview-${name}-${device}`);
        if (device === 'phone') await page.getByRole('button', { name: 'Menu' }).click();
        await page.getByRole('button', { name: 'Sign out' }).first().click();
        await page.waitForURL(/\/sign-in/);
        await screenshot(page, `signed-out-${name}-${device}`);
        const me = await page.request.get(baseUrl + '/api/auth/me');
        expect(me.status()).toBe(401);
        expect(errors).toEqual([]);
        await context.close();
      });
    }
  }

  it('a wrong password shows a clear message and stays on the sign-in page', async () => {
    const context = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    await page.goto(baseUrl + '/sign-in');
    await page.getByLabel('E-mail').fill('ward@plenum.example');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText(/E-mail or password is not right/).waitFor();
    await screenshot(page, 'sign-in-wrong-password-phone');
    expect(page.url()).toMatch(/\/sign-in/);
    await context.close();
  });
});
