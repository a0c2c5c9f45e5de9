import type { EntityManager } from 'typeorm';
import type { AuditListQuery, Page } from '@common/schemas/common.schema';
import { AuditLog } from '../../db/entities/audit-log.entity';
import { db } from '../../db/db';
import type { Actor } from '../../http/context';
import type { AuditRow } from '@common/schemas/audit.schema';

export interface AuditWho {
  organisationId: number | null;
  userId: number | null;
  userEmail: string | null;
  requestId: string | null;
}

export interface AuditWhat {
  action: 'create' | 'update' | 'delete' | 'lock' | 'unlock' | 'sign_in' | 'sign_out' | string;
  entity: string;
  entityId?: string | null;
  before?: unknown;
  after?: unknown;
}

const SECRET_KEYS = /password|hash|token|secret/i;

/** Drops secrets from an audit snapshot: the log must never hold a password or its hash. */
function scrub(value: unknown): unknown {
  if (value === undefined || value === null) return value;
  return JSON.parse(JSON.stringify(value, (k, v) => (k && SECRET_KEYS.test(k) ? '[hidden]' : v)));
}

export function whoOf(actor: Actor): AuditWho {
  return { organisationId: actor.user.organisationId, userId: actor.user.id, userEmail: actor.user.email, requestId: actor.requestId };
}

/** Writes one audit row with the same manager as the change it records (so both commit or neither). */
export async function recordAudit(manager: EntityManager, who: AuditWho, what: AuditWhat): Promise<void> {
  await manager.getRepository(AuditLog).insert({
    organisationId: who.organisationId,
    userId: who.userId,
    userEmail: who.userEmail,
    requestId: who.requestId,
    action: what.action,
    entity: what.entity,
    entityId: what.entityId ?? null,
    beforeJson: what.before === undefined ? null : JSON.stringify(scrub(what.before)),
    afterJson: what.after === undefined ? null : JSON.stringify(scrub(what.after)),
  });
}

export type { AuditRow };

const SORTABLE = new Map<AuditListQuery['sort'], string>([
  ['at', 'a.at'],
  ['action', 'a.action'],
  ['entity', 'a.entity'],
  ['userEmail', 'a.user_email'],
]);

/** The organisation's audit log, newest first by default, filtered by entity, action or e-mail. */
export async function listAudit(organisationId: number, q: AuditListQuery): Promise<Page<AuditRow>> {
  const qb = db().getRepository(AuditLog).createQueryBuilder('a').where('a.organisation_id = :org', { org: organisationId });
  if (q.entity) qb.andWhere('a.entity = :entity', { entity: q.entity });
  if (q.q) qb.andWhere('(a.user_email LIKE :q OR a.entity LIKE :q OR a.action LIKE :q OR a.entity_id = :exact)', { q: `%${q.q}%`, exact: q.q });
  const sortCol = SORTABLE.get(q.sort ?? 'at') ?? 'a.at';
  const dir = q.sort ? (q.dir === 'desc' ? 'DESC' : 'ASC') : 'DESC';
  qb.orderBy(sortCol, dir)
    .addOrderBy('a.id', 'DESC')
    .skip((q.page - 1) * q.pageSize)
    .take(q.pageSize);
  const [rows, total] = await qb.getManyAndCount();
  return {
    items: rows.map((r) => ({
      id: r.id,
      at: r.at.toISOString(),
      userEmail: r.userEmail,
      action: r.action,
      entity: r.entity,
      entityId: r.entityId,
      before: r.beforeJson ? JSON.parse(r.beforeJson) : null,
      after: r.afterJson ? JSON.parse(r.afterJson) : null,
    })),
    total,
    page: q.page,
    pageSize: q.pageSize,
  };
}
