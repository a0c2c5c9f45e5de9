import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOGIN_MAX_FAILURES } from '@common/api/roles';
import { Client, createTestOrg, PASSWORD, startTestApp, type TestApp } from '../support/test-app';

/**
 * Sign-in and session defences found in a security review: the failure counter under parallel guesses.
 */

const clearCounters = (app: TestApp) => app.ds.query(`DELETE FROM rate_limit_hit WHERE k LIKE 'login:%'`);

// ---- the failure counter under parallel guesses -------------------------------------------------

describe('lockout counter under parallel wrong sign-ins', () => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startTestApp();
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
    expect(statuses.every((s) => s === 401 || s === 423), statuses.join(',')).toBe(true);
    expect((await new Client(app.baseUrl).login(email, PASSWORD)).status).toBe(423);
  });
});
