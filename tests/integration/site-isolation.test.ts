import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { routeTable } from '@backend/routes';
import type { RouteDef } from '@backend/http/route';
import type { Role } from '@common/api/roles';
import { createTestOrg, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';
import { idFixtures, resourceOf, type IdFixtures } from '../support/fixtures';
import { User, UserSite } from '@backend/db/entities/user.entity';

/**
 * A user of one organisation (or one site) gets 404 — never the record, never 403 — for another's
 * records, by id, on every route that takes an id. Generated from the route table.
 */
let app: TestApp;
let mine: TestOrg;
let theirs: TestOrg;
let theirIds: IdFixtures;

/** Mail captured by the local mail service is not organisation data (development only): exempt. */
const EXEMPT = new Set(['mail', 'mail_attachment']);

beforeAll(async () => {
  app = await startTestApp();
  mine = await createTestOrg(app.ds, 2);
  theirs = await createTestOrg(app.ds, 1);
  theirIds = await idFixtures(app.ds, theirs);
});
afterAll(async () => {
  await app.close();
});

function roleFor(route: RouteDef): Role {
  if (route.access === 'public' || route.access === 'authenticated') return 'administrator';
  return route.access.includes('administrator') ? 'administrator' : route.access[0];
}

const idRoutes = routeTable().filter((r) => /:\w+/.test(r.path));

describe('organisation isolation', () => {
  for (const route of idRoutes) {
    const params = [...route.path.matchAll(/:(\w+)/g)].map((m) => m[1]);
    const resources = params.map((p) => resourceOf(route.path, p));
    if (resources.some((r) => EXEMPT.has(r))) continue;
    it(`${route.method.toUpperCase()} ${route.path}: another organisation's record is 404`, async () => {
      const c = await signedIn(app, mine.users[roleFor(route)]);
      const path = route.path.replace(/:(\w+)/g, (_m, p: string) => String(theirIds.forParam(route.path, p)));
      const res = await c.request(route.method.toUpperCase(), path, route.method === 'get' ? undefined : {});
      // A body that fails validation may be refused first (400); it must never be served or changed.
      expect([400, 404], JSON.stringify(res.body)).toContain(res.status);
      if (route.method === 'get') expect(res.status).toBe(404);
    });
  }
});

describe('site isolation inside one organisation', () => {
  it('a user granted one site gets 404 for the other site and does not list it', async () => {
    const email = `one-site-${Date.now()}@test.example`;
    const base = await app.ds.getRepository(User).findOneByOrFail({ email: mine.users.facilities_manager });
    await app.ds.getRepository(UserSite).delete({ userId: base.id, siteId: mine.siteIds[1] });
    const c = await signedIn(app, mine.users.facilities_manager);
    expect((await c.get(`/api/sites/${mine.siteIds[1]}`)).status).toBe(404);
    expect((await c.get(`/api/sites/${mine.siteIds[0]}`)).status).toBe(200);
    const list = await c.get('/api/sites');
    expect(list.body.map((s: { id: number }) => s.id)).toEqual([mine.siteIds[0]]);
    void email;
  });
});
