import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@common/api/roles';
import { routeTable } from '@backend/routes';
import type { RouteDef } from '@backend/http/route';
import { Client, createTestOrg, PASSWORD, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';
import { idFixtures, type IdFixtures } from '../support/fixtures';

/**
 * Names that every JavaScript object answers through its prototype. A request value looked up as a key
 * of a plain object (`SORTABLE[q.sort]`) finds `Object.prototype` or one of its methods instead of
 * nothing; a library that then writes onto what it found poisons every object of the process. Each of
 * these words goes into every query value and every path segment of every GET route of the route table,
 * as an administrator and as a facilities manager: never a 500, and afterwards the same process still
 * signs in and reads.
 */
const POISON = ['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf'];
/** Query keys of the list and report routes (the shared query schemas), each poisoned on its own. */
const QUERY_KEYS = [
  'sort',
  'dir',
  'q',
  'page',
  'pageSize',
  'siteId',
  'entity',
  'scenario',
  'kind',
  'status',
  'from',
  'to',
  'table',
  'date',
  'days',
  'draws',
  'horizonDays',
  'flowPerPatientLMin',
  'vaporiserDerating',
  'peakHoursPerDay',
  'download',
];
const ROLES: Role[] = ['administrator', 'facilities_manager'];
const PARALLEL = 6;

let app: TestApp;
let org: TestOrg;
let ids: IdFixtures;
const clients = new Map<Role, Client>();

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds, 1);
  ids = await idFixtures(app.ds, org);
  for (const role of ROLES) clients.set(role, await signedIn(app, org.users[role]));
}, 60_000);
afterAll(async () => {
  await app?.close();
});

const getRoutes = routeTable().filter((r) => r.method === 'get');

function fixtureFor(route: RouteDef, name: string): string {
  try {
    return String(ids.forParam(route.path, name));
  } catch {
    return '2147483000';
  }
}

/** Every address to try on one route: each `:param` poisoned in turn, all of them, and an extra segment. */
function poisonedPaths(route: RouteDef, word: string): string[] {
  const params = [...route.path.matchAll(/:(\w+)/g)].map((m) => m[1]);
  const withValues = (poisoned: Set<string>) =>
    route.path.replace(/:(\w+)/g, (_m, name: string) => (poisoned.has(name) ? encodeURIComponent(word) : fixtureFor(route, name)));
  const out = new Set<string>();
  for (const p of params) out.add(withValues(new Set([p])));
  if (params.length > 1) out.add(withValues(new Set(params)));
  out.add(`${withValues(new Set())}/${encodeURIComponent(word)}`);
  return [...out];
}

/** The list keys, each poisoned on its own as well (a route may read one only when the others are absent). */
const LIST_KEYS = ['sort', 'dir', 'q', 'page', 'pageSize'];

/** Query strings sent with the poisoned key set, whatever the route refused. */
function extraQueries(word: string): string[] {
  const w = encodeURIComponent(word);
  return [...LIST_KEYS.map((k) => `?${k}=${w}`), `?${w}=1`, `?${w}[${w}]=1`, `?sort=${w}&dir=desc`];
}

const query = (keys: string[], word: string) => `?${keys.map((k) => `${k}=${encodeURIComponent(word)}`).join('&')}`;

/**
 * Every query key poisoned at once; the keys the route refuses (400 naming them) are dropped and the rest
 * sent again, until the route accepts what is left: so each key the route accepts reaches its handler
 * poisoned, at a few requests per word instead of one per key.
 */
async function poisonQueryKeys(client: Client, base: string, word: string, fail: (path: string, status: number, body: unknown) => void): Promise<void> {
  let keys = [...QUERY_KEYS];
  for (let round = 0; round < 6 && keys.length; round++) {
    const path = base + query(keys, word);
    const res = await client.get(path);
    if (res.status >= 500) fail(path, res.status, res.body);
    if (res.status !== 400) return;
    const refused = new Set(((res.body?.error?.details ?? []) as { path: string }[]).map((d) => String(d.path).split('.')[0]));
    const left = keys.filter((k) => !refused.has(k));
    if (left.length === keys.length) return;
    keys = left;
  }
}

/** True while the process still serves reads for another session (and, with `signIn`, a fresh sign-in). */
async function stillServes(reader: Client, signIn = false): Promise<string | null> {
  let c = reader;
  if (signIn) {
    c = new Client(app.baseUrl);
    const login = await c.login(org.users.administrator, PASSWORD);
    if (login.status !== 200) return `sign-in answered ${login.status} ${JSON.stringify(login.body).slice(0, 200)}`;
  }
  for (const path of ['/api/auth/me', '/api/users', '/api/sites', `/api/sites/${org.siteIds[0]}/sources`]) {
    const res = await c.get(path);
    if (res.status !== 200) return `GET ${path} answered ${res.status} ${JSON.stringify(res.body).slice(0, 200)}`;
  }
  return null;
}

async function inParallel<T>(items: T[], n: number, f: (item: T) => Promise<void>): Promise<void> {
  let next = 0;
  await Promise.all(
    Array.from({ length: n }, async () => {
      while (next < items.length) await f(items[next++]);
    }),
  );
}

describe('prototype names in every query value and path segment of every GET route', () => {
  it('has GET routes to try', () => {
    expect(getRoutes.length).toBeGreaterThan(30);
  });

  for (const role of ROLES) {
    it(`as ${role}: no 500, and the process still signs in and reads after each route`, async () => {
      const client = clients.get(role)!;
      const reader = await signedIn(app, org.users.administrator);
      const failures: string[] = [];
      const fail = (path: string, status: number, body: unknown) => failures.push(`GET ${path} as ${role} → ${status} ${JSON.stringify(body).slice(0, 200)}`);
      for (const route of getRoutes) {
        const t0 = Date.now();
        const base = route.path.replace(/:(\w+)/g, (_m, name: string) => fixtureFor(route, name));
        const requests: string[] = [];
        for (const word of POISON) requests.push(...poisonedPaths(route, word), ...extraQueries(word).map((q) => base + q));
        await inParallel(requests, PARALLEL, async (path) => {
          const res = await client.get(path);
          if (res.status >= 500) fail(path, res.status, res.body);
        });
        await inParallel(POISON, PARALLEL, (word) => poisonQueryKeys(client, base, word, fail));
        if (process.env.POISON_TIMING) console.info(`${route.path} ${Date.now() - t0} ms`);
        const broken = await stillServes(reader);
        if (broken) failures.push(`after GET ${route.path} with prototype names as ${role}, the process no longer serves: ${broken}`);
        expect(broken, failures.join('\n')).toBeNull(); // a poisoned process fails every later check: stop here
      }
      expect(failures, failures.join('\n')).toEqual([]);
      expect(await stillServes(reader, true)).toBeNull();
      const health = await new Client(app.baseUrl).get('/api/health');
      expect(health.status, JSON.stringify(health.body)).toBe(200);
    }, 120_000);
  }

  it('/api/health reports down while the app cannot serve a read, and ok again once it can', async () => {
    // What `addOrderBy('a.id', 'DESC')` left behind when the sort look-up handed TypeORM Object.prototype
    // as its order map: an inherited key that every later find option walk then meets.
    const proto = Object.prototype as Record<string, unknown>;
    proto['a.id'] = 'DESC';
    let health;
    try {
      health = await new Client(app.baseUrl).get('/api/health');
    } finally {
      delete proto['a.id'];
    }
    expect(health.status, JSON.stringify(health.body)).toBe(503);
    expect(health.body.status).toBe('down');
    expect(health.body.database.ok).toBe(false);
    expect(health.body.database.message).toMatch(/cannot read/);
    const again = await new Client(app.baseUrl).get('/api/health');
    expect(again.status, JSON.stringify(again.body)).toBe(200);
    expect(again.body.database.ok).toBe(true);
  });

  it('an unknown sort key is a clear 400 naming the keys that sort', async () => {
    const admin = clients.get('administrator')!;
    for (const path of ['/api/users', '/api/audit', '/api/mail']) {
      const res = await admin.get(`${path}?sort=__proto__`);
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      expect(res.body.error.details[0].path).toBe('sort');
      expect(res.body.error.message).toMatch(/sort/);
    }
    // a known key still sorts
    expect((await admin.get('/api/users?sort=email&dir=desc')).status).toBe(200);
    expect((await admin.get('/api/audit?sort=at')).status).toBe(200);
    expect((await admin.get('/api/mail?sort=subject')).status).toBe(200);
  });
});
