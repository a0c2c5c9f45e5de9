import { In, IsNull } from 'typeorm';
import type { SubscriptionInput } from '@common/schemas/orders.schema';
import type { SubscriptionView } from '@common/schemas/orders.schema';
import { db } from '../../db/db';
import { Site } from '../../db/entities/site.entity';
import { User } from '../../db/entities/user.entity';
import { AlertEvent, AlertState, SiteSubscription } from '../../db/entities/orders.entity';
import type { Actor } from '../../http/context';
import { notFound } from '../../errors/app-error';
import { env } from '../../config/env';
import { getSiteFor } from '../sites/sites.service';
import { loadSiteModels } from '../forecast/site-model';
import { FORECAST_CAUTION, outlookFor, type SourceOutlook } from '../forecast/forecast.service';
import { enqueueMail } from './outbox.service';

// ---------- subscriptions ----------

export async function listSubscriptions(actor: Actor): Promise<SubscriptionView[]> {
  const subs = await db()
    .getRepository(SiteSubscription)
    .find({ where: { userId: actor.user.id } });
  const visible = subs.filter((s) => actor.user.siteIds.includes(s.siteId));
  const sites = visible.length
    ? await db()
        .getRepository(Site)
        .findBy({ id: In(visible.map((s) => s.siteId)) })
    : [];
  return visible.map((s) => ({
    siteId: s.siteId,
    siteName: sites.find((x) => x.id === s.siteId)?.name ?? '',
    mode: s.mode as SubscriptionView['mode'],
    policyDays: s.policyDays,
    lastDigestAt: s.lastDigestAt?.toISOString() ?? null,
  }));
}

export async function setSubscription(actor: Actor, siteId: number, input: SubscriptionInput) {
  await getSiteFor(actor, siteId);
  await db().query(
    'INSERT INTO site_subscription (user_id, site_id, mode, policy_days) VALUES (?, ?, ?, ?) ON DUPLICATE KEY UPDATE mode = VALUES(mode), policy_days = VALUES(policy_days)',
    [actor.user.id, siteId, input.mode, input.policyDays],
  );
  return { siteId, mode: input.mode, policyDays: input.policyDays };
}

export async function deleteSubscription(actor: Actor, siteId: number) {
  await getSiteFor(actor, siteId);
  const res = await db().getRepository(SiteSubscription).delete({ userId: actor.user.id, siteId });
  if (!res.affected) throw notFound('Subscription');
  await db().query('DELETE a FROM alert_state a JOIN supply_source s ON s.id = a.source_id WHERE a.user_id = ? AND s.site_id = ?', [actor.user.id, siteId]);
  return { ok: true };
}

// ---------- the alert pass ----------

function daysText(d: number | null): string {
  return d === null ? 'unknown' : d >= 10 ? `${Math.round(d)} days` : `${d.toFixed(1)} days`;
}

/** What changed for a subscriber, or null when nothing did (a recompute with the same outcome says nothing). */
export function alertChange(
  prev: { below: boolean; riskCode: string | null } | null,
  o: SourceOutlook,
  policyDays: number,
): { below: boolean; riskCode: string | null; messages: string[] } | null {
  const below = o.daysOfStock !== null && o.daysOfStock < policyDays;
  const riskCode = o.firstRisk?.code ?? null;
  const was = prev ?? { below: false, riskCode: null };
  if (was.below === below && was.riskCode === riskCode) return null;
  const messages: string[] = [];
  if (below && !was.below) messages.push(`Days of stock fell to ${daysText(o.daysOfStock)}, below your alert level of ${policyDays} days.`);
  if (riskCode !== was.riskCode && riskCode !== null && o.firstRisk)
    messages.push(`First risk is now: ${o.firstRisk.message} (from ${o.firstRisk.at.slice(0, 16).replace('T', ' ')} UTC).`);
  return { below, riskCode, messages };
}

/**
 * Compares every subscribed source's outlook with what each subscriber was last told and, for each change,
 * queues one e-mail (immediate) or one digest entry. The state row is locked while it is compared, so two
 * processes running the pass at once tell a change once. Returns the number of changes reported.
 */
export async function runAlertPass(now = new Date()): Promise<number> {
  const ds = db();
  const subs = await ds.getRepository(SiteSubscription).find();
  if (!subs.length) return 0;
  const users = await ds.getRepository(User).findBy({ id: In([...new Set(subs.map((s) => s.userId))]), active: true });
  const sites = await ds.getRepository(Site).findBy({ id: In([...new Set(subs.map((s) => s.siteId))]) });
  let reported = 0;
  for (const site of sites) {
    const [model] = await loadSiteModels([site.id], site.organisationId);
    if (!model) continue;
    const outlooks = model.sources.filter((s) => s.type !== 'emergency_reserve').map((s) => ({ s, o: outlookFor(model, s, { now }) }));
    for (const sub of subs.filter((x) => x.siteId === site.id)) {
      const user = users.find((u) => u.id === sub.userId && u.organisationId === site.organisationId);
      if (!user) continue;
      for (const { s, o } of outlooks) {
        if (o.status === 'unknown') continue;
        const told = await ds.transaction(async (m) => {
          await m.query('INSERT IGNORE INTO alert_state (user_id, source_id, below, risk_code) VALUES (?, ?, 0, NULL)', [user.id, s.id]);
          const [row] = (await m.query('SELECT below, risk_code FROM alert_state WHERE user_id = ? AND source_id = ? FOR UPDATE', [user.id, s.id])) as {
            below: number;
            risk_code: string | null;
          }[];
          const change = alertChange({ below: Boolean(row.below), riskCode: row.risk_code }, o, sub.policyDays);
          if (!change) return false;
          await m.getRepository(AlertState).update({ userId: user.id, sourceId: s.id }, { below: change.below, riskCode: change.riskCode });
          if (!change.messages.length) return false;
          const text = `${s.name} (${site.name}): ${change.messages.join(' ')}`;
          if (sub.mode === 'digest') {
            await m.getRepository(AlertEvent).insert({ userId: user.id, siteId: site.id, sourceId: s.id, text: text.slice(0, 1000) });
          } else {
            await enqueueMail(m, {
              organisationId: site.organisationId,
              kind: 'alert',
              to: user.email,
              subject: `Plenum alert: ${s.name} at ${site.name} — ${daysText(o.daysOfStock)} of stock`,
              text: [
                text,
                '',
                `Status: ${o.statusText}.`,
                o.reorderAt ? `Reorder by: ${o.reorderAt.slice(0, 16).replace('T', ' ')} UTC.` : '',
                o.emptyAt ? `Forecast empty: ${o.emptyAt.slice(0, 16).replace('T', ' ')} UTC.` : '',
                '',
                `Open the source: ${env().PUBLIC_URL}/sources/${s.id}`,
                '',
                FORECAST_CAUTION,
                '',
                'You receive this because you subscribed to alerts for this site in Plenum.',
              ]
                .filter((l, i, a) => l !== '' || a[i - 1] !== '')
                .join('\n'),
            });
          }
          return true;
        });
        if (told) reported++;
      }
    }
  }
  return reported;
}

/** Sends each digest subscriber, at most once a day, one message with the changes gathered since the last. */
export async function runDigestPass(now = new Date()): Promise<number> {
  const ds = db();
  const due = await ds.getRepository(SiteSubscription).find({ where: { mode: 'digest' } });
  const byUser = new Map<number, SiteSubscription[]>();
  for (const s of due)
    if (!s.lastDigestAt || now.getTime() - s.lastDigestAt.getTime() >= 23.5 * 3_600_000) byUser.set(s.userId, [...(byUser.get(s.userId) ?? []), s]);
  let sent = 0;
  for (const [userId, subs] of byUser) {
    const user = await ds.getRepository(User).findOneBy({ id: userId, active: true });
    if (!user) continue;
    const ok = await ds.transaction(async (m) => {
      const events = await m
        .getRepository(AlertEvent)
        .createQueryBuilder('e')
        .setLock('pessimistic_write')
        .where('e.user_id = :u AND e.digested_at IS NULL AND e.site_id IN (:...sites)', { u: userId, sites: subs.map((s) => s.siteId) })
        .orderBy('e.at', 'ASC')
        .getMany();
      await m.getRepository(SiteSubscription).update({ userId, siteId: In(subs.map((s) => s.siteId)) }, { lastDigestAt: now });
      if (!events.length) return false;
      await m.getRepository(AlertEvent).update({ id: In(events.map((e) => e.id)), digestedAt: IsNull() }, { digestedAt: now });
      await enqueueMail(m, {
        organisationId: user.organisationId,
        kind: 'digest',
        to: user.email,
        subject: `Plenum daily digest: ${events.length} change${events.length === 1 ? '' : 's'} in stock`,
        text: [
          `Changes since your last digest:`,
          '',
          ...events.map((e) => `• ${e.at.toISOString().slice(0, 16).replace('T', ' ')} UTC — ${e.text}`),
          '',
          FORECAST_CAUTION,
        ].join('\n'),
        dedupeKey: `digest:${userId}:${events[0].id}`,
      });
      return true;
    });
    if (ok) sent++;
  }
  return sent;
}
