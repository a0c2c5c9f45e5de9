import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { LOGIN_MAX_FAILURES } from '@common/api/roles';
import { routeTable } from '@backend/routes';
import { createDataSource } from '@backend/db/data-source';
import { ALL_ROLES, Client, createTestOrg, PASSWORD, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';
import { idFixtures } from '../support/fixtures';
import { createMigratedDatabase, startChildApp, type ChildApp } from '../support/child-app';

/**
 * Security properties beyond the role matrix and site isolation (their own tests) and session fixation
 * (auth.test.ts: the id is renewed at sign-in and the old id is not signed in):
 * brute force is slowed per address and stopped per account; passwords never reach a log or a response;
 * security headers on every kind of answer; uploads refuse what is not CSV text or too large.
 */

// ---- brute force ----------------------------------------------------------------------------------

describe('sign-in brute force', () => {
  const LIMIT = 5;
  let app: TestApp;
  let org: TestOrg;

  const clearCounters = () => app.ds.query(`DELETE FROM rate_limit_hit WHERE k LIKE 'login:%'`);

  beforeAll(async () => {
    // The load balancer at 127.0.0.1 is configured as the trusted proxy (the default trusts none).
    app = await startTestApp({ LOGIN_RATE_LIMIT_PER_15_MIN: String(LIMIT), TRUST_PROXY: '127.0.0.1' });
    org = await createTestOrg(app.ds);
    await clearCounters();
  });
  afterAll(async () => {
    // Leave no counters behind for the tests that follow (they sign in from the same address).
    await clearCounters();
    await app.close();
  });

  it(`answers 429 after ${LIMIT} attempts from one address, even with the right password`, async () => {
    const c = new Client(app.baseUrl);
    for (let i = 1; i <= LIMIT; i++) {
      const res = await c.login(`nobody-${i}@test.example`, `guess-number-${i}`);
      expect(res.status, `attempt ${i}`).toBe(401);
    }
    const limited = await c.login(`nobody-x@test.example`, 'guess-number-x');
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('rate_limited');
    expect(limited.body.error.message).toMatch(/wait 15 minutes/);
    expect(limited.headers.get('ratelimit-policy') ?? limited.headers.get('ratelimit')).toBeTruthy();
    const right = await c.login(org.users.facilities_manager, PASSWORD);
    expect(right.status).toBe(429);
    expect(right.body.csrfToken).toBeUndefined();
    // Another address (behind the configured proxy) has its own allowance.
    const other = await new Client(app.baseUrl).request(
      'POST',
      '/api/auth/login',
      { email: org.users.facilities_manager, password: PASSWORD },
      { headers: { 'x-forwarded-for': '203.0.113.7' } },
    );
    expect(other.status).toBe(200);
  });

  it(`locks the account after ${LOGIN_MAX_FAILURES} failures even when each comes from a different address`, async () => {
    await clearCounters();
    const email = org.users.ward_lead;
    const from = (i: number) => ({ headers: { 'x-forwarded-for': `198.51.100.${i + 1}` } });
    const c = new Client(app.baseUrl);
    for (let i = 1; i < LOGIN_MAX_FAILURES; i++)
      expect((await c.request('POST', '/api/auth/login', { email, password: `wrong-${i}-password` }, from(i))).status).toBe(401);
    expect((await c.request('POST', '/api/auth/login', { email, password: 'wrong-last-password' }, from(LOGIN_MAX_FAILURES))).status).toBe(423);
    const right = await c.request('POST', '/api/auth/login', { email, password: PASSWORD }, from(50));
    expect(right.status).toBe(423);
    expect(right.body.error.code).toBe('account_locked');
  });
});

// ---- passwords in logs and responses --------------------------------------------------------------

describe('passwords are never logged or returned', () => {
  const database = 'plenum_security';
  let child: ChildApp;
  let ds: DataSource;
  let org: TestOrg;
  const WRONG = 'wrong-Pa55word-typed-by-mistake';
  const NEW = 'brand-new-Pa55word-after-change';
  const CREATED = 'created-user-Pa55word-0451';
  const bodies: string[] = [];

  beforeAll(async () => {
    await createMigratedDatabase(database);
    ds = createDataSource({ database, poolSize: 2 });
    await ds.initialize();
    org = await createTestOrg(ds, 2);
    // Debug logging: the most the app ever writes.
    child = await startChildApp({ DB_NAME: database, LOG_LEVEL: 'debug', LOGIN_RATE_LIMIT_PER_15_MIN: '100000' });
  }, 120_000);
  afterAll(async () => {
    await child?.stop();
    await ds?.destroy();
  });

  const keep = <T extends { body: unknown }>(res: T): T => {
    bodies.push(JSON.stringify(res.body ?? ''));
    return res;
  };

  it('sign-in, a failed sign-in, a password change and a new user leave no password in the output or the answers', async () => {
    const c = new Client(child.baseUrl);
    expect(keep(await c.login(org.users.ward_lead, WRONG)).status).toBe(401);
    expect(keep(await c.login(org.users.ward_lead, PASSWORD)).status).toBe(200);
    expect(keep(await c.post('/api/auth/password', { currentPassword: WRONG, newPassword: NEW })).status).toBe(400);
    expect(keep(await c.post('/api/auth/password', { currentPassword: PASSWORD, newPassword: NEW })).status).toBe(200);
    expect(keep(await new Client(child.baseUrl).login(org.users.ward_lead, NEW)).status).toBe(200);

    const admin = new Client(child.baseUrl);
    expect(keep(await admin.login(org.users.administrator, PASSWORD)).status).toBe(200);
    const created = keep(
      await admin.post('/api/users', {
        email: `new-user-${Date.now()}@test.example`,
        name: 'New user',
        roles: ['ward_lead'],
        siteIds: org.siteIds,
        password: CREATED,
      }),
    );
    expect(created.status).toBe(200);
    keep(await admin.patch(`/api/users/${created.body.id}`, { password: `${CREATED}-reset` }));
    keep(await admin.get('/api/audit'));
    keep(await admin.get('/api/users'));

    // The process really logged (so the check below can see what it writes).
    await new Promise((r) => setTimeout(r, 200));
    const output = child.output();
    expect(output).toMatch(/listening on/i);
    const hashes: { password_hash: string }[] = await ds.query('SELECT password_hash FROM app_user WHERE organisation_id = ?', [org.organisationId]);
    for (const secret of [PASSWORD, WRONG, NEW, CREATED, ...hashes.map((h) => h.password_hash)]) {
      expect(output.includes(secret), `the app's output contains a secret: ${secret.slice(0, 6)}…`).toBe(false);
      for (const b of bodies) expect(b.includes(secret), `a response contains a secret: ${b.slice(0, 200)}`).toBe(false);
    }
    expect(output).not.toMatch(/\$2[aby]\$\d\d\$/); // no bcrypt hash of any user
  });

  it('no GET route answers with a password hash, for any role', async () => {
    const ids = await idFixtures(ds, org);
    const seen: string[] = [];
    for (const role of ALL_ROLES) {
      const c = new Client(child.baseUrl);
      expect((await c.login(org.users[role], role === 'ward_lead' ? NEW : PASSWORD)).status).toBe(200);
      for (const route of routeTable().filter((r) => r.method === 'get')) {
        let p: string;
        try {
          p = route.path.replace(/:(\w+)/g, (_m, name: string) => String(ids.forParam(route.path, name)));
        } catch {
          continue; // a resource without a fixture yet: the role matrix reports it
        }
        const res = await fetch(child.baseUrl + p, { headers: { cookie: `plenum.sid=${c.cookies.get('plenum.sid')}` } });
        const text = await res.text();
        seen.push(`${role} ${p} ${res.status}`);
        expect(text, `${role} GET ${p}`).not.toMatch(/password_?hash|\$2[aby]\$\d\d\$/i);
        expect(text.includes(PASSWORD), `${role} GET ${p} contains a password`).toBe(false);
      }
    }
    expect(seen.filter((s) => s.endsWith(' 200')).length).toBeGreaterThan(40);
  }, 120_000);
});

// ---- headers --------------------------------------------------------------------------------------

describe('security headers', () => {
  let app: TestApp;
  let org: TestOrg;
  beforeAll(async () => {
    // HTTPS ends at the proxy, configured as trusted: the app sees TLS only through its X-Forwarded-Proto.
    app = await startTestApp({ COOKIE_SECURE: 'true', TRUST_PROXY: '127.0.0.1' });
    org = await createTestOrg(app.ds);
  });
  afterAll(async () => {
    await app.close();
  });

  function expectHardened(h: Headers, what: string) {
    const csp = h.get('content-security-policy') ?? '';
    expect(csp, what).toMatch(/default-src 'self'/);
    expect(csp, what).toMatch(/script-src 'self'(;|$)/); // no inline or eval scripts
    expect(csp, what).toMatch(/object-src 'none'/);
    expect(csp, what).toMatch(/frame-ancestors 'none'/);
    expect(h.get('x-content-type-options'), what).toBe('nosniff');
    expect(h.get('x-frame-options'), what).toBe('SAMEORIGIN');
    expect(h.get('referrer-policy'), what).toBe('no-referrer');
    expect(h.get('cross-origin-opener-policy'), what).toBe('same-origin');
    expect(h.get('strict-transport-security'), what).toMatch(/max-age=\d{7,}/);
    expect(h.get('x-powered-by'), what).toBeNull();
    // No CORS: another origin's page cannot read answers.
    expect(h.get('access-control-allow-origin'), what).toBeNull();
  }

  it('on success, refusal, error and unknown routes, and the API is never kept by a shared cache', async () => {
    const anon = new Client(app.baseUrl);
    const origin = { headers: { origin: 'https://evil.example' } };
    const health = await anon.request('GET', '/api/health', undefined, origin);
    expectHardened(health.headers, 'health');
    const unauth = await anon.request('GET', '/api/overview', undefined, origin);
    expect(unauth.status).toBe(401);
    expectHardened(unauth.headers, '401');
    const bad = await anon.request('POST', '/api/auth/login', '{"email":', { csrf: false, ...origin });
    expect(bad.status).toBe(400);
    expectHardened(bad.headers, '400');
    const missing = await anon.request('GET', '/api/no-such-route', undefined, origin);
    expect(missing.status).toBe(404);
    expectHardened(missing.headers, '404');
    // With COOKIE_SECURE the cookie is only set on a request that came over TLS (to the proxy).
    const c = new Client(app.baseUrl);
    expect(
      (await c.request('POST', '/api/auth/login', { email: org.users.facilities_manager, password: PASSWORD }, { headers: { 'x-forwarded-proto': 'https' } }))
        .status,
    ).toBe(200);
    const data = await c.get('/api/overview');
    expect(data.status).toBe(200);
    expectHardened(data.headers, 'overview');
    // The overview is cached on the server by data version: the browser may keep it but must revalidate it
    // (ETag), and no shared cache may keep it. Every other answer stays no-store.
    expect(data.headers.get('cache-control')).toBe('private, no-cache');
    expect((await c.get('/api/auth/me')).headers.get('cache-control')).toBe('no-store');
  });

  it('with COOKIE_SECURE the session cookie is Secure, HttpOnly and SameSite behind a TLS proxy', async () => {
    const res = await new Client(app.baseUrl).request(
      'POST',
      '/api/auth/login',
      { email: org.users.ward_lead, password: PASSWORD },
      { headers: { 'x-forwarded-proto': 'https' } },
    );
    expect(res.status).toBe(200);
    const cookie = res.headers.getSetCookie().find((h) => h.startsWith('plenum.sid='));
    expect(cookie).toMatch(/;\s*Secure/i);
    expect(cookie).toMatch(/;\s*HttpOnly/i);
    expect(cookie).toMatch(/;\s*SameSite=Lax/i);
  });
});

// ---- uploads --------------------------------------------------------------------------------------

describe('uploads refuse what is not CSV text or is too large, storing nothing', () => {
  let app: TestApp;
  let org: TestOrg;
  let fm: Client;
  let uploadDir: string;
  const MAX_MB = 1;

  beforeAll(async () => {
    uploadDir = mkdtempSync(path.join(os.tmpdir(), 'plenum-upload-test-'));
    app = await startTestApp({ UPLOAD_MAX_MB: String(MAX_MB), UPLOAD_DIR: uploadDir });
    org = await createTestOrg(app.ds);
    fm = await signedIn(app, org.users.facilities_manager);
  });
  afterAll(async () => {
    await app.close();
    rmSync(uploadDir, { recursive: true, force: true });
  });

  async function upload(name: string, bytes: Uint8Array, type = 'text/csv') {
    const form = new FormData();
    form.append('kind', 'tank_readings');
    form.append('file', new Blob([bytes as Uint8Array<ArrayBuffer>], { type }), name);
    const res = await fetch(`${app.baseUrl}/api/sites/${org.siteIds[0]}/imports`, {
      method: 'POST',
      body: form,
      headers: { cookie: `plenum.sid=${fm.cookies.get('plenum.sid')}`, 'x-csrf-token': fm.csrf! },
    });
    return { status: res.status, body: (await res.json()) as any };
  }
  const stored = async () => {
    const [row] = await app.ds.query(
      'SELECT (SELECT COUNT(*) FROM import_file WHERE site_id = ?) AS files, (SELECT COUNT(*) FROM import_job WHERE site_id = ?) AS jobs',
      [org.siteIds[0], org.siteIds[0]],
    );
    return {
      files: Number(row.files),
      jobs: Number(row.jobs),
      onDisk: readdirSync(uploadDir, { recursive: true, withFileTypes: true }).filter((d) => d.isFile()).length,
    };
  };

  // PNG signature and header bytes (PNG specification, section 5.2): binary with NUL bytes.
  const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d, 0x49, 0x48, 0x44, 0x52, 0, 0, 0, 1, 0, 0, 0, 1, 8, 6, 0, 0, 0]);
  // A spreadsheet saved as .xlsx is a ZIP archive: local file header signature PK\x03\x04 (ZIP APPNOTE 4.3.7).
  const xlsx = new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0x06, 0, 0x08, 0, 0, 0, 0x21, 0, ...new TextEncoder().encode('[Content_Types].xml'), 0, 0, 0]);

  const cases: [string, string, () => Uint8Array, number, RegExp][] = [
    ['a PNG image', 'level.png', () => png, 400, /binary|not CSV|not UTF-8/i],
    ['a PNG image named .csv', 'level.csv', () => png, 400, /binary|not CSV|not UTF-8/i],
    ['an Excel workbook', 'levels.xlsx', () => xlsx, 400, /binary|not CSV|not UTF-8/i],
    [
      'UTF-16 text',
      'levels.csv',
      () => new Uint8Array([0xff, 0xfe, ...Array.from(new TextEncoder().encode('time,level\n')).flatMap((b) => [b, 0])]),
      400,
      /UTF-16/,
    ],
    ['an empty file', 'levels.csv', () => new Uint8Array(), 400, /empty/i],
    [
      `a CSV over ${MAX_MB} MB`,
      'levels.csv',
      () => new TextEncoder().encode('time,level_percent\n' + '2027-01-04T00:00,50\n'.repeat(Math.ceil((MAX_MB * 1.2 * 1024 * 1024) / 20))),
      413,
      /upload limit/,
    ],
  ];

  for (const [what, name, bytes, status, message] of cases) {
    it(`refuses ${what} with ${status} and stores nothing`, async () => {
      const before = await stored();
      const res = await upload(name, bytes());
      expect(res.status, JSON.stringify(res.body)).toBe(status);
      expect(res.body.error.message).toMatch(message);
      expect(await stored()).toEqual(before);
    });
  }

  /** Posts a hand-written multipart body (so it can be cut short or break the form's rules). */
  async function rawUpload(body: string, boundary = 'plenum-test-boundary') {
    const res = await fetch(`${app.baseUrl}/api/sites/${org.siteIds[0]}/imports`, {
      method: 'POST',
      body,
      headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, cookie: `plenum.sid=${fm.cookies.get('plenum.sid')}`, 'x-csrf-token': fm.csrf! },
    });
    return { status: res.status, body: (await res.json()) as any };
  }
  const part = (name: string, value: string, filename?: string) =>
    `--plenum-test-boundary\r\nContent-Disposition: form-data; name="${name}"${filename ? `; filename="${filename}"\r\nContent-Type: text/csv` : ''}\r\n\r\n${value}\r\n`;
  const csv = 'time,level_percent\n2027-01-04T00:00,50\n';
  const end = '--plenum-test-boundary--\r\n';

  // Multipart framing (RFC 7578): parts separated by "--boundary", the body closed by "--boundary--".
  const malformed: [string, () => string, number, RegExp][] = [
    [
      'a body cut off in the middle of the file',
      () => part('kind', 'tank_readings') + part('file', csv, 'levels.csv').slice(0, -20),
      400,
      /upload was cut off|incomplete/i,
    ],
    ['a body without its closing boundary', () => part('kind', 'tank_readings') + part('file', csv, 'levels.csv'), 400, /upload was cut off|incomplete/i],
    ['two files', () => part('kind', 'tank_readings') + part('file', csv, 'a.csv') + part('file', csv, 'b.csv') + end, 400, /one CSV file/],
    ['a file in another field', () => part('kind', 'tank_readings') + part('data', csv, 'levels.csv') + end, 400, /one CSV file, in the form field/],
    [
      'a form field over 64 KB',
      () => part('kind', 'tank_readings') + part('note', 'x'.repeat(70 * 1024)) + part('file', csv, 'levels.csv') + end,
      400,
      /field .*too long/i,
    ],
    [
      'too many form fields',
      () => Array.from({ length: 25 }, (_, i) => part(`f${i}`, 'x')).join('') + part('file', csv, 'levels.csv') + end,
      400,
      /too many fields/i,
    ],
    [
      'a part without a name',
      () => part('kind', 'tank_readings') + '--plenum-test-boundary\r\nContent-Disposition: form-data; filename="levels.csv"\r\n\r\n' + csv + '\r\n' + end,
      400,
      /upload could not be read|one CSV file/i,
    ],
  ];
  for (const [what, body, status, message] of malformed) {
    it(`refuses ${what} with ${status} and stores nothing`, async () => {
      const before = await stored();
      const res = await rawUpload(body());
      expect(res.status, JSON.stringify(res.body)).toBe(status);
      expect(res.body.error.message).toMatch(message);
      expect(await stored()).toEqual(before);
    });
  }

  it('refuses a multipart body whose boundary is missing from the header with 400', async () => {
    const res = await fetch(`${app.baseUrl}/api/sites/${org.siteIds[0]}/imports`, {
      method: 'POST',
      body: part('file', csv, 'levels.csv') + end,
      headers: { 'content-type': 'multipart/form-data', cookie: `plenum.sid=${fm.cookies.get('plenum.sid')}`, 'x-csrf-token': fm.csrf! },
    });
    expect(res.status).toBe(400);
    expect(((await res.json()) as any).error.message).toMatch(/upload could not be read/i);
  });

  it('accepts a small CSV (so the refusals above are about the files)', async () => {
    const res = await upload('levels.csv', new TextEncoder().encode('time,level_percent\n2027-01-04T00:00,50\n2027-01-04T01:00,49.5\n'));
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect((await stored()).jobs).toBe(1);
  });
});
