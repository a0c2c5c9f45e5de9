import { In } from 'typeorm';
import type { Page, UserListQuery } from '@common/schemas/common.schema';
import type { UserCreateInput, UserUpdateInput } from '@common/schemas/admin.schema';
import type { Role } from '@common/api/roles';
import { db } from '../../db/db';
import { User, UserRole, UserSite } from '../../db/entities/user.entity';
import { Site } from '../../db/entities/site.entity';
import type { Actor } from '../../http/context';
import { AppError, badRequest, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';
import { hashPassword } from '../auth/auth.service';
import type { EntityManager } from 'typeorm';

export interface UserRow {
  id: number;
  email: string;
  name: string;
  active: boolean;
  roles: Role[];
  siteIds: number[];
  locked: boolean;
  createdAt: string;
}

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
    roles: roles.filter((r) => r.userId === u.id).map((r) => r.role as Role).sort(),
    siteIds: sites.filter((s) => s.userId === u.id).map((s) => s.siteId).sort((a, b) => a - b),
    locked: !!u.lockedUntil && u.lockedUntil > now,
    createdAt: u.createdAt.toISOString(),
  }));
}

const SORTABLE = new Map<UserListQuery['sort'], string>([['email', 'u.email'], ['name', 'u.name'], ['createdAt', 'u.created_at']]);

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
    if (await m.getRepository(User).findOneBy({ email: input.email })) throw new AppError(409, 'duplicate', 'A user with this e-mail exists already', [{ path: 'email', message: 'already in use' }]);
    const saved = await m.getRepository(User).save(m.getRepository(User).create({ organisationId: actor.user.organisationId, email: input.email, name: input.name, passwordHash: hash, active: true, failedLogins: 0, lockedUntil: null, passwordChangedAt: new Date() }));
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
    if (id === actor.user.id && input.active === false) throw badRequest('You cannot deactivate your own account', [{ path: 'active', message: 'not on your own account' }]);
    const patch: Partial<User> = {};
    if (input.name !== undefined) patch.name = input.name;
    if (input.active !== undefined) patch.active = input.active;
    if (hash) {
      patch.passwordHash = hash;
      patch.passwordChangedAt = new Date();
      patch.failedLogins = 0;
      patch.lockedUntil = null;
    }
    if (Object.keys(patch).length) await m.getRepository(User).update({ id }, patch);
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
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'user', entityId: String(id), before, after: { ...after, ...(hash ? { passwordReset: true } : {}) } });
    return after;
  });
}

export async function unlockUser(actor: Actor, id: number): Promise<UserRow> {
  return db().transaction(async (m) => {
    await getInOrg(m, actor, id);
    await m.getRepository(User).update({ id }, { failedLogins: 0, lockedUntil: null });
    const [row] = await present(m, [await getInOrg(m, actor, id)]);
    await recordAudit(m, whoOf(actor), { action: 'unlock', entity: 'user', entityId: String(id), after: row });
    return row;
  });
}
