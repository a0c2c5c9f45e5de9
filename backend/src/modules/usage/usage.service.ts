import { hasKey } from '@common/api/lookup';
import { In, MoreThanOrEqual, type EntityManager } from 'typeorm';
import { DateTime } from 'luxon';
import type { UsageCylinderLine, UsageReportCreate, UsageReportUpdate } from '@common/schemas/usage.schema';
import type { FiledReport, ReportScreenData, UsageEditRule, UsageReportDetail, UsageReportView, UsageStatus } from '@common/schemas/usage.schema';
import { DEVICE_DEFAULTS, OXYGEN_DEVICES, type OxygenDevice } from '@common/forecast/demand-model';
import { cylinderTypeName, nominalContents } from '@common/catalogue/cylinder-type';
import { db } from '../../db/db';
import { env } from '../../config/env';
import { Site } from '../../db/entities/site.entity';
import { CylinderType } from '../../db/entities/catalogue.entity';
import { DeviceFlow, TherapyLineRow, Ward, WardFeed } from '../../db/entities/supply.entity';
import { UsageReport, UsageReportLine } from '../../db/entities/usage.entity';
import { User } from '../../db/entities/user.entity';
import { AuditLog } from '../../db/entities/audit-log.entity';
import type { Actor } from '../../http/context';
import { AppError, badRequest, conflict, notFound } from '../../errors/app-error';
import { recordAudit, whoOf } from '../audit/audit.service';
import { getSiteFor } from '../sites/sites.service';
import { presentWard, wardFor } from '../supply/supply.service';
import { isDuplicateKey } from '../../db/db-errors';
import { assertMayWriteWard, maySeeWard, visibleWards } from '../supply/ward-access';

// ---------- presenters ----------

export type PresentedReport = UsageReportView;

export function presentReport(r: UsageReport, lines: UsageReportLine[], names: Map<number, string> = new Map()): PresentedReport {
  const own = lines.filter((l) => l.reportId === r.id);
  return {
    id: r.id,
    wardId: r.wardId,
    siteId: r.siteId,
    date: r.reportDate,
    devices: own
      .filter((l) => l.lineKind === 'device')
      .sort((a, b) => OXYGEN_DEVICES.indexOf(a.device as OxygenDevice) - OXYGEN_DEVICES.indexOf(b.device as OxygenDevice))
      .map((l) => ({ device: l.device as OxygenDevice, patientsNow: l.patientsNow ?? 0, patientsShift: l.patientsShift ?? 0 })),
    cylinders: own
      .filter((l) => l.lineKind === 'cylinder')
      .map((l) => ({ cylinderTypeId: l.cylinderTypeId!, used: l.cylindersUsed ?? 0, returned: l.cylindersReturned ?? 0 })),
    note: r.note,
    submittedAt: r.submittedAt.toISOString(),
    submittedBy: r.submittedByUserId ? (names.get(r.submittedByUserId) ?? null) : null,
    updatedAt: r.updatedAt.toISOString(),
    updatedBy: r.updatedByUserId ? (names.get(r.updatedByUserId) ?? null) : null,
  };
}

async function userNames(m: EntityManager, ids: (number | null)[]): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((x): x is number => x !== null))];
  if (!wanted.length) return new Map();
  const users = await m.getRepository(User).find({ select: { id: true, name: true }, where: { id: In(wanted) } });
  return new Map(users.map((u) => [u.id, u.name]));
}

// ---------- scoped look-ups ----------

export async function reportFor(actor: Actor, id: number, m: EntityManager = db().manager): Promise<UsageReport> {
  const r = await m.getRepository(UsageReport).findOneBy({ id });
  if (!r || !actor.user.siteIds.includes(r.siteId)) throw notFound('Usage report');
  const site = await m.getRepository(Site).findOneBy({ id: r.siteId, organisationId: actor.user.organisationId });
  if (!site) throw notFound('Usage report');
  // A ward lead's reports are those of their granted wards: any other does not exist for them.
  if (!(await maySeeWard(actor, r.wardId, m))) throw notFound('Usage report');
  return r;
}

/** Today's local date at a site, yyyy-MM-dd. */
export function localToday(timeZone: string, now: Date = new Date()): string {
  return DateTime.fromJSDate(now, { zone: timeZone }).toISODate()!;
}

function isManager(actor: Actor): boolean {
  return actor.user.roles.includes('facilities_manager');
}

/** Whether the actor may still change a filed report, and until when a ward lead may. */
export function editRule(actor: Actor, r: UsageReport, now: Date = new Date()): UsageEditRule {
  const until = new Date(r.submittedAt.getTime() + env().REPORT_EDIT_WINDOW_HOURS * 3_600_000);
  if (isManager(actor)) return { canEdit: true, editableUntil: until.toISOString(), reason: null };
  if (!actor.user.roles.includes('ward_lead'))
    return { canEdit: false, editableUntil: until.toISOString(), reason: 'Only ward leads and facilities managers file reports.' };
  if (now.getTime() <= until.getTime()) return { canEdit: true, editableUntil: until.toISOString(), reason: null };
  return {
    canEdit: false,
    editableUntil: until.toISOString(),
    reason: `Reports can be changed for ${env().REPORT_EDIT_WINDOW_HOURS} h after filing; ask a facilities manager to correct this one.`,
  };
}

// ---------- the ward's report screen ----------

async function cylinderTypesFor(m: EntityManager, actor: Actor, ward: Ward) {
  const [lines, feeds] = await Promise.all([
    m.getRepository(TherapyLineRow).find({ where: { wardId: ward.id } }),
    m.getRepository(WardFeed).find({ where: { wardId: ward.id } }),
  ]);
  const gases = new Set([...lines.map((l) => l.gasCode), ...feeds.map((f) => f.gasCode), 'O2']);
  const types = await m
    .getRepository(CylinderType)
    .find({ where: { organisationId: actor.user.organisationId, active: true }, order: { gasCode: 'ASC', waterCapacityL: 'ASC' } });
  return types
    .filter((t) => gases.has(t.gasCode))
    .map((t) => ({
      id: t.id,
      gasCode: t.gasCode,
      name: `${t.gasCode.replace(/_/g, ' ')} ${cylinderTypeName(t.waterCapacityL, t.fillPressureBar)}`,
      freeGasL:
        nominalContents({
          gas: t.gasCode,
          waterCapacityL: t.waterCapacityL,
          fillPressureBar: t.fillPressureBar,
          maxFillingRatioKgPerL: t.maxFillingRatioKgPerL,
        })?.freeGasL ?? null,
    }));
}

/**
 * What the report screen needs for one ward and local date: the filed report (or a draft prefilled from
 * the ward's latest earlier report), whether it may be changed, the devices and cylinder types to
 * offer, the model's patients per device, and the last days' reports.
 */
export async function openReport(actor: Actor, wardId: number, q: { date?: string; days: number }) {
  const m = db().manager;
  const ward = await wardFor(actor, wardId, m);
  const site = await getSiteFor(actor, ward.siteId);
  const today = localToday(site.timeZone);
  const date = q.date ?? today;
  const [report, previous] = await Promise.all([
    m.getRepository(UsageReport).findOneBy({ wardId, reportDate: date }),
    m
      .getRepository(UsageReport)
      .createQueryBuilder('r')
      .where('r.ward_id = :wardId AND r.report_date < :date', { wardId, date })
      .orderBy('r.report_date', 'DESC')
      .getOne(),
  ]);
  const from = DateTime.fromISO(date)
    .minus({ days: q.days - 1 })
    .toISODate()!;
  const recent = await m
    .getRepository(UsageReport)
    .createQueryBuilder('r')
    .where('r.ward_id = :wardId AND r.report_date BETWEEN :from AND :date', { wardId, from, date: today > date ? today : date })
    .orderBy('r.report_date', 'DESC')
    .getMany();
  const ids = [...new Set([report?.id, previous?.id, ...recent.map((r) => r.id)].filter((x): x is number => !!x))];
  const lines = ids.length ? await m.getRepository(UsageReportLine).find({ where: { reportId: In(ids) } }) : [];
  const names = await userNames(
    m,
    [...recent, report, previous].flatMap((r) => (r ? [r.submittedByUserId, r.updatedByUserId] : [])),
  );
  const therapy = await m.getRepository(TherapyLineRow).find({ where: { wardId, gasCode: 'O2' } });
  const flows = await m.getRepository(DeviceFlow).find({ where: { organisationId: actor.user.organisationId } });
  const modelPatients: Record<string, number> = {};
  for (const t of therapy) if (hasKey(DEVICE_DEFAULTS, t.device)) modelPatients[t.device] = (modelPatients[t.device] ?? 0) + t.patients;

  const prev = previous ? presentReport(previous, lines, names) : null;
  const draft = {
    date,
    devices: prev
      ? prev.devices
      : Object.entries(modelPatients).map(([device, n]) => ({ device: device as OxygenDevice, patientsNow: Math.round(n), patientsShift: Math.round(n) })),
    // Cylinder counts are the day's flow, not a state: offer yesterday's types at zero, with yesterday's numbers as hints.
    cylinders: prev ? prev.cylinders.map((c) => ({ cylinderTypeId: c.cylinderTypeId, used: 0, returned: 0 })) : [],
    note: '',
    prefilledFrom: prev ? prev.date : null,
  };
  const backfillFrom = DateTime.fromISO(today).minus({ days: env().REPORT_BACKFILL_DAYS }).toISODate()!;
  const canCreate = !report && date <= today && (isManager(actor) || (actor.user.roles.includes('ward_lead') && date >= backfillFrom));
  return {
    ward: presentWard(ward),
    site: { id: site.id, name: site.name, timeZone: site.timeZone, referenceCode: site.referenceCode },
    date,
    today,
    report: report ? { ...presentReport(report, lines, names), ...editRule(actor, report) } : null,
    draft: report ? null : draft,
    previous: prev,
    canCreate,
    createRule:
      date > today
        ? 'A report cannot be filed for a future day.'
        : !canCreate && !report && !isManager(actor)
          ? `Ward leads can file reports for today and the ${env().REPORT_BACKFILL_DAYS} days before; ask a facilities manager for older days.`
          : null,
    devices: OXYGEN_DEVICES.map((d) => ({
      device: d,
      label: DEVICE_DEFAULTS[d].label,
      flowLMin: flows.find((f) => f.device === d)?.flowLMin ?? DEVICE_DEFAULTS[d].flowLMin,
      modelPatients: modelPatients[d] ?? 0,
    })),
    cylinderTypes: await cylinderTypesFor(m, actor, ward),
    recent: recent.map((r) => {
      const p = presentReport(r, lines, names);
      return {
        id: r.id,
        date: r.reportDate,
        patientsNow: p.devices.reduce((s, d) => s + d.patientsNow, 0),
        cylindersUsed: p.cylinders.reduce((s, c) => s + c.used, 0),
        submittedBy: p.submittedBy,
        submittedAt: p.submittedAt,
      };
    }),
    editWindowHours: env().REPORT_EDIT_WINDOW_HOURS,
  } satisfies ReportScreenData;
}

async function checkCylinderTypes(m: EntityManager, actor: Actor, cylinders: UsageCylinderLine[]) {
  if (!cylinders.length) return;
  const ids = [...new Set(cylinders.map((c) => c.cylinderTypeId))];
  const found = await m.getRepository(CylinderType).find({ where: { id: In(ids), organisationId: actor.user.organisationId } });
  cylinders.forEach((c, i) => {
    if (!found.some((t) => t.id === c.cylinderTypeId))
      throw badRequest('A cylinder type is not in your catalogue', [
        { path: `cylinders.${i}.cylinderTypeId`, message: 'choose a cylinder type of your catalogue' },
      ]);
  });
}

async function writeLines(m: EntityManager, reportId: number, input: UsageReportUpdate) {
  await m.getRepository(UsageReportLine).delete({ reportId });
  const rows: Partial<UsageReportLine>[] = [
    ...input.devices.map((d) => ({
      reportId,
      lineKind: 'device',
      device: d.device,
      patientsNow: d.patientsNow,
      patientsShift: d.patientsShift,
      cylinderTypeId: null,
      cylindersUsed: null,
      cylindersReturned: null,
    })),
    ...input.cylinders.map((c) => ({
      reportId,
      lineKind: 'cylinder',
      device: null,
      patientsNow: null,
      patientsShift: null,
      cylinderTypeId: c.cylinderTypeId,
      cylindersUsed: c.used,
      cylindersReturned: c.returned,
    })),
  ];
  if (rows.length) await m.getRepository(UsageReportLine).insert(rows);
}

async function loadPresented(m: EntityManager, id: number): Promise<PresentedReport> {
  const r = await m.getRepository(UsageReport).findOneByOrFail({ id });
  const lines = await m.getRepository(UsageReportLine).find({ where: { reportId: id } });
  return presentReport(r, lines, await userNames(m, [r.submittedByUserId, r.updatedByUserId]));
}

/** Files a ward's report for a local date (one per ward and date); recorded in the audit log. */
export async function createReport(actor: Actor, wardId: number, input: UsageReportCreate) {
  const ward = await wardFor(actor, wardId);
  await assertMayWriteWard(actor, ward);
  const site = await getSiteFor(actor, ward.siteId);
  const today = localToday(site.timeZone);
  if (input.date > today) throw badRequest('A report cannot be filed for a future day', [{ path: 'date', message: `today at the site is ${today}` }]);
  const backfillFrom = DateTime.fromISO(today).minus({ days: env().REPORT_BACKFILL_DAYS }).toISODate()!;
  if (!isManager(actor) && input.date < backfillFrom) {
    throw new AppError(
      403,
      'forbidden',
      `Ward leads can file reports for today and the ${env().REPORT_BACKFILL_DAYS} days before; ask a facilities manager for older days.`,
    );
  }
  return db().transaction(async (m) => {
    await checkCylinderTypes(m, actor, input.cylinders);
    const existing = await m.getRepository(UsageReport).findOneBy({ wardId, reportDate: input.date });
    if (existing)
      throw new AppError(409, 'report_exists', `${ward.name} has a report for ${input.date} already: open it to change it`, [
        { path: 'id', message: String(existing.id) },
      ]);
    let saved: UsageReport;
    try {
      saved = await m.getRepository(UsageReport).save(
        m.getRepository(UsageReport).create({
          siteId: ward.siteId,
          wardId,
          reportDate: input.date,
          note: input.note,
          submittedByUserId: actor.user.id,
          submittedAt: new Date(),
          updatedByUserId: actor.user.id,
        }),
      );
    } catch (e) {
      if (isDuplicateKey(e)) throw conflict(`${ward.name} has a report for ${input.date} already`, 'report_exists');
      throw e;
    }
    await writeLines(m, saved.id, input);
    const after = await loadPresented(m, saved.id);
    await recordAudit(m, whoOf(actor), { action: 'create', entity: 'usage_report', entityId: String(saved.id), after: { ...after, wardName: ward.name } });
    return { ...after, ...editRule(actor, saved) } satisfies FiledReport;
  });
}

/** Changes a filed report: its ward lead inside the edit window, a facilities manager at any time. */
export async function updateReport(actor: Actor, id: number, input: UsageReportUpdate) {
  return db().transaction(async (m) => {
    const r = await reportFor(actor, id, m);
    await assertMayWriteWard(actor, await m.getRepository(Ward).findOneByOrFail({ id: r.wardId }), m);
    const rule = editRule(actor, r);
    if (!rule.canEdit) throw new AppError(403, 'edit_window_closed', rule.reason ?? 'This report can no longer be changed');
    await checkCylinderTypes(m, actor, input.cylinders);
    const before = await loadPresented(m, id);
    await m.getRepository(UsageReport).update({ id }, { note: input.note, updatedByUserId: actor.user.id });
    await writeLines(m, id, input);
    const after = await loadPresented(m, id);
    await recordAudit(m, whoOf(actor), { action: 'update', entity: 'usage_report', entityId: String(id), before, after });
    return { ...after, ...editRule(actor, await m.getRepository(UsageReport).findOneByOrFail({ id })) } satisfies FiledReport;
  });
}

/** One report with its change history (from the audit log). */
export async function getReport(actor: Actor, id: number) {
  const m = db().manager;
  const r = await reportFor(actor, id, m);
  const ward = await m.getRepository(Ward).findOneByOrFail({ id: r.wardId });
  const history = await m
    .getRepository(AuditLog)
    .find({ where: { organisationId: actor.user.organisationId, entity: 'usage_report', entityId: String(id) }, order: { id: 'ASC' } });
  return {
    ...(await loadPresented(m, id)),
    ...editRule(actor, r),
    ward: presentWard(ward),
    history: history.map((h) => ({ at: h.at.toISOString(), action: h.action, userEmail: h.userEmail })),
  } satisfies UsageReportDetail;
}

/** Which wards of a site have filed their report for a local date (default today). */
export async function usageStatus(actor: Actor, siteId: number, date?: string) {
  const site = await getSiteFor(actor, siteId);
  const day = date ?? localToday(site.timeZone);
  const wards = await visibleWards(
    actor,
    await db()
      .getRepository(Ward)
      .find({ where: { siteId, active: true }, order: { name: 'ASC' } }),
  );
  const reports = wards.length
    ? await db()
        .getRepository(UsageReport)
        .find({ where: { siteId, reportDate: day } })
    : [];
  const names = await userNames(
    db().manager,
    reports.map((r) => r.submittedByUserId),
  );
  return {
    site: { id: site.id, name: site.name, timeZone: site.timeZone },
    date: day,
    reminderLocalTime: env().REPORT_REMINDER_LOCAL_TIME,
    wards: wards.map((w) => {
      const r = reports.find((x) => x.wardId === w.id);
      return {
        wardId: w.id,
        name: w.name,
        department: w.department,
        reportId: r?.id ?? null,
        submittedAt: r?.submittedAt.toISOString() ?? null,
        submittedBy: r?.submittedByUserId ? (names.get(r.submittedByUserId) ?? null) : null,
      };
    }),
  } satisfies UsageStatus;
}

/** Reports of a site since a local date, with their lines (reconciliation and export). */
export async function siteReportsSince(siteId: number, fromDate: string) {
  const reports = await db()
    .getRepository(UsageReport)
    .find({ where: { siteId, reportDate: MoreThanOrEqual(fromDate) }, order: { reportDate: 'ASC' } });
  const lines = reports.length
    ? await db()
        .getRepository(UsageReportLine)
        .find({ where: { reportId: In(reports.map((r) => r.id)) } })
    : [];
  return reports.map((r) => presentReport(r, lines));
}
