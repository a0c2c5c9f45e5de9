import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@common/api/roles';
import { routeTable } from '@backend/routes';
import type { RouteDef } from '@backend/http/route';
import { ALL_ROLES, Client, createTestOrg, signedIn, startTestApp, type TestApp, type TestOrg } from '../support/test-app';
import { idFixtures, type IdFixtures } from '../support/fixtures';

/**
 * Every API route × every role (and no sign-in) → the expected status class, generated from the same
 * route table the app registers, so a new route is in the matrix the moment it exists.
 * "allowed" means the role got past the access check: any status but 401/403 (a dummy body may still
 * be refused with 400, an id may be 404).
 */
let app: TestApp;
let org: TestOrg;
let ids: IdFixtures;
const clients = new Map<Role, Client>();

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
  ids = await idFixtures(app.ds, org);
  for (const role of ALL_ROLES) clients.set(role, await signedIn(app, org.users[role]));
});
afterAll(async () => {
  await app.close();
});

function concretePath(route: RouteDef): string {
  return route.path.replace(/:(\w+)/g, (_m, name: string) => String(ids.forParam(route.path, name)));
}

function expected(route: RouteDef, role: Role | null): 'allowed' | 401 | 403 {
  if (route.access === 'public') return 'allowed';
  if (role === null) return 401;
  if (route.access === 'authenticated') return 'allowed';
  return route.access.includes(role) ? 'allowed' : 403;
}

// Sign-out ends the session: run it last for each role.
const routes = routeTable().sort((a, b) => Number(a.path === '/api/auth/logout') - Number(b.path === '/api/auth/logout'));

describe('role matrix', () => {
  it('covers every route of the route table', () => {
    expect(routes.length).toBeGreaterThan(20);
    for (const r of routes) expect(r.access, `${r.method} ${r.path} declares its access`).toBeDefined();
  });

  for (const route of routes) {
    for (const role of [null, ...ALL_ROLES] as (Role | null)[]) {
      it(`${route.method.toUpperCase()} ${route.path} as ${role ?? 'nobody'} → ${expected(route, role)}`, async () => {
        const client = role ? clients.get(role)! : new Client(app.baseUrl);
        const res = await client.request(route.method.toUpperCase(), concretePath(route), route.method === 'get' ? undefined : {});
        const want = expected(route, role);
        if (want === 'allowed') expect([401, 403], `${res.status} ${JSON.stringify(res.body)}`).not.toContain(res.status);
        else expect(res.status).toBe(want);
        expect(res.status, JSON.stringify(res.body)).toBeLessThan(500);
      });
    }
  }
});
