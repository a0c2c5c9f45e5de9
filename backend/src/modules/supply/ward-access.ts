import { In, type EntityManager } from 'typeorm';
import { wardLeadOnly as onlyWardLead } from '@common/api/roles';
import { db } from '../../db/db';
import { UserWard } from '../../db/entities/ward-grant.entity';
import type { Ward } from '../../db/entities/supply.entity';
import type { Actor } from '../../http/context';
import { AppError } from '../../errors/app-error';

/**
 * Ward scope. A ward lead reports for the wards an administrator granted (user_ward), not for every
 * ward of their sites. Every other role reads at site level. So:
 * - a user whose only role is ward lead sees only granted wards: any other ward is "not found" (404);
 * - a ward lead who also holds a site-level role reads every ward of their sites, but the writes that
 *   only the ward-lead role allows (filing and correcting reports, therapy lines) stay limited to the
 *   granted wards (403 not_your_ward); a facilities manager writes for every ward of their sites.
 */
export function wardLeadOnly(actor: Actor): boolean {
  return onlyWardLead(actor.user.roles);
}

/** The ids of the wards granted to the actor (whatever their roles). */
export async function grantedWardIds(actor: Actor, m: EntityManager = db().manager): Promise<Set<number>> {
  const rows = await m.getRepository(UserWard).find({ select: { wardId: true }, where: { userId: actor.user.id } });
  return new Set(rows.map((r) => r.wardId));
}

async function isGranted(actor: Actor, wardId: number, m: EntityManager): Promise<boolean> {
  return (await m.getRepository(UserWard).countBy({ userId: actor.user.id, wardId })) > 0;
}

/** Whether the actor may see this ward (already known to be on one of their sites). */
export async function maySeeWard(actor: Actor, wardId: number, m: EntityManager = db().manager): Promise<boolean> {
  return !wardLeadOnly(actor) || isGranted(actor, wardId, m);
}

/** Keeps the wards of a site list the actor may see (all of them unless ward lead is their only role). */
export async function visibleWards<T extends { id: number } | { wardId: number }>(actor: Actor, wards: T[], m: EntityManager = db().manager): Promise<T[]> {
  if (!wardLeadOnly(actor) || !wards.length) return wards;
  const ids = wards.map((w) => ('wardId' in w ? w.wardId : w.id));
  const rows = await m.getRepository(UserWard).find({ select: { wardId: true }, where: { userId: actor.user.id, wardId: In(ids) } });
  const ok = new Set(rows.map((r) => r.wardId));
  return wards.filter((w) => ok.has('wardId' in w ? w.wardId : w.id));
}

/**
 * For a write a ward lead may make (reports, therapy lines): a facilities manager may write for every
 * ward of their sites, anyone else only for a granted ward. Call after the ward's site look-up.
 */
export async function assertMayWriteWard(actor: Actor, ward: Ward, m: EntityManager = db().manager): Promise<void> {
  if (actor.user.roles.includes('facilities_manager')) return;
  if (await isGranted(actor, ward.id, m)) return;
  throw new AppError(403, 'not_your_ward', `${ward.name} is not one of your wards: ask an administrator to grant it to you`);
}
