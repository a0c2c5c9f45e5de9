import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { DESKTOP, launchBrowser, PHONE, screenshot, watchErrors } from '../support/browser';
import { apiOf, DEMO_EMAIL, DEMO_PASSWORD, SCREENS, type DemoUser, type Screen } from './screens';

/**
 * Every screen of the front end, signed in as a demo user who may use it, at phone and desktop width:
 * axe-core finds no serious or critical violation of WCAG 2.1 A/AA; status colours always come with
 * words; a screenshot of each goes into the test output (screenshots/screen-NAME-WIDTH.png).
 */
const require = createRequire(import.meta.url);
const AXE_SOURCE = readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');
const baseUrl = inject('baseUrl');
let browser: Browser;
const contexts = new Map<string, BrowserContext>();

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  for (const c of contexts.values()) await c.close();
  await browser?.close();
});

/** One signed-in browser context per user and width (signing in once each). */
async function contextFor(user: DemoUser | null, viewport: { width: number; height: number }): Promise<BrowserContext> {
  const key = `${user}-${viewport.width}`;
  const known = contexts.get(key);
  if (known) return known;
  // The app's CSP allows no inline script: let the test inject axe-core's source.
  const context = await browser.newContext({ viewport, bypassCSP: true });
  if (user) {
    const res = await context.request.post(`${baseUrl}/api/auth/login`, { data: { email: DEMO_EMAIL[user], password: DEMO_PASSWORD } });
    if (!res.ok()) throw new Error(`sign-in of ${user} failed: ${res.status()}`);
  }
  contexts.set(key, context);
  return context;
}

async function resolvePath(screen: Screen, context: BrowserContext): Promise<string | null> {
  return typeof screen.path === 'string' ? screen.path : screen.path(apiOf(context.request, baseUrl));
}

/** Opens a screen and waits until its data is shown (no request in flight, a heading, no loading spinner). */
async function open(page: Page, path: string): Promise<void> {
  await page.goto(baseUrl + path);
  await page.waitForLoadState('networkidle');
  await page.locator('h1').first().waitFor({ timeout: 20_000 });
  await page.waitForFunction(() => !document.querySelector('[aria-busy="true"]'), null, { timeout: 20_000 }).catch(() => undefined);
  await page.waitForTimeout(300); // charts and lazy panels settle
}

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[]; html: string; failureSummary?: string }[];
}

async function axeViolations(page: Page): Promise<AxeViolation[]> {
  if (!(await page.evaluate(() => 'axe' in window))) await page.addScriptTag({ content: AXE_SOURCE });
  return page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: unknown) => Promise<{ violations: AxeViolation[] }> } }).axe;
    const r = await axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] }, resultTypes: ['violations'] });
    return r.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      nodes: v.nodes.slice(0, 5).map((n) => ({ target: n.target, html: n.html.slice(0, 200), failureSummary: n.failureSummary })),
    }));
  });
}

/**
 * Elements painted in a status colour (ok, watch, warn, critical) that carry no words: a coloured dot, bar
 * or edge must sit in an element that says the status too (WCAG 1.4.1, use of colour).
 */
async function colourOnlyStatus(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const tone = /(^|\s)(bg|border-l|border|text|fill|stroke|outline)-(ok|watch|warn|critical)(-soft)?(\/\d+)?(?=\s|$)/;
    const visible = (el: Element) => {
      const r = el.getBoundingClientRect();
      const s = getComputedStyle(el);
      return r.width > 0 && r.height > 0 && s.visibility !== 'hidden' && s.display !== 'none';
    };
    const says = (el: Element) =>
      (el.textContent ?? '').trim().length > 0 || el.getAttribute('aria-label') || el.getAttribute('title') || el.querySelector('title,[aria-label]');
    const out: string[] = [];
    for (const el of Array.from(document.querySelectorAll('[class]'))) {
      const cls = el.getAttribute('class') ?? '';
      if (!tone.test(cls) || !visible(el)) continue;
      // A decoration beside its words (an icon in a badge, a bar in a labelled row) is fine.
      const scope = el.closest('article, li, tr, [role="status"], [role="alert"], section') ?? el.parentElement;
      if (says(el) || (el.getAttribute('aria-hidden') === 'true' && scope && says(scope))) continue;
      if (scope && scope !== document.body && says(scope)) continue;
      out.push(`${el.tagName.toLowerCase()}.${cls.split(/\s+/).slice(0, 6).join('.')}`);
    }
    return out;
  });
}

describe('every screen is in the list', () => {
  it('each route of the router has an entry in tests/e2e/screens.ts', () => {
    const router = readFileSync(fileURLToPath(new URL('../../frontend/src/app/router.tsx', import.meta.url)), 'utf8');
    const routes = [...router.matchAll(/\{\s*(?:path:\s*'([^']+)'|index:\s*true)\s*,\s*lazy:\s*\(\)\s*=>\s*import\('\.\/routes\/([^']+)'\)/g)]
      .filter((m) => m[2] !== 'current-site-redirect' && m[2] !== 'app-layout') // a redirect shows its target's screen
      .map((m) => m[1] ?? '/');
    expect(routes.length).toBeGreaterThan(10);
    const listed = new Set(SCREENS.map((s) => s.route));
    expect(routes.filter((r) => !listed.has(r))).toEqual([]);
  });
});

describe('accessibility of every screen (axe-core, WCAG 2.1 AA)', () => {
  for (const screen of SCREENS) {
    for (const [device, viewport] of [
      ['desktop', DESKTOP],
      ['phone', PHONE],
    ] as const) {
      it(`${screen.name} on a ${device}: no serious or critical violation, status in words`, async (ctx) => {
        const context = await contextFor(screen.as, viewport);
        const path = await resolvePath(screen, context);
        if (!path) return ctx.skip(`${screen.name}: the demo organisation has no record to show`);
        const page = await context.newPage();
        const errors = watchErrors(page);
        try {
          await open(page, path);
          await screenshot(page, `screen-${screen.name}-${device}`);
          const serious = (await axeViolations(page)).filter((v) => v.impact === 'serious' || v.impact === 'critical');
          expect(
            serious.map(
              (v) => `${v.impact} ${v.id}: ${v.help}\n${v.nodes.map((n) => `   ${n.target.join(' ')} ${n.html}\n   ${n.failureSummary ?? ''}`).join('\n')}`,
            ),
          ).toEqual([]);
          expect(await colourOnlyStatus(page)).toEqual([]);
          expect(errors.filter((e) => !/status of 404/.test(e) || screen.name !== 'not-found')).toEqual([]);
        } finally {
          await page.close();
        }
      });
    }
  }

  it('Today says each source’s status in words', async () => {
    const context = await contextFor('facilities', DESKTOP);
    const page = await context.newPage();
    await open(page, '/');
    const cards = page.locator('main article');
    expect(await cards.count()).toBeGreaterThan(2);
    for (const text of await cards.allInnerTexts()) expect(text).toMatch(/\b(Critical|Reorder now|Watch|OK)\b/);
    await page.close();
  });
});
