import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { APIRequestContext, Browser } from 'playwright-core';
import { DESKTOP, launchBrowser, screenshot } from '../support/browser';
import { DEMO_EMAIL, DEMO_PASSWORD, type DemoUser } from './screens';

/**
 * Text that people type is shown as text: a site, a ward and a supplier named like an HTML injection
 * appear on their screens as those characters, no element is made of them and no script runs.
 */
const PAYLOAD = '<img src=x onerror=alert(1)>';
const baseUrl = inject('baseUrl');
let browser: Browser;

async function api(request: APIRequestContext, user: DemoUser) {
  const login = await request.post(`${baseUrl}/api/auth/login`, { data: { email: DEMO_EMAIL[user], password: DEMO_PASSWORD } });
  if (!login.ok()) throw new Error(`sign-in failed: ${login.status()}`);
  const csrf = (await login.json()).csrfToken as string;
  return {
    get: async (path: string) => (await request.get(baseUrl + path)).json(),
    post: async (path: string, data: unknown) => {
      const res = await request.post(baseUrl + path, { data, headers: { 'x-csrf-token': csrf } });
      const body = await res.json();
      if (!res.ok()) throw new Error(`POST ${path}: ${res.status()} ${JSON.stringify(body)}`);
      return body;
    },
  };
}

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('HTML in names is shown as text', () => {
  it('a site, a ward and a supplier named like an injection: the text on screen, no element, no dialog', async () => {
    const tag = Date.now().toString(36);
    const setup = await browser.newContext();
    const admin = await api(setup.request, 'admin');
    // Named to sort last, so that the demo sites stay first in every list other journeys read.
    await admin.post('/api/sites', {
      name: `Zz ${PAYLOAD} site ${tag}`,
      kind: 'clinic',
      address: PAYLOAD,
      timeZone: 'Europe/London',
      referenceCode: '15C',
      unitSystem: 'metric',
      altitudeM: 0,
      currency: 'GBP',
      cylinderColours: 'ISO32',
      storeTemperatureC: 15,
    });
    await admin.post('/api/suppliers', {
      name: `${PAYLOAD} supplier ${tag}`,
      orderEmail: `orders-${tag}@supplier.example`,
      leadTimeHours: 24,
      currency: 'GBP',
    });
    await setup.close();
    const fmContext = await browser.newContext();
    const fm = await api(fmContext.request, 'facilities');
    const me = await fm.get('/api/auth/me');
    const siteId = me.sites[0].id as number;
    await fm.post(`/api/sites/${siteId}/wards`, { name: `${PAYLOAD} ward ${tag}`, department: 'ward', beds: 8 });
    await fmContext.close();

    const screens: [DemoUser, string, string, string][] = [
      ['admin', '/admin/sites', `site ${tag}`, 'Zz '],
      ['admin', '/admin/suppliers', `supplier ${tag}`, ''],
      ['facilities', `/sites/${siteId}/wards`, `ward ${tag}`, ''],
    ];
    for (const [user, path, name, prefix] of screens) {
      const context = await browser.newContext({ viewport: DESKTOP });
      const login = await context.request.post(`${baseUrl}/api/auth/login`, { data: { email: DEMO_EMAIL[user], password: DEMO_PASSWORD } });
      expect(login.ok()).toBe(true);
      const page = await context.newPage();
      const dialogs: string[] = [];
      page.on('dialog', (d) => {
        dialogs.push(d.message());
        void d.dismiss();
      });
      await page.goto(baseUrl + path);
      await page.waitForLoadState('networkidle');
      await page.getByText(`${prefix}${PAYLOAD} ${name}`).filter({ visible: true }).first().waitFor({ timeout: 20_000 });
      await screenshot(page, `escaping-${path.split('/').filter(Boolean).join('-')}-desktop`);
      expect(await page.locator('img[src="x"]').count(), `an element was made from the name on ${path}`).toBe(0);
      await page.waitForTimeout(500);
      expect(dialogs, `a script ran on ${path}`).toEqual([]);
      await context.close();
    }
  });
});
