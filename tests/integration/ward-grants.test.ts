import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Ward } from '@backend/db/entities/supply.entity';
import { createTestOrg, signedIn, startTestApp, uniq, type Client, type TestApp, type TestOrg } from '../support/test-app';

/** Administrators grant and revoke the wards of a ward lead: validated, audited, inside their organisation. */
let app: TestApp;
let org: TestOrg;
let theirs: TestOrg;
let admin: Client;
let wardA: number;
let wardB: number;
let theirWard: number;

async function addWard(siteId: number): Promise<number> {
  const w = await app.ds
    .getRepository(Ward)
    .save(app.ds.getRepository(Ward).create({ siteId, name: `Ward ${uniq()}`, department: 'ward', beds: 10, leakagePercent: 0, active: true }));
  return w.id;
}

async function grantsOf(userId: number): Promise<number[]> {
  const rows: { ward_id: number }[] = await app.ds.query('SELECT ward_id FROM user_ward WHERE user_id = ? ORDER BY ward_id', [userId]);
  return rows.map((r) => Number(r.ward_id));
}

beforeAll(async () => {
  app = await startTestApp();
  org = await createTestOrg(app.ds, 2);
  theirs = await createTestOrg(app.ds);
  admin = await signedIn(app, org.users.administrator);
  wardA = await addWard(org.siteIds[0]);
  wardB = await addWard(org.siteIds[1]);
  theirWard = await addWard(theirs.siteIds[0]);
});
afterAll(async () => {
  await app.close();
});

describe('ward grants', () => {
  it('lists every ward of the organisation by site, grants and revokes, and records both in the audit log', async () => {
    const lead = org.userIds.ward_lead;
    const view = await admin.get(`/api/users/${lead}/wards`);
    expect(view.status).toBe(200);
    expect(view.body.wardIds).toEqual([]);
    expect(view.body.sites.map((s: { id: number }) => s.id).sort()).toEqual([...org.siteIds].sort());
    expect(view.body.sites.find((s: { id: number }) => s.id === org.siteIds[1]).wards.map((w: { id: number }) => w.id)).toEqual([wardB]);
    // Nothing of another organisation is offered.
    expect(JSON.stringify(view.body)).not.toContain(`"id":${theirWard},`);

    const granted = await admin.put(`/api/users/${lead}/wards`, { wardIds: [wardB, wardA, wardA] });
    expect(granted.status, JSON.stringify(granted.body)).toBe(200);
    expect(granted.body.wardIds).toEqual([wardA, wardB].sort((a, b) => a - b));
    expect(await grantsOf(lead)).toEqual([wardA, wardB].sort((a, b) => a - b));

    const revoked = await admin.put(`/api/users/${lead}/wards`, { wardIds: [wardB] });
    expect(revoked.status).toBe(200);
    expect(await grantsOf(lead)).toEqual([wardB]);

    const audit: { action: string; before_json: string; after_json: string; user_email: string }[] = await app.ds.query(
      "SELECT action, before_json, after_json, user_email FROM audit_log WHERE entity = 'user_wards' AND entity_id = ? ORDER BY id",
      [String(lead)],
    );
    expect(audit).toHaveLength(2);
    expect(audit[0].user_email).toBe(org.users.administrator);
    expect(JSON.parse(audit[0].before_json).wardIds).toEqual([]);
    expect(JSON.parse(audit[1].after_json)).toMatchObject({ wardIds: [wardB], revoked: [wardA], granted: [] });
  });

  it('refuses bad bodies with field details and changes nothing', async () => {
    const lead = org.userIds.ward_lead;
    const before = await grantsOf(lead);
    for (const body of [
      {},
      { wardIds: 'all' },
      { wardIds: [0] },
      { wardIds: [-3] },
      { wardIds: [1.5] },
      { wardIds: ['1'] },
      { wardIds: null },
      { wardIds: { __proto__: [1] } },
      JSON.parse('{"__proto__": {"wardIds": [1]}}'),
    ]) {
      const res = await admin.put(`/api/users/${lead}/wards`, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.details[0].path, JSON.stringify(res.body)).toMatch(/^wardIds/);
    }
    for (const id of ['__proto__', 'constructor', 'toString', 'valueOf', 'hasOwnProperty', 'prototype', '0', '-1']) {
      expect((await admin.put(`/api/users/${id}/wards`, { wardIds: [] })).status, id).toBe(400);
      expect((await admin.get(`/api/users/${id}/wards`)).status, id).toBe(400);
    }
    expect(await grantsOf(lead)).toEqual(before);
  });

  it('answers 404 for another organisation’s ward or user, and for a ward that does not exist; grants nothing', async () => {
    const lead = org.userIds.ward_lead;
    const before = await grantsOf(lead);
    const other = await admin.put(`/api/users/${lead}/wards`, { wardIds: [wardA, theirWard] });
    expect(other.status).toBe(404);
    expect((await admin.put(`/api/users/${lead}/wards`, { wardIds: [2_000_000_000] })).status).toBe(404);
    expect((await admin.put(`/api/users/${theirs.userIds.ward_lead}/wards`, { wardIds: [] })).status).toBe(404);
    expect((await admin.get(`/api/users/${theirs.userIds.ward_lead}/wards`)).status).toBe(404);
    expect(await grantsOf(lead)).toEqual(before);
    expect(await grantsOf(theirs.userIds.ward_lead)).toEqual([]);
  });

  it('grants wards only to ward leads, and only administrators may grant', async () => {
    const res = await admin.put(`/api/users/${org.userIds.purchasing_officer}/wards`, { wardIds: [wardA] });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('wardIds');
    expect(await grantsOf(org.userIds.purchasing_officer)).toEqual([]);
    // Revoking (an empty set) is always allowed, e.g. after the ward-lead role was taken away.
    expect((await admin.put(`/api/users/${org.userIds.purchasing_officer}/wards`, { wardIds: [] })).status).toBe(200);
    const fm = await signedIn(app, org.users.facilities_manager);
    expect((await fm.put(`/api/users/${org.userIds.ward_lead}/wards`, { wardIds: [wardA] })).status).toBe(403);
    const self = await signedIn(app, org.users.ward_lead);
    expect((await self.put(`/api/users/${org.userIds.ward_lead}/wards`, { wardIds: [wardA] })).status).toBe(403);
  });
});
