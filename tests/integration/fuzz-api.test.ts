import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { Role } from '@common/api/roles';
import { routeTable } from '@backend/routes';
import type { RouteDef } from '@backend/http/route';
import { ALL_ROLES, Client, createTestOrg, PASSWORD, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';
import { idFixtures, type IdFixtures } from '../support/fixtures';

/**
 * Random bodies against every JSON route that takes one (POST, PUT, PATCH of the route table), sent by a
 * user whose role may call the route: never a 500; a refusal is a clear 4xx with the error shape; and a
 * refused request writes nothing (row count and checksum of every table before and after).
 *
 * Bodies are not only arbitrary JSON: most are objects built from the field names and enum values of the
 * shared request schemas with wrong, extreme or plausible values, so they get past the first checks.
 * Bounded: BODIES_PER_ROUTE bodies per route, fixed seed (a failure names the body and can be replayed);
 * FUZZ_BODIES and FUZZ_SEED widen the search by hand.
 *
 * Then random query strings and path segments against every route (GET routes get both; other routes
 * with a `:param` get random segments and an empty body): never a 500, a clear 4xx. After each route's
 * batch the same process must still sign a user in and serve a read: a request that corrupts shared
 * state (a polluted prototype) fails here even when it answered politely itself. FUZZ_QUERIES widens it.
 */
const BODIES_PER_ROUTE = Number(process.env.FUZZ_BODIES ?? 15);
const QUERIES_PER_ROUTE = Number(process.env.FUZZ_QUERIES ?? 12);
const SEED = Number(process.env.FUZZ_SEED ?? 4242);
/** Refusals a client can act on; anything else (a 500, a 403 from a role that may call the route) fails. */
const CLEAR_REFUSALS = [400, 404, 409, 413, 415, 422, 423];
/** Tables that change on any request and are not data: sessions, the sign-in rate counter and the failed sign-ins of unknown e-mails. */
const VOLATILE_TABLES = new Set(['sessions', 'rate_limit_hit', 'sign_in_unknown']);

let app: TestApp;
let org: TestOrg;
let ids: IdFixtures;
const clients = new Map<Role, Client>();
let tables: string[] = [];

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds, 2);
  ids = await idFixtures(app.ds, org);
  for (const role of ALL_ROLES) clients.set(role, await signedIn(app, org.users[role]));
  const rows: { name: string }[] = await app.ds.query(
    `SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name`,
  );
  tables = rows.map((r) => r.name).filter((t) => !VOLATILE_TABLES.has(t));
  // Approval creates the organisation's purchase-order counter row (at 0) before its transaction, by
  // design; create it here so that the check still sees a number consumed by a refused approval.
  if (tables.includes('po_sequence')) await app.ds.query('INSERT IGNORE INTO po_sequence (organisation_id, last_value) VALUES (?, 0)', [org.organisationId]);
}, 120_000);
afterAll(async () => {
  await app?.close();
});

// ---- the vocabulary of the shared request schemas -------------------------------------------------

const schemaDir = fileURLToPath(new URL('../../common/src/schemas/', import.meta.url));
const schemaText = readdirSync(schemaDir)
  .filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts'))
  .map((f) => readFileSync(schemaDir + f, 'utf8'))
  .join('\n');
const FIELD_NAMES = [...new Set([...schemaText.matchAll(/^\s+([a-zA-Z_]\w*)\??\s*:/gm)].map((m) => m[1]))];
const WORDS = [...new Set([...schemaText.matchAll(/'([A-Za-z_][\w-]{0,30})'/g)].map((m) => m[1]))];

function fixtureIds(): number[] {
  return [...new Set(Object.values(ids.byResource))];
}

const primitive = () =>
  fc.oneof(
    fc.constant(null),
    fc.boolean(),
    fc.integer({ min: -5, max: 5000 }),
    fc.double({ noNaN: true, noDefaultInfinity: true }),
    fc.constantFrom(0, -1, 1e308, -1e308, 2 ** 31, 2 ** 53, 0.5, 15, 200),
    fc.constantFrom(...fixtureIds(), 2 ** 31 - 1),
    fc.string({ maxLength: 20 }),
    fc.constantFrom(...WORDS),
    fc.constantFrom(
      '',
      ' ',
      'x'.repeat(5000),
      '2027-01-04T00:00',
      '2027-01-04',
      '2027-13-45T25:61',
      '2027-01-04T00:00:00.000Z',
      'Europe/London',
      'Not/AZone',
      '<img src=x onerror=alert(1)>',
      "'; DROP TABLE site; --",
      '__proto__',
      '\u0000',
      '😀',
    ),
  );

const objectOf = (value: fc.Arbitrary<unknown>) => fc.dictionary(fc.constantFrom(...FIELD_NAMES), value, { maxKeys: 10 });

/**
 * Bodies for one route. `routeKeys` are the fields the route itself asks for (learnt from its refusal of
 * `{}`): objects with some of them and wrong or plausible values reach the checks behind the first one.
 */
const bodyArb = (routeKeys: string[]) => {
  const prim = primitive();
  const leafObject = objectOf(prim);
  const value = fc.oneof(
    { weight: 6, arbitrary: prim },
    { weight: 1, arbitrary: leafObject },
    { weight: 1, arbitrary: fc.array(fc.oneof(prim, leafObject), { maxLength: 4 }) },
  );
  const ofRoute = routeKeys.length ? fc.record(Object.fromEntries(routeKeys.map((k) => [k, value])), { requiredKeys: [] }) : objectOf(value);
  return fc.oneof(
    { weight: 8, arbitrary: ofRoute },
    { weight: 3, arbitrary: objectOf(value) },
    { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
    { weight: 1, arbitrary: fc.constantFrom('{"a":', '[]', 'null', '"text"', '42', '{}') },
  );
};

// ---- query strings and path segments ----------------------------------------------------------------

/** Names every plain object answers through its prototype. */
const PROTOTYPE_NAMES = ['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf'];
/** Query keys of the list and report routes (tried most), then every field name of the shared schemas. */
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
  'download',
];

const oddText = () =>
  fc.oneof(
    fc.string({ maxLength: 20 }),
    fc.constantFrom(...PROTOTYPE_NAMES),
    fc.constantFrom(...PROTOTYPE_NAMES),
    fc.constantFrom(...WORDS),
    fc.integer({ min: -5, max: 5000 }).map(String),
    fc.constantFrom(
      '',
      ' ',
      '0',
      '-1',
      '1.5',
      '1e3',
      '2147483648',
      '99999999999999999999',
      'NaN',
      'Infinity',
      'null',
      'true',
      '[]',
      '{}',
      '..',
      '.',
      '%',
      '%zz',
      '\u0000',
      '😀',
      'x'.repeat(300),
      '2027-01-04',
      '2027-13-45',
      "'; DROP TABLE site; --",
      '<script>',
    ),
  );

/** A query string: mostly one odd value on a list key (what the handler then looks up), else a few pairs of
 * known keys, schema field names, prototype names or random keys (some with bracket suffixes). */
const LIST_KEYS = ['sort', 'dir', 'q', 'page', 'pageSize'];
const queryArb = () => {
  const key = fc.oneof(
    { weight: 6, arbitrary: fc.constantFrom(...LIST_KEYS) },
    { weight: 3, arbitrary: fc.constantFrom(...QUERY_KEYS) },
    { weight: 2, arbitrary: fc.constantFrom(...FIELD_NAMES) },
    { weight: 1, arbitrary: fc.constantFrom(...PROTOTYPE_NAMES) },
    { weight: 1, arbitrary: fc.string({ maxLength: 8 }) },
  );
  const pair = fc.tuple(key, fc.constantFrom('', '', '', '', '[]', '[__proto__]', '[x]'), oddText());
  return fc
    .oneof({ weight: 2, arbitrary: pair.map((p) => [p]) }, { weight: 2, arbitrary: fc.array(pair, { maxLength: 5 }) })
    .map((pairs) =>
      pairs.length ? `?${pairs.map(([k, suffix, v]) => `${encodeURIComponent(k)}${suffix}=${v === '%zz' ? v : encodeURIComponent(v)}`).join('&')}` : '',
    );
};

/** One path segment: often the fixture's id (so the handler runs), otherwise something odd. */
const segmentArb = (fixture: string) =>
  fc.oneof(
    { weight: 2, arbitrary: fc.constant(fixture) },
    { weight: 3, arbitrary: oddText().map((t) => (t === '%zz' || t === '%' ? t : encodeURIComponent(t))) },
  );

/** Sign-in and a read in a fresh session: the process still serves after a batch of odd requests. */
async function expectStillServes(after: string): Promise<void> {
  const c = new Client(app.baseUrl);
  const login = await c.login(org.users.administrator, PASSWORD);
  expect(login.status, `sign-in after ${after}: ${JSON.stringify(login.body).slice(0, 300)}`).toBe(200);
  for (const path of ['/api/auth/me', '/api/sites', '/api/users']) {
    const res = await c.get(path);
    expect(res.status, `GET ${path} after ${after}: ${JSON.stringify(res.body).slice(0, 300)}`).toBe(200);
  }
}

// ---- helpers ---------------------------------------------------------------------------------------

function concretePath(route: RouteDef): string {
  return route.path.replace(/:(\w+)/g, (_m, name: string) => {
    try {
      return String(ids.forParam(route.path, name));
    } catch {
      return '2147483000'; // a resource without a fixture yet: the route must still refuse cleanly (404)
    }
  });
}

function clientFor(route: RouteDef): Client {
  if (route.access === 'public' || route.access === 'authenticated') return clients.get('administrator')!;
  return clients.get(route.access[0])!;
}

/** Row count and checksum of every table, in one string to compare. */
async function snapshot(): Promise<Map<string, string>> {
  const counts: Record<string, unknown>[] = await app.ds.query(`SELECT ${tables.map((t) => `(SELECT COUNT(*) FROM \`${t}\`) AS \`${t}\``).join(', ')}`);
  const sums: { Table: string; Checksum: string | number | null }[] = await app.ds.query(`CHECKSUM TABLE ${tables.map((t) => `\`${t}\``).join(', ')}`);
  const out = new Map<string, string>();
  for (const t of tables) out.set(t, `${counts[0][t]} rows`);
  for (const s of sums) {
    const t = s.Table.split('.').pop()!;
    out.set(t, `${out.get(t)}, checksum ${s.Checksum}`);
  }
  return out;
}

function changed(before: Map<string, string>, after: Map<string, string>): string[] {
  return [...before].filter(([t, v]) => after.get(t) !== v).map(([t, v]) => `${t}: ${v} → ${after.get(t)}`);
}

// Sign-out ends the session and file uploads take multipart bodies: both have their own tests.
// Routes on a user (the fixture user may end up deactivated by a valid random body) run last.
const routes = routeTable()
  .filter((r) => ['post', 'put', 'patch'].includes(r.method) && r.path !== '/api/auth/logout')
  .sort((a, b) => Number(a.path.startsWith('/api/users/:id')) - Number(b.path.startsWith('/api/users/:id')));

describe('random JSON bodies on every write route', () => {
  it('has write routes to try', () => {
    expect(routes.length).toBeGreaterThan(20);
    expect(FIELD_NAMES.length).toBeGreaterThan(30);
  });

  for (const route of routes) {
    it(`${route.method.toUpperCase()} ${route.path}: no 500, a clear refusal, nothing written on refusal`, async () => {
      const client = clientFor(route);
      const path = concretePath(route);
      const accepted: string[] = [];
      const probe = await client.request(route.method.toUpperCase(), path, '{}');
      const routeKeys = [
        ...new Set(((probe.body?.error?.details ?? []) as { path: string }[]).map((d) => String(d.path).split('.')[0]).filter((k) => /^[A-Za-z_]\w*$/.test(k))),
      ];
      await fc.assert(
        fc.asyncProperty(bodyArb(routeKeys), async (body) => {
          const text = typeof body === 'string' ? body : JSON.stringify(body);
          const before = await snapshot();
          const res = await client.request(route.method.toUpperCase(), path, text);
          const shown = `${route.method.toUpperCase()} ${path} ${text.slice(0, 300)} → ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`;
          expect(res.status, shown).toBeLessThan(500);
          if (res.status < 300) {
            if (process.env.FUZZ_VERBOSE) console.info(`accepted: ${shown}`);
            accepted.push(shown); // a random body can be valid (all fields optional): then it may write
            return;
          }
          // a sign-in with a well-formed body and unknown credentials is refused with 401
          expect(route.path === '/api/auth/login' ? [...CLEAR_REFUSALS, 401] : CLEAR_REFUSALS, shown).toContain(res.status);
          expect(typeof res.body?.error?.code, shown).toBe('string');
          expect(res.body.error.message.length, shown).toBeGreaterThan(0);
          expect(JSON.stringify(res.body), shown).not.toMatch(/at .*\.ts:\d+|QueryFailedError|ER_\w+|sqlMessage/);
          expect(changed(before, await snapshot()), `written by a refused request: ${shown}`).toEqual([]);
        }),
        { numRuns: BODIES_PER_ROUTE, seed: SEED, endOnFailure: true },
      );
      await expectStillServes(`random bodies on ${route.method.toUpperCase()} ${route.path}`);
    }, 120_000);
  }
});

// Routes whose address or query string can be fuzzed: every GET, and every other route with a parameter
// (sign-out and uploads have their own tests). Writes run last, as above.
const addressRoutes = routeTable()
  .filter((r) => r.method === 'get' || (/:\w+/.test(r.path) && r.path !== '/api/auth/logout' && !r.path.endsWith('/imports')))
  .sort((a, b) => Number(a.method !== 'get') - Number(b.method !== 'get'));

describe('random query strings and path segments on every route', () => {
  it('has routes to try', () => {
    expect(addressRoutes.filter((r) => r.method === 'get').length).toBeGreaterThan(30);
  });

  for (const route of addressRoutes) {
    it(`${route.method.toUpperCase()} ${route.path}: no 500 for odd addresses, and the process still serves`, async () => {
      const client = clientFor(route);
      const params = [...route.path.matchAll(/:(\w+)/g)].map((m) => m[1]);
      const fixtures = concretePath(route).split('/');
      const template = route.path.split('/');
      const segments = fc.tuple(...template.map((part, i) => (part.startsWith(':') ? segmentArb(fixtures[i]) : fc.constant(part))));
      const query = route.method === 'get' ? queryArb() : fc.constant('');
      await fc.assert(
        fc.asyncProperty(segments, query, async (parts, q) => {
          const path = parts.join('/') + q;
          const res = await client.request(route.method.toUpperCase(), path, route.method === 'get' ? undefined : '{}');
          const shown = `${route.method.toUpperCase()} ${path} → ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`;
          expect(res.status, shown).toBeLessThan(500);
          if (res.status >= 300) {
            expect(CLEAR_REFUSALS, shown).toContain(res.status);
            expect(typeof res.body?.error?.code, shown).toBe('string');
            expect(JSON.stringify(res.body), shown).not.toMatch(/at .*\.ts:\d+|QueryFailedError|ER_\w+|sqlMessage/);
          }
        }),
        { numRuns: params.length || route.method === 'get' ? QUERIES_PER_ROUTE : 1, seed: SEED, endOnFailure: true },
      );
      await expectStillServes(`odd addresses on ${route.method.toUpperCase()} ${route.path}`);
    }, 120_000);
  }
});
