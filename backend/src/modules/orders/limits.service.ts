import { In } from 'typeorm';
import type { ApprovalLimitInput } from '@common/schemas/orders.schema';
import type { ApprovalLimitRow } from '@common/schemas/orders.schema';
import { db } from '../../db/db';
import { User, UserRole } from '../../db/entities/user.entity';
import { UserApprovalLimit } from '../../db/entities/orders.entity';
import type { Actor } from '../../http/context';
import { badRequest, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';

/** Purchasing officers of the organisation with their approval limits (null: none set, so they cannot approve). */
export async function listApprovalLimits(actor: Actor): Promise<ApprovalLimitRow[]> {
  const roleRows = await db()
    .getRepository(UserRole)
    .find({ where: { role: 'purchasing_officer' } });
  const users = roleRows.length
    ? await db()
        .getRepository(User)
        .find({ where: { id: In(roleRows.map((r) => r.userId)), organisationId: actor.user.organisationId }, order: { name: 'ASC' } })
    : [];
  const limits = users.length
    ? await db()
        .getRepository(UserApprovalLimit)
        .findBy({ userId: In(users.map((u) => u.id)) })
    : [];
  return users.map((u) => {
    const l = limits.find((x) => x.userId === u.id);
    return { userId: u.id, name: u.name, email: u.email, active: u.active, limitMinor: l?.limitMinor ?? null, currency: l?.currency ?? null };
  });
}

/** The signed-in user's own limit. */
export async function myApprovalLimit(actor: Actor) {
  const l = await db().getRepository(UserApprovalLimit).findOneBy({ userId: actor.user.id });
  return l ? { limitMinor: l.limitMinor, currency: l.currency } : null;
}

export async function setApprovalLimit(actor: Actor, userId: number, input: ApprovalLimitInput) {
  return db().transaction(async (m) => {
    const user = await m.getRepository(User).findOneBy({ id: userId, organisationId: actor.user.organisationId });
    if (!user) throw notFound('User');
    const isOfficer = await m.getRepository(UserRole).findOneBy({ userId, role: 'purchasing_officer' });
    if (!isOfficer)
      throw badRequest(`${user.name} is not a purchasing officer: give the role first`, [{ path: 'limitMinor', message: 'only purchasing officers approve' }]);
    const before = await m.getRepository(UserApprovalLimit).findOneBy({ userId });
    await m.query(
      'INSERT INTO user_approval_limit (user_id, organisation_id, limit_minor, currency) VALUES (?, ?, ?, ?) ON DUPLICATE KEY UPDATE limit_minor = VALUES(limit_minor), currency = VALUES(currency)',
      [userId, actor.user.organisationId, input.limitMinor, input.currency],
    );
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'approval_limit',
      entityId: String(userId),
      before: before ? { limitMinor: before.limitMinor, currency: before.currency } : null,
      after: input,
    });
    return {
      userId,
      name: user.name,
      email: user.email,
      active: user.active,
      limitMinor: input.limitMinor,
      currency: input.currency,
    } satisfies ApprovalLimitRow;
  });
}
