import type { SiteInput } from '@common/schemas/admin.schema';
import { db } from '../../db/db';
import { Site } from '../../db/entities/site.entity';
import { Organisation } from '../../db/entities/organisation.entity';
import type { Actor } from '../../http/context';
import { conflict, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';
import type { OrganisationView, SiteView } from '@common/schemas/admin.schema';

/** Atmospheric pressure at an altitude, bar: ICAO standard atmosphere, p = p0·(1 − 2.25577e-5·h)^5.25588. */
export function standardAtmosphereBar(altitudeM: number): number {
  return 1.01325 * Math.pow(1 - 2.25577e-5 * altitudeM, 5.25588);
}

export function presentSite(s: Site): SiteView {
  return {
    id: s.id,
    name: s.name,
    kind: s.kind as SiteView['kind'],
    address: s.address,
    timeZone: s.timeZone,
    referenceCode: s.referenceCode as SiteView['referenceCode'],
    unitSystem: s.unitSystem as SiteView['unitSystem'],
    altitudeM: s.altitudeM,
    atmosphericBar: s.atmosphericBar,
    currency: s.currency,
    cylinderColours: s.cylinderColours as SiteView['cylinderColours'],
    storeTemperatureC: s.storeTemperatureC,
    beds: s.beds,
    updatedAt: s.updatedAt.toISOString(),
  };
}

/** A site the actor may see, or 404 (never 403: another site's records do not exist for this user). */
export async function getSiteFor(actor: Actor, id: number): Promise<Site> {
  if (!actor.user.siteIds.includes(id)) throw notFound('Site');
  const site = await db().getRepository(Site).findOneBy({ id, organisationId: actor.user.organisationId });
  if (!site) throw notFound('Site');
  return site;
}

export async function listSites(actor: Actor) {
  if (actor.user.siteIds.length === 0) return [];
  const sites = await db()
    .getRepository(Site)
    .createQueryBuilder('s')
    .where('s.organisation_id = :org AND s.id IN (:...ids)', { org: actor.user.organisationId, ids: actor.user.siteIds })
    .orderBy('s.name')
    .getMany();
  return sites.map(presentSite);
}

function toRow(input: SiteInput) {
  return { ...input, atmosphericBar: input.atmosphericBar ?? Number(standardAtmosphereBar(input.altitudeM).toFixed(5)) };
}

export async function createSite(actor: Actor, input: SiteInput) {
  return db().transaction(async (m) => {
    const repo = m.getRepository(Site);
    if (await repo.findOneBy({ organisationId: actor.user.organisationId, name: input.name }))
      throw conflict(`A site called "${input.name}" exists already`, 'duplicate');
    const saved = await repo.save(repo.create({ ...toRow(input), organisationId: actor.user.organisationId }));
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'site', entityId: String(saved.id), after: presentSite(saved) });
    return presentSite(saved);
  });
}

export async function updateSite(actor: Actor, id: number, input: SiteInput) {
  await getSiteFor(actor, id);
  return db().transaction(async (m) => {
    const repo = m.getRepository(Site);
    const before = await repo.findOneByOrFail({ id });
    const clash = await repo.findOneBy({ organisationId: actor.user.organisationId, name: input.name });
    if (clash && clash.id !== id) throw conflict(`A site called "${input.name}" exists already`, 'duplicate');
    await repo.update({ id }, toRow(input));
    const after = await repo.findOneByOrFail({ id });
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'site', entityId: String(id), before: presentSite(before), after: presentSite(after) });
    return presentSite(after);
  });
}

export async function getOrganisation(actor: Actor) {
  const org = await db().getRepository(Organisation).findOneByOrFail({ id: actor.user.organisationId });
  return { id: org.id, name: org.name } satisfies OrganisationView;
}

export async function renameOrganisation(actor: Actor, name: string) {
  return db().transaction(async (m) => {
    const repo = m.getRepository(Organisation);
    const before = await repo.findOneByOrFail({ id: actor.user.organisationId });
    await repo.update({ id: before.id }, { name });
    await recordAudit(m, whoOf(actor), {
      action: 'update',
      entity: 'organisation',
      entityId: String(before.id),
      before: { name: before.name },
      after: { name },
    });
    return { id: before.id, name } satisfies OrganisationView;
  });
}
