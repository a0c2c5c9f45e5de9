import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOGIN_MAX_FAILURES } from '@common/api/roles';
import { parseEnv } from '@backend/config/env';
import { Client, createTestOrg, PASSWORD, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';

/**
 * Sign-in and session defences found in a security review: the failure counter under parallel guesses,
 * other sessions after a password change or reset, which client address the rate limit believes, the
 * per-account limit, and the lock answering the same for unknown accounts and ending by itself.
 */

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const clearCounters = (app: TestApp) => app.ds.query(`DELETE FROM rate_limit_hit WHERE k LIKE 'login:%'`);

// ---- the failure counter under parallel guesses -------------------------------------------------

describe('lockout counter under parallel wrong sign-ins', () => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startTestApp({ LOGIN_RATE_LIMIT_PER_ACCOUNT_PER_15_MIN: '1000' });
  });
  afterAll(async () => {
    await clearCounters(app);
    await app.close();
  });

  it(`ten parallel wrong passwords: at most ${LOGIN_MAX_FAILURES - 1} answered 401, then locked`, async () => {
    const org = await createTestOrg(app.ds);
    const email = org.users.purchasing_officer;
    const answers = await Promise.all(Array.from({ length: 10 }, (_, i) => new Client(app.baseUrl).login(email, `parallel-guess-${i}`)));
    const statuses = answers.map((a) => a.status);
    // Each wrong password counts once: LOGIN_MAX_FAILURES - 1 may be told "wrong", the rest find the lock.
    expect(statuses.filter((s) => s === 401).length, statuses.join(',')).toBeLessThanOrEqual(LOGIN_MAX_FAILURES - 1);
    expect(statuses.filter((s) => s === 423).length, statuses.join(',')).toBeGreaterThanOrEqual(10 - (LOGIN_MAX_FAILURES - 1));
    expect(
      statuses.every((s) => s === 401 || s === 423),
      statuses.join(','),
    ).toBe(true);
    expect((await new Client(app.baseUrl).login(email, PASSWORD)).status).toBe(423);
  });
});

// ---- other sessions after a password change or an administrator's reset ----------------------

describe('a new password ends every other session of the user', () => {
  let app: TestApp;
  let org: TestOrg;
  beforeAll(async () => {
    app = await startTestApp();
    org = await createTestOrg(app.ds);
  });
  afterAll(async () => {
    await app.close();
  });

  it('after a change of one’s own password, session B is signed out and session A stays signed in', async () => {
    const a = await signedIn(app, org.users.ward_lead);
    const b = await signedIn(app, org.users.ward_lead);
    expect((await b.get('/api/auth/me')).status).toBe(200);
    expect((await a.post('/api/auth/password', { currentPassword: PASSWORD, newPassword: 'the-new-long-password' })).status).toBe(200);
    expect((await b.get('/api/auth/me')).status).toBe(401);
    expect((await a.get('/api/auth/me')).status).toBe(200);
    // A's CSRF token still works: a wrong current password is refused as such (400), not as CSRF (403).
    expect((await a.post('/api/auth/password', { currentPassword: 'not-the-password', newPassword: 'another-long-password' })).status).toBe(400);
    // Signing in again with the new password gives a working session.
    const again = new Client(app.baseUrl);
    expect((await again.login(org.users.ward_lead, 'the-new-long-password')).status).toBe(200);
    expect((await again.get('/api/auth/me')).status).toBe(200);
  });

  it('after an administrator resets the password, every session of that user is signed out', async () => {
    const user = await signedIn(app, org.users.biomedical_engineer);
    const admin = await signedIn(app, org.users.administrator);
    expect((await admin.patch(`/api/users/${org.userIds.biomedical_engineer}`, { password: 'reset-by-the-admin-1' })).status).toBe(200);
    expect((await user.get('/api/auth/me')).status).toBe(401);
    expect((await admin.get('/api/auth/me')).status).toBe(200);
    expect((await new Client(app.baseUrl).login(org.users.biomedical_engineer, 'reset-by-the-admin-1')).status).toBe(200);
  });

  it('an administrator resetting their own password stays signed in; their other session does not', async () => {
    const here = await signedIn(app, org.users.administrator);
    const elsewhere = await signedIn(app, org.users.administrator);
    expect((await here.patch(`/api/users/${org.userIds.administrator}`, { password: 'admin-own-new-password' })).status).toBe(200);
    expect((await elsewhere.get('/api/auth/me')).status).toBe(401);
    expect((await here.get('/api/auth/me')).status).toBe(200);
    expect((await here.patch(`/api/users/${org.userIds.administrator}`, { name: 'Administrator renamed' })).status).toBe(200);
  });

  it('a change of name or roles signs nobody out', async () => {
    const local = await createTestOrg(app.ds);
    const user = await signedIn(app, local.users.purchasing_officer);
    const admin = await signedIn(app, local.users.administrator);
    expect(
      (await admin.patch(`/api/users/${local.userIds.purchasing_officer}`, { name: 'Purchasing renamed', roles: ['purchasing_officer', 'ward_lead'] })).status,
    ).toBe(200);
    expect((await user.get('/api/auth/me')).status).toBe(200);
  });
});

// ---- which address the rate limit believes, and the per-account limit --------------------------

describe('rate limit with the default proxy setting', () => {
  const LIMIT = 3;
  let app: TestApp;
  beforeAll(async () => {
    // No TRUST_PROXY: the default trusts no proxy.
    app = await startTestApp({ LOGIN_RATE_LIMIT_PER_15_MIN: String(LIMIT) });
    await clearCounters(app);
  });
  afterAll(async () => {
    await clearCounters(app);
    await app.close();
  });

  it('trusts no proxy unless one is configured, and refuses to trust everyone', () => {
    expect(parseEnv({}).TRUST_PROXY).toBe('false');
    expect(parseEnv({ TRUST_PROXY: '127.0.0.1' }).TRUST_PROXY).toBe('127.0.0.1');
    expect(() => parseEnv({ TRUST_PROXY: 'true' })).toThrow(/TRUST_PROXY/);
    // A Secure cookie is only set on HTTPS, which the app sees only through a trusted TLS proxy.
    expect(() => parseEnv({ COOKIE_SECURE: 'true' })).toThrow(/TRUST_PROXY/);
    expect(parseEnv({ COOKIE_SECURE: 'true', TRUST_PROXY: '127.0.0.1' }).COOKIE_SECURE).toBe(true);
  });

  it('an X-Forwarded-For header from an untrusted peer does not buy a fresh allowance', async () => {
    for (let i = 1; i <= LIMIT; i++) expect((await new Client(app.baseUrl).login(`nobody-fwd-${i}@test.example`, `guess-${i}`)).status).toBe(401);
    const forged = await new Client(app.baseUrl).request(
      'POST',
      '/api/auth/login',
      { email: 'nobody-fwd-x@test.example', password: 'guess-x' },
      { headers: { 'x-forwarded-for': '203.0.113.7' } },
    );
    expect(forged.status).toBe(429);
    expect(forged.body.error.code).toBe('rate_limited');
  });
});

describe('per-account sign-in limit (behind a configured proxy)', () => {
  const PER_ACCOUNT = 3;
  let app: TestApp;
  let org: TestOrg;
  beforeAll(async () => {
    app = await startTestApp({ TRUST_PROXY: '127.0.0.1', LOGIN_RATE_LIMIT_PER_ACCOUNT_PER_15_MIN: String(PER_ACCOUNT) });
    org = await createTestOrg(app.ds);
    await clearCounters(app);
  });
  afterAll(async () => {
    await clearCounters(app);
    await app.close();
  });

  const from = (i: number) => ({ headers: { 'x-forwarded-for': `198.51.100.${i}` } });
  const attempt = (email: string, password: string, i: number) => new Client(app.baseUrl).request('POST', '/api/auth/login', { email, password }, from(i));

  it(`answers 429 after ${PER_ACCOUNT} failed attempts at one account, whatever address they come from`, async () => {
    const email = org.users.facilities_manager;
    for (let i = 1; i <= PER_ACCOUNT; i++) expect((await attempt(email, `wrong-guess-${i}`, i)).status).toBe(401);
    // Differently written, the same account.
    const limited = await attempt(`  ${email.toUpperCase()} `, PASSWORD, 99);
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('rate_limited');
    expect(limited.body.csrfToken).toBeUndefined();
    // Another account from the same addresses is not affected.
    expect((await attempt(org.users.ward_lead, PASSWORD, 1)).status).toBe(200);
  });

  it('counts an unknown account the same way (the answer does not say which accounts exist)', async () => {
    const email = 'nobody-per-account@test.example';
    for (let i = 1; i <= PER_ACCOUNT; i++) expect((await attempt(email, `wrong-guess-${i}`, 10 + i)).status).toBe(401);
    expect((await attempt(email, 'wrong-guess-x', 50)).status).toBe(429);
  });

  it('e-mails named like object properties, and bodies hiding the e-mail, get the ordinary answers', async () => {
    for (const name of ['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf']) {
      const res = await attempt(name, 'some-guess', 200);
      expect(res.status, name).toBe(401);
      expect(res.body.error.code, name).toBe('invalid_credentials');
    }
    const hidden = await new Client(app.baseUrl).request('POST', '/api/auth/login', '{"__proto__":{"email":"x@test.example"},"password":"p"}', {
      csrf: false,
      ...from(201),
    });
    expect(hidden.status).toBe(400);
    const notText = await new Client(app.baseUrl).request(
      'POST',
      '/api/auth/login',
      { email: { toString: 'x' }, password: 'p' },
      { csrf: false, ...from(202) },
    );
    expect(notText.status).toBe(400);
  });

  it('successful sign-ins do not use up the allowance', async () => {
    for (let i = 1; i <= PER_ACCOUNT + 2; i++) expect((await attempt(org.users.purchasing_officer, PASSWORD, i)).status).toBe(200);
  });
});

// ---- the lock: same answer for unknown accounts, temporary with back-off ------------------------

describe('account lock', () => {
  let app: TestApp;
  let org: TestOrg;
  beforeAll(async () => {
    app = await startTestApp({ LOGIN_RATE_LIMIT_PER_ACCOUNT_PER_15_MIN: '1000' });
    org = await createTestOrg(app.ds);
  });
  afterAll(async () => {
    await clearCounters(app);
    await app.close();
  });

  it('an unknown e-mail is answered exactly like a known one, through the lock', async () => {
    const known = org.users.ward_lead;
    const unknown = `nobody-lock-${Date.now()}@test.example`;
    for (let i = 1; i <= LOGIN_MAX_FAILURES + 1; i++) {
      const k = await new Client(app.baseUrl).login(known, `wrong-${i}-password`);
      const u = await new Client(app.baseUrl).login(unknown, `wrong-${i}-password`);
      expect(u.status, `attempt ${i}`).toBe(k.status);
      expect(u.body, `attempt ${i}`).toEqual(k.body);
      expect(k.status, `attempt ${i}`).toBe(i < LOGIN_MAX_FAILURES ? 401 : 423);
    }
  });
});

describe('account lock back-off (short periods for the test)', () => {
  // 0.02 min = 1.2 s first lock, doubling, at most 0.05 min = 3 s.
  const BASE_MS = 1200;
  const MAX_MS = 3000;
  let app: TestApp;
  let org: TestOrg;
  beforeAll(async () => {
    app = await startTestApp({ LOGIN_RATE_LIMIT_PER_ACCOUNT_PER_15_MIN: '1000', LOGIN_LOCK_BASE_MINUTES: '0.02', LOGIN_LOCK_MAX_MINUTES: '0.05' });
    org = await createTestOrg(app.ds);
  });
  afterAll(async () => {
    await clearCounters(app);
    await app.close();
  });

  const lockedForMs = async (id: number, since: number) => {
    const [row] = await app.ds.query('SELECT locked_until FROM app_user WHERE id = ?', [id]);
    return row.locked_until ? new Date(row.locked_until).getTime() - since : 0;
  };
  /** Fails until the lock; returns the time just before the failure that locked. */
  const failUntilLocked = async (email: string) => {
    for (let i = 1; i < LOGIN_MAX_FAILURES; i++) expect((await new Client(app.baseUrl).login(email, `wrong-${i}-password`)).status).toBe(401);
    const t = Date.now();
    const last = await new Client(app.baseUrl).login(email, 'wrong-last-password');
    expect(last.status).toBe(423);
    expect(last.body.error.code).toBe('account_locked');
    return t;
  };

  it('locks an administrator for a while that doubles each time, capped, and ends by itself', async () => {
    const email = org.users.administrator;
    const id = org.userIds.administrator;
    let t = await failUntilLocked(email);
    let ms = await lockedForMs(id, t);
    expect(ms).toBeGreaterThan(BASE_MS - 100);
    expect(ms).toBeLessThan(BASE_MS + 1500);
    expect((await new Client(app.baseUrl).login(email, PASSWORD)).status).toBe(423);

    await sleep(ms + 100);
    t = await failUntilLocked(email);
    ms = await lockedForMs(id, t);
    expect(ms).toBeGreaterThan(2 * BASE_MS - 100);
    expect(ms).toBeLessThan(2 * BASE_MS + 1500);

    // Let the second lock pass without waiting for it, then the third is capped at MAX (not 4 × BASE).
    await app.ds.query('UPDATE app_user SET locked_until = TIMESTAMPADD(SECOND, -1, NOW(3)) WHERE id = ?', [id]);
    t = await failUntilLocked(email);
    ms = await lockedForMs(id, t);
    expect(ms).toBeGreaterThan(MAX_MS - 100);
    expect(ms).toBeLessThan(MAX_MS + 1500);

    // Nobody unlocks it: the lock runs out and the right password works again.
    await sleep(ms + 100);
    const c = new Client(app.baseUrl);
    expect((await c.login(email, PASSWORD)).status).toBe(200);
    expect((await c.get('/api/auth/me')).status).toBe(200);
  }, 30_000);
});
