import { DateTime } from 'luxon';
import { In } from 'typeorm';
import { db } from '../../db/db';
import { env } from '../../config/env';
import { mailer } from '../../mail/mailer';
import { logger } from '../../logger';
import { Site } from '../../db/entities/site.entity';

interface MissingWard {
  siteId: number;
  siteName: string;
  wardId: number;
  wardName: string;
  date: string;
}

/**
 * Sends the day's reminders: for every site whose local time is past REPORT_REMINDER_LOCAL_TIME, each
 * active ward without a report for the local date gets one reminder (usage_reminder holds the claim, so
 * a restart or a second process never sends twice). It goes to the active ward leads granted that ward
 * (user_ward), or, when no ward lead is granted it, to the site's facilities managers with a line
 * asking for the grant. One e-mail per person.
 * Returns what was sent (for the log and for tests).
 */
export async function sendDueReminders(now: Date = new Date(), opts: { siteIds?: number[] } = {}): Promise<{ to: string; wards: string[] }[]> {
  const e = env();
  const [hh, mm] = e.REPORT_REMINDER_LOCAL_TIME.split(':').map(Number);
  const sites = await db()
    .getRepository(Site)
    .find(opts.siteIds ? { where: { id: In(opts.siteIds) } } : {});
  const missing: MissingWard[] = [];
  for (const site of sites) {
    const local = DateTime.fromJSDate(now, { zone: site.timeZone });
    if (local.hour * 60 + local.minute < hh * 60 + mm) continue;
    const date = local.toISODate()!;
    const rows: { id: number; name: string }[] = await db().query(
      `SELECT w.id, w.name FROM ward w
        WHERE w.site_id = ? AND w.active = 1
          AND NOT EXISTS (SELECT 1 FROM usage_report r WHERE r.ward_id = w.id AND r.report_date = ?)
          AND NOT EXISTS (SELECT 1 FROM usage_reminder m WHERE m.ward_id = w.id AND m.local_date = ?)
        ORDER BY w.name`,
      [site.id, date, date],
    );
    for (const w of rows) missing.push({ siteId: site.id, siteName: site.name, wardId: w.id, wardName: w.name, date });
  }
  if (!missing.length) return [];

  // Recipients per ward: the active ward leads granted that ward (and its site). When nobody is granted
  // it, the site's facilities managers (they may file for any ward, and the e-mail asks them to have
  // an administrator grant it): ward leads without the grant could not open the ward.
  const byEmail = new Map<string, { name: string; wards: MissingWard[]; ungranted: Set<number> }>();
  for (const w of missing) {
    const leads: { email: string; name: string }[] = await db().query(
      `SELECT u.email, u.name
         FROM app_user u
         JOIN user_role ur ON ur.user_id = u.id AND ur.role = 'ward_lead'
         JOIN user_site us ON us.user_id = u.id AND us.site_id = ?
         JOIN user_ward uw ON uw.user_id = u.id AND uw.ward_id = ?
        WHERE u.active = 1
        ORDER BY u.email`,
      [w.siteId, w.wardId],
    );
    const ungranted = leads.length === 0;
    const to: { email: string; name: string }[] = ungranted
      ? await db().query(
          `SELECT u.email, u.name
             FROM app_user u
             JOIN user_role ur ON ur.user_id = u.id AND ur.role = 'facilities_manager'
             JOIN user_site us ON us.user_id = u.id AND us.site_id = ?
            WHERE u.active = 1
            ORDER BY u.email`,
          [w.siteId],
        )
      : leads;
    if (!to.length) continue;
    // Claim before sending: the unique key (ward, date) makes a second sender skip it.
    const claim: { affectedRows?: number } = await db().query(
      'INSERT IGNORE INTO usage_reminder (site_id, ward_id, local_date, recipients) VALUES (?, ?, ?, ?)',
      [
        w.siteId,
        w.wardId,
        w.date,
        to
          .map((l) => l.email)
          .join(', ')
          .slice(0, 2000),
      ],
    );
    if (!claim.affectedRows) continue;
    for (const l of to) {
      const acc = byEmail.get(l.email) ?? { name: l.name, wards: [], ungranted: new Set<number>() };
      acc.wards.push(w);
      if (ungranted) acc.ungranted.add(w.wardId);
      byEmail.set(l.email, acc);
    }
  }

  const sent: { to: string; wards: string[] }[] = [];
  for (const [email, { name, wards, ungranted }] of byEmail) {
    const list = wards
      .map(
        (w) =>
          `  • ${w.wardName} (${w.siteName}), ${w.date}${ungranted.has(w.wardId) ? ' — no ward lead is granted this ward: ask an administrator to grant it' : ''}`,
      )
      .join('\n');
    const subject = wards.length === 1 ? `Usage report missing: ${wards[0].wardName}, ${wards[0].date}` : `Usage reports missing for ${wards.length} wards`;
    const text = `Hello ${name},\n\nNo usage report has been filed yet today for:\n${list}\n\nIt takes under a minute: open Plenum and choose Report. The report is prefilled from the last one; check the patients on each device and the cylinders used and returned.\n\nThis reminder goes out at ${e.REPORT_REMINDER_LOCAL_TIME} site time to the ward leads granted the ward (to the site's facilities managers when no ward lead is granted it).\n\nPlenum`;
    try {
      await mailer().sendMail({ from: e.MAIL_FROM, to: email, subject, text });
      sent.push({ to: email, wards: wards.map((w) => w.wardName) });
    } catch (err) {
      // Release the claims so the next run tries again.
      for (const w of wards)
        await db()
          .query('DELETE FROM usage_reminder WHERE ward_id = ? AND local_date = ?', [w.wardId, w.date])
          .catch(() => undefined);
      logger.error(`usage reminder to ${email} not sent: ${(err as Error).message}`);
    }
  }
  if (sent.length) logger.info(`usage reminders sent to ${sent.length} ward lead(s)`);
  return sent;
}

/** Runs sendDueReminders every REPORT_REMINDER_POLL_MS; returns a stop function (main.ts calls it on SIGTERM). */
export function startReminderJob(): () => Promise<void> {
  let running: Promise<unknown> | null = null;
  const tick = () => {
    if (running) return;
    running = sendDueReminders()
      .catch((err) => logger.error(`usage reminders: ${(err as Error).message}`))
      .finally(() => {
        running = null;
      });
  };
  const timer = setInterval(tick, env().REPORT_REMINDER_POLL_MS);
  timer.unref();
  tick();
  return async () => {
    clearInterval(timer);
    await running;
  };
}
