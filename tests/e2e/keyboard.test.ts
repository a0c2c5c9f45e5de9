import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { DESKTOP, launchBrowser, screenshot, watchErrors } from '../support/browser';
import { DEMO_EMAIL, DEMO_PASSWORD, type DemoUser } from './screens';

/**
 * Keyboard-only journeys: no mouse, only Tab, typing and Enter. Every element that takes the focus on
 * the way shows where the focus is (WCAG 2.4.7).
 */
const baseUrl = inject('baseUrl');
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

interface Focused {
  tag: string;
  label: string;
  href: string | null;
  visibleFocus: boolean;
}

async function focused(page: Page): Promise<Focused> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return { tag: 'body', label: '', href: null, visibleFocus: true };
    const s = getComputedStyle(el);
    const ring = (s.outlineStyle !== 'none' && parseFloat(s.outlineWidth) > 0) || (s.boxShadow !== 'none' && s.boxShadow !== '');
    const label = (el.getAttribute('aria-label') || (el as HTMLInputElement).labels?.[0]?.textContent || el.textContent || '').trim().replace(/\s+/g, ' ');
    return { tag: el.tagName.toLowerCase(), label, href: el.getAttribute('href'), visibleFocus: ring };
  });
}

/** Presses Tab until `wanted` matches the focused element; every stop on the way must show its focus. */
async function tabTo(page: Page, wanted: (f: Focused) => boolean, what: string, max = 80): Promise<void> {
  const path: string[] = [];
  for (let i = 0; i < max; i++) {
    await page.keyboard.press('Tab');
    const f = await focused(page);
    path.push(`${f.tag} "${f.label.slice(0, 40)}"`);
    if (f.tag !== 'body') expect(f.visibleFocus, `no visible focus on ${f.tag} "${f.label}"`).toBe(true);
    if (wanted(f)) return;
  }
  throw new Error(`Tab never reached ${what}; the focus went: ${path.join(' → ')}`);
}

async function signInByKeyboard(page: Page, user: DemoUser): Promise<void> {
  await page.goto(baseUrl + '/sign-in');
  await page.getByRole('heading', { name: 'Sign in' }).waitFor();
  await tabTo(page, (f) => f.tag === 'input' && /e-mail/i.test(f.label), 'the e-mail field');
  await page.keyboard.type(DEMO_EMAIL[user]);
  await tabTo(page, (f) => f.tag === 'input' && /password/i.test(f.label), 'the password field', 5);
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
}

describe('keyboard only', () => {
  it('signs in, reaches Today and signs out', async () => {
    const context = await browser.newContext({ viewport: DESKTOP });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signInByKeyboard(page, 'ward');
    await page.getByRole('heading', { name: 'Today', exact: true }).waitFor({ timeout: 20_000 });
    await screenshot(page, 'keyboard-signed-in-desktop');
    await tabTo(page, (f) => f.tag === 'button' && /sign out/i.test(f.label), 'the sign-out button', 120);
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/sign-in/);
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a purchasing officer opens a request from the list and approves it', async () => {
    // A request awaiting approval of its own, raised through the API by the facilities manager.
    const setup: BrowserContext = await browser.newContext();
    const login = await setup.request.post(`${baseUrl}/api/auth/login`, { data: { email: DEMO_EMAIL.facilities, password: DEMO_PASSWORD } });
    const csrf = (await login.json()).csrfToken as string;
    const overview = await (await setup.request.get(`${baseUrl}/api/overview`)).json();
    const sourceIds: number[] = overview.sites.flatMap((s: { sources: { id: number }[] }) => s.sources.map((x) => x.id));
    let requestId: number | null = null;
    for (const sourceId of sourceIds) {
      const res = await setup.request.post(`${baseUrl}/api/requests`, {
        data: { sourceId, submit: true, note: 'keyboard journey' },
        headers: { 'x-csrf-token': csrf },
      });
      const body = await res.json();
      if (res.ok() && body.status === 'submitted') {
        requestId = body.id;
        break;
      }
    }
    await setup.close();
    expect(requestId, 'no demo source could take a new request').not.toBeNull();

    const context = await browser.newContext({ viewport: DESKTOP });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signInByKeyboard(page, 'purchasing');
    await page.getByRole('heading', { name: 'Today', exact: true }).waitFor({ timeout: 20_000 });
    await tabTo(page, (f) => f.href === '/orders', 'Orders in the menu', 120);
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/orders$/);
    await page.waitForLoadState('networkidle');
    await tabTo(page, (f) => f.href === `/orders/requests/${requestId}`, `request ${requestId} in the list`, 200);
    await page.keyboard.press('Enter');
    await page.waitForURL(new RegExp(`/orders/requests/${requestId}$`));
    await page.waitForLoadState('networkidle');
    await tabTo(page, (f) => f.tag === 'button' && /^Approve\b/.test(f.label), 'the Approve button', 120);
    await screenshot(page, 'keyboard-approve-focused-desktop');
    await page.keyboard.press('Enter');
    await page
      .getByText(/Approved: |First approval recorded/)
      .first()
      .waitFor({ timeout: 20_000 });
    await screenshot(page, 'keyboard-approved-desktop');

    const after = await (await context.request.get(`${baseUrl}/api/requests/${requestId}`)).json();
    expect(after.approvals.length).toBeGreaterThanOrEqual(1);
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a ward lead files the day’s usage report from the menu, changing a count with the keyboard', async () => {
    const context = await browser.newContext({ viewport: DESKTOP });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signInByKeyboard(page, 'ward');
    await page.getByRole('heading', { name: 'Today', exact: true }).waitFor({ timeout: 20_000 });
    await tabTo(page, (f) => f.href === '/report', 'Report in the menu', 120);
    await page.keyboard.press('Enter');
    await page.getByRole('heading', { name: 'Daily report' }).waitFor({ timeout: 20_000 });
    await page.waitForLoadState('networkidle');
    const ward = await page.getByLabel('Ward', { exact: true }).evaluate((el) => (el as HTMLSelectElement).selectedOptions[0].textContent ?? '');
    const before = Number(await page.getByLabel('Now', { exact: true }).first().inputValue());
    await tabTo(page, (f) => f.tag === 'button' && f.label === 'Now: one more', 'the first “one more” button', 120);
    await page.keyboard.press('Enter');
    await tabTo(page, (f) => f.tag === 'button' && /^File the report/.test(f.label), 'the File button', 200);
    await screenshot(page, 'keyboard-report-file-focused-desktop');
    await page.keyboard.press('Enter');
    await page.getByRole('status').filter({ hasText: 'Report filed' }).waitFor({ timeout: 20_000 });
    await screenshot(page, 'keyboard-report-filed-desktop');

    // The report holds the changed count, and the ward is filed for today.
    const me = await (await context.request.get(`${baseUrl}/api/auth/me`)).json();
    const status = await (await context.request.get(`${baseUrl}/api/sites/${me.sites[0].id}/usage-status`)).json();
    const row = status.wards.find((w: { name: string }) => ward.startsWith(w.name));
    expect(row?.reportId, JSON.stringify(status.wards)).toBeTruthy();
    const report = await (await context.request.get(`${baseUrl}/api/usage-reports/${row.reportId}`)).json();
    expect(report.devices[0].patientsNow).toBe(before + 1);
    expect(errors).toEqual([]);
    await context.close();
  });

  it('an administrator grants a ward lead one more ward with the keyboard', async () => {
    const context = await browser.newContext({ viewport: DESKTOP });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signInByKeyboard(page, 'admin');
    await page.getByRole('heading', { name: 'Today', exact: true }).waitFor({ timeout: 20_000 });
    const users = await (await context.request.get(`${baseUrl}/api/users?q=${encodeURIComponent(DEMO_EMAIL.ward)}`)).json();
    const lead = users.items.find((u: { email: string }) => u.email === DEMO_EMAIL.ward) as { id: number; name: string };
    const before = await (await context.request.get(`${baseUrl}/api/users/${lead.id}/wards`)).json();
    const extra = (before.sites as { wards: { id: number; name: string }[] }[]).flatMap((s) => s.wards).find((w) => !before.wardIds.includes(w.id));
    expect(extra, 'the demo has a ward the ward lead is not granted').toBeDefined();

    await tabTo(page, (f) => f.href === '/admin/users', 'Users in the menu', 120);
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/admin\/users/);
    await page.waitForLoadState('networkidle');
    await tabTo(page, (f) => f.tag === 'button' && f.label === `Wards of ${lead.name}`, 'the Wards button of the ward lead', 200);
    await page.keyboard.press('Enter');
    await page.getByRole('dialog').getByRole('button', { name: 'Save wards' }).waitFor({ timeout: 20_000 });
    await tabTo(page, (f) => f.tag === 'input' && f.label === extra!.name, `the checkbox of ${extra!.name}`, 200);
    await page.keyboard.press('Space');
    await tabTo(page, (f) => f.tag === 'button' && f.label === 'Save wards', 'the Save wards button', 200);
    await screenshot(page, 'keyboard-ward-grants-desktop');
    await page.keyboard.press('Enter');
    await page.getByText(`${lead.name} now reports for ${before.wardIds.length + 1} wards.`).waitFor({ timeout: 20_000 });

    const after = await (await context.request.get(`${baseUrl}/api/users/${lead.id}/wards`)).json();
    expect([...after.wardIds].sort()).toEqual([...before.wardIds, extra!.id].sort());
    // Leave the demo as it was for the other journeys.
    const csrf = (await (await context.request.get(`${baseUrl}/api/auth/csrf`)).json()).token as string;
    const restored = await context.request.put(`${baseUrl}/api/users/${lead.id}/wards`, {
      data: { wardIds: before.wardIds },
      headers: { 'x-csrf-token': csrf },
    });
    expect(restored.ok()).toBe(true);
    expect(errors).toEqual([]);
    await context.close();
  });
});
