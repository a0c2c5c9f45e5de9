import { In } from 'typeorm';
import type { Page, UserListQuery } from '@common/schemas/common.schema';
import type { UserCreateInput, UserRow, UserUpdateInput } from '@common/schemas/admin.schema';
import type { UserWardsInput } from '@common/schemas/admin.schema';
import type { Role } from '@common/api/roles';
import { db } from '../../db/db';
import { User, UserRole, UserSite } from '../../db/entities/user.entity';
import { Site } from '../../db/entities/site.entity';
import { Ward } from '../../db/entities/supply.entity';
import { UserWard } from '../../db/entities/ward-grant.entity';
import type { Actor } from '../../http/context';
import { AppError, badRequest, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';
import { hashPassword } from '../auth/auth.service';
import type { EntityManager } from 'typeorm';

export type { UserRow };

async function present(m: EntityManager, users: User[]): Promise<UserRow[]> {
  if (users.length === 0) return [];
  const ids = users.map((u) => u.id);
  const roles = await m.getRepository(UserRole).find({ where: { userId: In(ids) } });
  const sites = await m.getRepository(UserSite).find({ where: { userId: In(ids) } });
  const now = new Date();
  return users.map((u) => ({
    id: u.id,
    email: u.email,
    name: u.name,
    active: u.active,
    roles: roles
      .filter((r) => r.userId === u.id)
      .map((r) => r.role as Role)
      .sort(),
    siteIds: sites
      .filter((s) => s.userId === u.id)
      .map((s) => s.siteId)
      .sort((a, b) => a - b),
    locked: !!u.lockedUntil && u.lockedUntil > now,
    createdAt: u.createdAt.toISOString(),
  }));
}

const SORTABLE = new Map<UserListQuery['sort'], string>([
  ['email', 'u.email'],
  ['name', 'u.name'],
  ['createdAt', 'u.created_at'],
]);

export async function listUsers(actor: Actor, q: UserListQuery): Promise<Page<UserRow>> {
  const qb = db().getRepository(User).createQueryBuilder('u').where('u.organisation_id = :org', { org: actor.user.organisationId });
  if (q.q) qb.andWhere('(u.email LIKE :q OR u.name LIKE :q)', { q: `%${q.q}%` });
  qb.orderBy(SORTABLE.get(q.sort ?? 'name') ?? 'u.name', q.dir === 'desc' ? 'DESC' : 'ASC')
    .skip((q.page - 1) * q.pageSize)
    .take(q.pageSize);
  const [users, total] = await qb.getManyAndCount();
  return { items: await present(db().manager, users), total, page: q.page, pageSize: q.pageSize };
}

async function checkSites(m: EntityManager, actor: Actor, siteIds: number[]) {
  if (siteIds.length === 0) return;
  const found = await m.getRepository(Site).count({ where: { id: In(siteIds), organisationId: actor.user.organisationId } });
  if (found !== new Set(siteIds).size) throw badRequest('One of the sites does not exist', [{ path: 'siteIds', message: 'unknown site' }]);
}

async function getInOrg(m: EntityManager, actor: Actor, id: number): Promise<User> {
  const user = await m.getRepository(User).findOneBy({ id, organisationId: actor.user.organisationId });
  if (!user) throw notFound('User');
  return user;
}

export async function createUser(actor: Actor, input: UserCreateInput): Promise<UserRow> {
  const hash = await hashPassword(input.password);
  return db().transaction(async (m) => {
    await checkSites(m, actor, input.siteIds);
    if (await m.getRepository(User).findOneBy({ email: input.email }))
      throw new AppError(409, 'duplicate', 'A user with this e-mail exists already', [{ path: 'email', message: 'already in use' }]);
    const saved = await m.getRepository(User).save(
      m.getRepository(User).create({
        organisationId: actor.user.organisationId,
        email: input.email,
        name: input.name,
        passwordHash: hash,
        active: true,
        failedLogins: 0,
        lockedUntil: null,
        passwordChangedAt: new Date(),
      }),
    );
    await m.getRepository(UserRole).insert([...new Set(input.roles)].map((role) => ({ userId: saved.id, role })));
    if (input.siteIds.length) await m.getRepository(UserSite).insert([...new Set(input.siteIds)].map((siteId) => ({ userId: saved.id, siteId })));
    const [row] = await present(m, [saved]);
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'user', entityId: String(saved.id), after: row });
    return row;
  });
}

export async function updateUser(actor: Actor, id: number, input: UserUpdateInput): Promise<UserRow> {
  const hash = input.password ? await hashPassword(input.password) : undefined;
  return db().transaction(async (m) => {
    const user = await getInOrg(m, actor, id);
    const [before] = await present(m, [user]);
    if (id === actor.user.id && input.roles && !input.roles.includes('administrator')) {
      throw badRequest('You cannot remove your own administrator role', [{ path: 'roles', message: 'keep administrator on your own account' }]);
    }
    if (id === actor.user.id && input.active === false)
      throw badRequest('You cannot deactivate your own account', [{ path: 'active', message: 'not on your own account' }]);
    const patch: Partial<User> = {};
    if (input.name !== undefined) patch.name = input.name;
    if (input.active !== undefined) patch.active = input.active;
    if (hash) {
      patch.passwordHash = hash;
      patch.passwordChangedAt = new Date();
      patch.failedLogins = 0;
      patch.lockedUntil = null;
      patch.lockCount = 0;
    }
    if (Object.keys(patch).length) await m.getRepository(User).update({ id }, patch);
    // A new password ends every session of the user (the generation is checked on each request, in every process).
    if (hash) await m.query('UPDATE app_user SET session_generation = session_generation + 1 WHERE id = ?', [id]);
    if (input.roles) {
      await m.getRepository(UserRole).delete({ userId: id });
      await m.getRepository(UserRole).insert([...new Set(input.roles)].map((role) => ({ userId: id, role })));
    }
    if (input.siteIds) {
      await checkSites(m, actor, input.siteIds);
      await m.getRepository(UserSite).delete({ userId: id });
      if (input.siteIds.length) await m.getRepository(UserSite).insert([...new Set(input.siteIds)].map((siteId) => ({ userId: id, siteId })));
    }
    const [after] = await present(m, [await getInOrg(m, actor, id)]);
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'user',
      entityId: String(id),
      before,
      after: { ...after, ...(hash ? { passwordReset: true } : {}) },
    });
    return after;
  });
}

export async function unlockUser(actor: Actor, id: number): Promise<UserRow> {
  return db().transaction(async (m) => {
    await getInOrg(m, actor, id);
    await m.getRepository(User).update({ id }, { failedLogins: 0, lockedUntil: null, lockCount: 0 });
    const [row] = await present(m, [await getInOrg(m, actor, id)]);
    await recordAudit(m, whoOf(actor), { action: 'unlock', entity: 'user', entityId: String(id), after: row });
    return row;
  });
}

// ---------- ward grants (which wards a ward lead reports for) ----------

export interface UserWardsView {
  userId: number;
  wardIds: number[];
  /** The organisation's sites with their wards, for the picker; `granted` says whether the user holds the site. */
  sites: { id: number; name: string; granted: boolean; wards: { id: number; name: string; department: string; active: boolean }[] }[];
}

async function wardsView(m: EntityManager, actor: Actor, user: User): Promise<UserWardsView> {
  const sites = await m.getRepository(Site).find({ where: { organisationId: actor.user.organisationId }, order: { name: 'ASC' } });
  const wards = sites.length ? await m.getRepository(Ward).find({ where: { siteId: In(sites.map((s) => s.id)) }, order: { name: 'ASC' } }) : [];
  const held = new Set((await m.getRepository(UserSite).find({ where: { userId: user.id } })).map((s) => s.siteId));
  const inOrg = new Set(wards.map((w) => w.id));
  const wardIds = (await m.getRepository(UserWard).find({ where: { userId: user.id } }))
    .map((g) => g.wardId)
    .filter((id) => inOrg.has(id))
    .sort((a, b) => a - b);
  return {
    userId: user.id,
    wardIds,
    sites: sites.map((s) => ({
      id: s.id,
      name: s.name,
      granted: held.has(s.id),
      wards: wards.filter((w) => w.siteId === s.id).map((w) => ({ id: w.id, name: w.name, department: w.department, active: w.active })),
    })),
  };
}

/** The wards granted to a user of the administrator's organisation, with every ward to choose from. */
export async function getUserWards(actor: Actor, id: number): Promise<UserWardsView> {
  const m = db().manager;
  return wardsView(m, actor, await getInOrg(m, actor, id));
}

/**
 * Sets the wards granted to a ward lead (grants the new ones, revokes the absent ones; audited). Only
 * wards of the organisation's sites: any other id is "not found", as for every record outside it.
 */
export async function setUserWards(actor: Actor, id: number, input: UserWardsInput): Promise<UserWardsView> {
  return db().transaction(async (m) => {
    const user = await getInOrg(m, actor, id);
    const wanted = [...new Set(input.wardIds)];
    if (wanted.length) {
      const roles = await m.getRepository(UserRole).find({ where: { userId: id } });
      if (!roles.some((r) => r.role === 'ward_lead'))
        throw badRequest('Wards are granted to ward leads: give this user the ward-lead role first', [{ path: 'wardIds', message: 'not a ward lead' }]);
      const found = await m
        .getRepository(Ward)
        .createQueryBuilder('w')
        .innerJoin(Site, 's', 's.id = w.site_id')
        .where('w.id IN (:...ids) AND s.organisation_id = :org', { ids: wanted, org: actor.user.organisationId })
        .getCount();
      if (found !== wanted.length) throw notFound('Ward');
    }
    const before = await wardsView(m, actor, user);
    const keep = new Set(wanted);
    const revoke = before.wardIds.filter((w) => !keep.has(w));
    const grant = wanted.filter((w) => !before.wardIds.includes(w));
    if (revoke.length) await m.getRepository(UserWard).delete({ userId: id, wardId: In(revoke) });
    if (grant.length) await m.getRepository(UserWard).insert(grant.map((wardId) => ({ userId: id, wardId })));
    const after = await wardsView(m, actor, user);
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'user_wards',
      entityId: String(id),
      before: { wardIds: before.wardIds },
      after: { wardIds: after.wardIds, granted: grant, revoked: revoke },
    });
    return after;
  });
}
