import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestOrg, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';

/**
 * Writes at one site at the same moment. Each insert's foreign-key check takes a shared lock on the site
 * row and each write then bumps the site's data version, so InnoDB picks deadlock victims in the ordinary
 * course; the data source runs a victim's transaction again, and no person sees a 500.
 */
let app: TestApp;
let org: TestOrg;

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
});
afterAll(async () => {
  await app.close();
});

describe('concurrent writes at one site', () => {
  it('24 wards created at once by two people all succeed, each stored once', async () => {
    const a = await signedIn(app, org.users.facilities_manager);
    const b = await signedIn(app, org.users.facilities_manager);
    const siteId = org.siteIds[0];
    const names = Array.from({ length: 24 }, (_, i) => `Concurrent ward ${i + 1}`);
    const results = await Promise.all(names.map((name, i) => (i % 2 ? a : b).post(`/api/sites/${siteId}/wards`, { name, department: 'ward', beds: 12 })));
    expect(
      results.map((r) => r.status).filter((s) => s !== 200),
      JSON.stringify(results.find((r) => r.status !== 200)?.body),
    ).toEqual([]);
    const rows: { name: string; n: number }[] = await app.ds.query(
      `SELECT name, COUNT(*) AS n FROM ward WHERE site_id = ? AND name LIKE 'Concurrent ward %' GROUP BY name`,
      [siteId],
    );
    expect(rows).toHaveLength(names.length);
    expect(rows.every((r) => Number(r.n) === 1)).toBe(true);
    // Every write moved the site's data version on (the overview cache depends on it).
    const [site] = await app.ds.query('SELECT data_version FROM site WHERE id = ?', [siteId]);
    expect(Number(site.data_version)).toBeGreaterThanOrEqual(names.length);
  });
});
