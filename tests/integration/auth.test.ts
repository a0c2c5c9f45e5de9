import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOGIN_MAX_FAILURES } from '@common/api/roles';
import { Client, createTestOrg, PASSWORD, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';

let app: TestApp;
let org: TestOrg;

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
});
afterAll(async () => {
  await app.close();
});

describe('sign-in', () => {
  it('signs in with the right password and returns the user, roles and sites', async () => {
    const c = new Client(app.baseUrl);
    const res = await c.login(org.users.facilities_manager, PASSWORD);
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(org.users.facilities_manager);
    expect(res.body.user.roles).toEqual(['facilities_manager']);
    expect(res.body.sites.map((s: { id: number }) => s.id)).toEqual(org.siteIds);
    expect(typeof res.body.csrfToken).toBe('string');
    const cookie = res.headers.getSetCookie().find((h) => h.startsWith('plenum.sid='));
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const me = await c.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe(org.users.facilities_manager);
    expect(JSON.stringify(me.body)).not.toMatch(/password|hash/i);
  });

  it('refuses a wrong password with 401 and the same message as an unknown e-mail', async () => {
    const c = new Client(app.baseUrl);
    const wrong = await c.login(org.users.ward_lead, 'not-the-password');
    const unknown = await c.login('nobody-here@test.example', 'whatever-it-is');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body.error.code).toBe('invalid_credentials');
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
    expect((await c.get('/api/auth/me')).status).toBe(401);
  });

  it('rejects a sign-in body without fields with 400 and field messages', async () => {
    const res = await new Client(app.baseUrl).post('/api/auth/login', { email: '' }, { csrf: false });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'password']);
  });

  it('rejects malformed JSON with 400 and no stack trace', async () => {
    const res = await new Client(app.baseUrl).request('POST', '/api/auth/login', '{"email": ', { csrf: false });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_json');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts:\d+/);
  });

  it(`locks the account after ${LOGIN_MAX_FAILURES} failures, even for the right password, until unlocked`, async () => {
    const local = await createTestOrg(app.ds);
    const email = local.users.biomedical_engineer;
    const c = new Client(app.baseUrl);
    for (let i = 1; i < LOGIN_MAX_FAILURES; i++) expect((await c.login(email, `wrong-${i}-password`)).status).toBe(401);
    const locking = await c.login(email, 'wrong-last-password');
    expect(locking.status).toBe(423);
    expect(locking.body.error.code).toBe('account_locked');
    const right = await c.login(email, PASSWORD);
    expect(right.status).toBe(423);

    const admin = await signedIn(app, local.users.administrator);
    const users = await admin.get(`/api/users?q=${encodeURIComponent(email)}`);
    expect(users.body.items[0].locked).toBe(true);
    expect((await admin.post(`/api/users/${local.userIds.biomedical_engineer}/unlock`)).status).toBe(200);
    expect((await c.login(email, PASSWORD)).status).toBe(200);
  });

  it('renews the session id at sign-in (no session fixation)', async () => {
    const c = new Client(app.baseUrl);
    await c.get('/api/auth/csrf'); // creates an anonymous session
    const before = c.cookies.get('plenum.sid');
    expect(before).toBeDefined();
    await c.login(org.users.purchasing_officer, PASSWORD);
    const after = c.cookies.get('plenum.sid');
    expect(after).toBeDefined();
    expect(after).not.toBe(before);
    // The old id is not a signed-in session.
    const stale = new Client(app.baseUrl);
    stale.cookies.set('plenum.sid', before!);
    expect((await stale.get('/api/auth/me')).status).toBe(401);
  });

  it('signs out: the session no longer works', async () => {
    const c = await signedIn(app, org.users.ward_lead);
    const sid = c.cookies.get('plenum.sid')!;
    expect((await c.post('/api/auth/logout')).status).toBe(200);
    expect((await c.get('/api/auth/me')).status).toBe(401);
    const replay = new Client(app.baseUrl);
    replay.cookies.set('plenum.sid', sid);
    expect((await replay.get('/api/auth/me')).status).toBe(401);
  });

  it('changes the password: the old one stops working, the new one works', async () => {
    const local = await createTestOrg(app.ds);
    const c = await signedIn(app, local.users.ward_lead);
    const bad = await c.post('/api/auth/password', { currentPassword: 'not-it-at-all', newPassword: 'a-new-long-password' });
    expect(bad.status).toBe(400);
    const short = await c.post('/api/auth/password', { currentPassword: PASSWORD, newPassword: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.details[0].path).toBe('newPassword');
    expect((await c.post('/api/auth/password', { currentPassword: PASSWORD, newPassword: 'a-new-long-password' })).status).toBe(200);
    expect((await new Client(app.baseUrl).login(local.users.ward_lead, PASSWORD)).status).toBe(401);
    expect((await new Client(app.baseUrl).login(local.users.ward_lead, 'a-new-long-password')).status).toBe(200);
  });
});

describe('CSRF', () => {
  it('refuses a state-changing request without the token, and with a wrong one, changing nothing', async () => {
    const c = await signedIn(app, org.users.administrator);
    const token = c.csrf;
    c.csrf = undefined;
    const none = await c.request('PATCH', '/api/organisation', { name: 'Renamed without token' });
    expect(none.status).toBe(403);
    expect(none.body.error.code).toBe('csrf_failed');
    c.csrf = 'x'.repeat(token!.length);
    expect((await c.patch('/api/organisation', { name: 'Renamed with a wrong token' })).status).toBe(403);
    c.csrf = token;
    const org1 = await c.get('/api/organisation');
    expect(org1.body.name).toMatch(/^Test organisation/);
    expect((await c.patch('/api/organisation', { name: org1.body.name })).status).toBe(200);
  });

  it('GET /api/auth/csrf returns the session token', async () => {
    const c = await signedIn(app, org.users.administrator);
    const res = await c.get('/api/auth/csrf');
    expect(res.body.token).toBe(c.csrf);
  });
});

describe('health and headers', () => {
  it('GET /api/health reports the database', async () => {
    const res = await new Client(app.baseUrl).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body.database.ok).toBe(true);
    expect(typeof res.body.mail.ok).toBe('boolean');
  });

  it('sends security headers (CSP, nosniff, frame protection) and no x-powered-by', async () => {
    const res = await new Client(app.baseUrl).get('/api/health');
    expect(res.headers.get('content-security-policy')).toMatch(/default-src 'self'/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('x-frame-options')).toBe('SAMEORIGIN');
    expect(res.headers.get('x-powered-by')).toBeNull();
  });

  it('answers an unknown API route with a JSON 404', async () => {
    const res = await new Client(app.baseUrl).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});
