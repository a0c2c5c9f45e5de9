import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { routeTable } from '@backend/routes';
import type { RouteDef } from '@backend/http/route';
import { Ward } from '@backend/db/entities/supply.entity';
import { createTestOrg, PASSWORD, signedIn, startTestApp, uniq, type Client, type TestApp, type TestOrg } from '../support/test-app';
import { resourceOf } from '../support/fixtures';

/**
 * A ward lead sees and files only the wards an administrator granted them: every ward-scoped route
 * answers 404 for a ward of their own site that is not granted (it does not exist for them) and works
 * for a granted one. Generated from the route table, so a new ward-scoped route is checked at once.
 */
let app: TestApp;
let org: TestOrg;
let admin: Client;
let fm: Client;
let lead: Client;
let granted: number;
let other: number;
const reportOn = new Map<number, number>();

const today = () => DateTime.now().setZone('Europe/London').toISODate()!;
const yesterday = () => DateTime.fromISO(today()).minus({ days: 1 }).toISODate()!;

/** A valid body for each ward-scoped write a ward lead may call (validation answers before the look-up). */
const BODIES: Record<string, () => unknown> = {
  'POST /api/wards/:id/usage-reports': () => ({
    date: today(),
    devices: [{ device: 'nasal_cannula', patientsNow: 2, patientsShift: 3 }],
    cylinders: [],
    note: '',
  }),
  'PUT /api/wards/:id/therapy': () => ({ lines: [{ gasCode: 'O2', device: 'nasal_cannula', patients: 4 }] }),
  'PUT /api/usage-reports/:id': () => ({ devices: [{ device: 'nasal_cannula', patientsNow: 1, patientsShift: 1 }], cylinders: [], note: 'checked' }),
};

const WARD_RESOURCES = new Set(['wards', 'usage-reports']);
const wardRoutes = routeTable().filter((r) => {
  const params = [...r.path.matchAll(/:(\w+)/g)].map((m) => m[1]);
  if (params.length !== 1 || !WARD_RESOURCES.has(resourceOf(r.path, params[0]))) return false;
  return r.access === 'authenticated' || (Array.isArray(r.access) && r.access.includes('ward_lead'));
});

function pathFor(route: RouteDef, wardId: number): string {
  const id = resourceOf(route.path, 'id') === 'usage-reports' ? reportOn.get(wardId)! : wardId;
  return route.path.replace(':id', String(id));
}

async function addWard(name: string): Promise<number> {
  const w = await app.ds
    .getRepository(Ward)
    .save(
      app.ds.getRepository(Ward).create({ siteId: org.siteIds[0], name: `${name} ${uniq()}`, department: 'ward', beds: 12, leakagePercent: 0, active: true }),
    );
  return w.id;
}

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds);
  admin = await signedIn(app, org.users.administrator);
  fm = await signedIn(app, org.users.facilities_manager);
  lead = await signedIn(app, org.users.ward_lead);
  granted = await addWard('Granted');
  other = await addWard('Not granted');
  for (const wardId of [granted, other]) {
    const r = await fm.post(`/api/wards/${wardId}/usage-reports`, { date: yesterday(), devices: [], cylinders: [], note: '' });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    reportOn.set(wardId, r.body.id);
  }
  const grant = await admin.put(`/api/users/${org.userIds.ward_lead}/wards`, { wardIds: [granted] });
  expect(grant.status, JSON.stringify(grant.body)).toBe(200);
});
afterAll(async () => {
  await app.close();
});

describe('ward isolation for ward leads', () => {
  it('finds the ward-scoped routes a ward lead may call, each with a body when it writes', () => {
    expect(wardRoutes.length).toBeGreaterThanOrEqual(6);
    for (const r of wardRoutes)
      if (r.method !== 'get') expect(BODIES[`${r.method.toUpperCase()} ${r.path}`], `${r.method} ${r.path} needs a body in BODIES`).toBeDefined();
  });

  for (const route of wardRoutes) {
    const key = `${route.method.toUpperCase()} ${route.path}`;
    it(`${key}: a ward not granted is 404, the granted ward answers`, async () => {
      const body = route.method === 'get' ? undefined : BODIES[key]();
      const denied = await lead.request(route.method.toUpperCase(), pathFor(route, other), body);
      expect(denied.status, JSON.stringify(denied.body)).toBe(404);
      const allowed = await lead.request(route.method.toUpperCase(), pathFor(route, granted), body);
      expect(allowed.status, JSON.stringify(allowed.body)).toBe(200);
    });
  }

  it('lists only the granted ward on the site’s ward list and report status; the facilities manager sees both', async () => {
    const site = org.siteIds[0];
    const wards = (await lead.get(`/api/sites/${site}/wards`)).body.map((w: { id: number }) => w.id);
    expect(wards).toEqual([granted]);
    const status = (await lead.get(`/api/sites/${site}/usage-status`)).body.wards.map((w: { wardId: number }) => w.wardId);
    expect(status).toEqual([granted]);
    const all = (await fm.get(`/api/sites/${site}/wards`)).body.map((w: { id: number }) => w.id);
    expect(all).toEqual(expect.arrayContaining([granted, other]));
    expect((await fm.get(`/api/wards/${other}`)).status).toBe(200);
  });

  it('a ward lead with no ward granted sees no wards, and a revoked ward is 404 again', async () => {
    expect((await admin.put(`/api/users/${org.userIds.ward_lead}/wards`, { wardIds: [] })).status).toBe(200);
    expect((await lead.get(`/api/sites/${org.siteIds[0]}/wards`)).body).toEqual([]);
    expect((await lead.get(`/api/sites/${org.siteIds[0]}/usage-status`)).body.wards).toEqual([]);
    expect((await lead.get(`/api/wards/${granted}`)).status).toBe(404);
    expect((await admin.put(`/api/users/${org.userIds.ward_lead}/wards`, { wardIds: [granted] })).status).toBe(200);
    expect((await lead.get(`/api/wards/${granted}`)).status).toBe(200);
  });

  it('a ward lead who also holds a site-level role reads every ward but files only for granted wards', async () => {
    const email = `lead-biomed-${uniq()}@test.example`;
    const made = await admin.post('/api/users', {
      email,
      name: 'Lead and engineer',
      roles: ['ward_lead', 'biomedical_engineer'],
      siteIds: [org.siteIds[0]],
      password: PASSWORD,
    });
    expect(made.status, JSON.stringify(made.body)).toBe(200);
    expect((await admin.put(`/api/users/${made.body.id}/wards`, { wardIds: [granted] })).status).toBe(200);
    const both = await signedIn(app, email);
    expect((await both.get(`/api/wards/${other}`)).status).toBe(200);
    const denied = await both.post(`/api/wards/${other}/usage-reports`, BODIES['POST /api/wards/:id/usage-reports']());
    expect(denied.status, JSON.stringify(denied.body)).toBe(403);
    expect(denied.body.error.code).toBe('not_your_ward');
    expect((await both.put(`/api/usage-reports/${reportOn.get(other)}`, BODIES['PUT /api/usage-reports/:id']())).status).toBe(403);
    expect((await both.put(`/api/wards/${other}/therapy`, BODIES['PUT /api/wards/:id/therapy']())).status).toBe(403);
    expect((await both.put(`/api/usage-reports/${reportOn.get(granted)}`, BODIES['PUT /api/usage-reports/:id']())).status).toBe(200);
  });
});
