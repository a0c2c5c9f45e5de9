import { hasKey, lookup } from '@common/api/lookup';
import { DateTime } from 'luxon';
import { In, MoreThanOrEqual } from 'typeorm';
import {
  consumptionBetweenReadings,
  coefficientOfVariation,
  dailyRates,
  demandCvFromDays,
  detectRefills,
  meterCurve,
  orderedSeries,
  refillThreshold,
  suggestCorrectionFactor,
  weeklyTotals,
  type ContentsPoint,
  type DayRate,
} from '@common/forecast/reconcile';
import type { DemandLine } from '@common/forecast/demand-lines';
import { DEVICE_DEFAULTS, type OxygenDevice } from '@common/forecast/demand-model';
import { nominalContents } from '@common/catalogue/cylinder-type';
import { freeGasLitresPerKg, type ReferenceCode } from '@common/gas/reference-conditions';
import type { GasCode } from '@common/gas/gases';
import { db } from '../../db/db';
import { AuditLog } from '../../db/entities/audit-log.entity';
import { FlowMeterReading, UsageHistory } from '../../db/entities/usage.entity';
import type { SupplySource, Ward } from '../../db/entities/supply.entity';
import type { Actor } from '../../http/context';
import { notFound } from '../../errors/app-error';
import { loadSiteModels, type SiteModel } from '../forecast/site-model';
import { modelledLines, wardDemandLines, wardsFedBy } from '../forecast/forecast.service';
import { sourceFor } from '../supply/supply.service';
import { getSiteFor } from '../sites/sites.service';
import { siteReportsSince, type PresentedReport } from './usage.service';
import type { SiteReconciliation, SourceReconciliation, SourceReconciliationDetail, WardReconciliation } from '@common/schemas/usage.schema';

/**
 * Measured use against the demand model, per source and per ward.
 * Sources: their contents readings (tank level, store counts, bank gauges) → consumption between
 * deliveries → daily rates. Wards: flow meters and historic usage where they exist; otherwise the
 * patients the ward lead reports on each device × the device flow (the model's own arithmetic with
 * the reported counts); cylinders changed × nominal free gas per cylinder.
 */

const MAX_POINTS = 20_000;
const MS_DAY = 86_400_000;

export const RECONCILIATION_CAUTION =
  'Planning estimate only: measured use depends on the accuracy of the readings and reports. A correction factor changes the forecast of every ward this source feeds; check it against the site’s own records, and defer to the authorised person and the supplier.';

/** A source's contents readings since an instant, thinned to at most MAX_POINTS (the last reading of each time bucket). */
async function contentsSeries(sourceId: number, since: Date): Promise<ContentsPoint[]> {
  const [{ n, first, last }] = (await db().query(
    'SELECT COUNT(*) AS n, MIN(taken_at) AS first, MAX(taken_at) AS last FROM source_reading WHERE source_id = ? AND taken_at >= ?',
    [sourceId, since],
  )) as { n: string; first: Date | null; last: Date | null }[];
  const count = Number(n);
  if (count === 0) return [];
  let rows: { t: Date; c: number | string }[];
  if (count <= MAX_POINTS || !first || !last) {
    rows = await db().query('SELECT taken_at AS t, contents AS c FROM source_reading WHERE source_id = ? AND taken_at >= ? ORDER BY taken_at, id', [
      sourceId,
      since,
    ]);
  } else {
    // Signed differences telescope, so keeping the last reading of each bucket keeps the use between them.
    const bucketS = Math.max(60, Math.ceil((new Date(last).getTime() - new Date(first).getTime()) / 1000 / MAX_POINTS));
    rows = await db().query(
      `SELECT MAX(taken_at) AS t, CAST(SUBSTRING_INDEX(GROUP_CONCAT(contents ORDER BY taken_at DESC, id DESC SEPARATOR ','), ',', 1) AS DOUBLE) AS c
         FROM source_reading WHERE source_id = ? AND taken_at >= ?
        GROUP BY FLOOR(TIMESTAMPDIFF(SECOND, '2000-01-01', taken_at) / ?) ORDER BY t`,
      [sourceId, since, bucketS],
    );
  }
  return orderedSeries(rows.map((r) => ({ atMs: new Date(r.t).getTime(), contents: Number(r.c) })));
}

/** Modelled use of demand lines on one local date, L (each line's flow × its hours that weekday). */
function modelledOnDate(lines: readonly DemandLine[], date: string): number {
  const weekday = DateTime.fromISO(date).weekday;
  let sum = 0;
  for (const l of lines) {
    if (l.weekdays?.length && !l.weekdays.includes(weekday)) continue;
    const hours = l.hours?.length ? new Set(l.hours).size : 24;
    sum += l.flow_L_min * 60 * hours;
  }
  return sum;
}

function meanPerDay(lines: readonly DemandLine[]): number {
  let perWeek = 0;
  for (let wd = 1; wd <= 7; wd++) perWeek += modelledOnDate(lines, DateTime.fromObject({ year: 2027, month: 1, day: 3 + wd }).toISODate()!);
  return perWeek / 7;
}

function fullCylinderL(model: SiteModel, s: SupplySource): number | null {
  const cyl = s.cylinderTypeId ? model.cylinderTypes.get(s.cylinderTypeId) : undefined;
  if (!cyl) return null;
  return (
    nominalContents({
      gas: cyl.gasCode,
      waterCapacityL: cyl.waterCapacityL,
      fillPressureBar: cyl.fillPressureBar,
      maxFillingRatioKgPerL: cyl.maxFillingRatioKgPerL,
    })?.freeGasL ?? null
  );
}

/** Measured use of one source from its readings, against the model of the wards it feeds. */
async function reconcileSource(model: SiteModel, s: SupplySource, since: Date): Promise<SourceReconciliation> {
  const reference = model.site.referenceCode as ReferenceCode;
  const zone = model.site.timeZone;
  const lines = modelledLines(model, s);
  const modelled = meanPerDay(lines);
  const toL = s.type === 'bulk_liquid' ? freeGasLitresPerKg(s.gasCode as GasCode, reference) : 1;
  const points = await contentsSeries(s.id, since);
  let days: DayRate[] = [];
  let measured: number | null = null;
  let refills: { at: string; delivered: number; unit: string }[] = [];
  let spanHours = 0;
  let note: string | null = null;
  if (points.length >= 2) {
    const found = detectRefills(points, {
      minRise: refillThreshold({ capacity: s.capacityKg, fullCylinder: s.type === 'bulk_liquid' ? null : fullCylinderL(model, s) }),
    });
    const c = consumptionBetweenReadings(points, found);
    spanHours = c.spanHours;
    days = dailyRates(c.curve, zone);
    refills = found.map((r) => ({ at: new Date(r.toMs).toISOString(), delivered: r.delivered, unit: s.type === 'bulk_liquid' ? 'kg' : 'L' }));
    if (c.spanHours >= 48 && c.perDay !== null) measured = c.perDay * toL;
    else note = 'Fewer than two days of readings in this period.';
  } else note = points.length ? 'One reading in this period: measured use needs two or more.' : 'No readings in this period.';
  const cv = demandCvFromDays(days);
  const daily = days.map((d) => ({ date: d.date, measuredL: d.used * toL, modelledL: modelledOnDate(lines, d.date) * (d.hours / 24), hours: d.hours }));
  return {
    id: s.id,
    name: s.name,
    type: s.type,
    gasCode: s.gasCode,
    modelledLPerDay: modelled,
    correctedLPerDay: s.forecastBasis === 'scaled' ? modelled * s.modelCorrectionFactor : modelled,
    measuredLPerDay: measured,
    ratio: measured !== null && modelled > 0 ? measured / modelled : null,
    suggestedFactor: suggestCorrectionFactor(measured, modelled),
    acceptedFactor: s.modelCorrectionFactor,
    forecastBasis: s.forecastBasis as SourceReconciliation['forecastBasis'],
    dailyCv: coefficientOfVariation(days.map((d) => d.perDay)),
    demandCv: cv,
    readings: points.length,
    spanHours,
    refills,
    daily,
    weekly: weeklyTotals(daily.map((d) => ({ date: d.date, amount: d.measuredL }))),
    wardsFed: wardsFedBy(model, s).map((w) => ({ id: w.id, name: w.name })),
    note,
  } satisfies SourceReconciliation;
}

interface WardData {
  reports: PresentedReport[];
  meters: FlowMeterReading[];
  history: UsageHistory[];
}

/** Measured use of one ward (oxygen): meters, historic usage, reported patients and cylinders, against its model. */
function reconcileWard(model: SiteModel, w: Ward, data: WardData, fromDate: string, toDate: string): WardReconciliation {
  const zone = model.site.timeZone;
  const lines = wardDemandLines(model, w.id, 'O2');
  const modelled = meanPerDay(lines);
  const reports = data.reports.filter((r) => r.wardId === w.id);
  const flowOf = (device: string) => model.deviceFlows.get(device) ?? lookup(DEVICE_DEFAULTS, device)?.flowLMin ?? 0;
  const leak = 1 + w.leakagePercent / 100;
  const rowsOf = (device: string) => model.therapy.filter((t) => t.wardId === w.id && t.gasCode === 'O2' && t.device === device);
  // Reported demand of a day: each device's modelled lines (their own flows, hours and weekdays) scaled
  // by reported ÷ modelled patients; a device the model lacks runs all day at its flow. Plus leakage.
  const reportedOn = (r: PresentedReport): number =>
    r.devices.reduce((sum, d) => {
      const rows = rowsOf(d.device);
      const modelledPatients = rows.reduce((a, t) => a + t.patients, 0);
      if (modelledPatients > 0) {
        const lines = rows.map((t) => ({
          flow_L_min: t.patients * (t.flowLMin ?? flowOf(t.device)),
          hours: t.hoursJson ? (JSON.parse(t.hoursJson) as number[]) : undefined,
          weekdays: t.weekdaysJson ? (JSON.parse(t.weekdaysJson) as number[]) : undefined,
        }));
        return sum + modelledOnDate(lines, r.date) * (d.patientsNow / modelledPatients) * leak;
      }
      return sum + d.patientsNow * flowOf(d.device) * 1440 * leak;
    }, 0);
  const reportedDaily = reports.map((r) => ({ date: r.date, amount: reportedOn(r) }));
  // Measured days are compared with the model on the same dates (a weekday-only line makes weekends
  // quiet in both), then stated per average day of the model's week.
  const perModelDay = (days: { date: string; amount: number }[]): number | null => {
    if (!days.length) return null;
    const measuredSum = days.reduce((a, d) => a + d.amount, 0);
    const modelledSum = days.reduce((a, d) => a + modelledOnDate(lines, d.date), 0);
    return modelledSum > 0 ? (modelled * measuredSum) / modelledSum : measuredSum / days.length;
  };
  const reportedPerDay = perModelDay(reportedDaily);
  const modelPatients = new Map<string, number>();
  for (const t of model.therapy)
    if (t.wardId === w.id && t.gasCode === 'O2' && hasKey(DEVICE_DEFAULTS, t.device))
      modelPatients.set(t.device, (modelPatients.get(t.device) ?? 0) + t.patients);
  const devices = Object.keys(DEVICE_DEFAULTS)
    .map((device) => {
      const counts = reports.map((r) => r.devices.find((d) => d.device === device)?.patientsNow ?? 0);
      const peaks = reports.map((r) => r.devices.find((d) => d.device === device)?.patientsShift ?? 0);
      return {
        device,
        label: DEVICE_DEFAULTS[device as OxygenDevice].label,
        modelPatients: modelPatients.get(device) ?? 0,
        reportedMeanNow: counts.length ? counts.reduce((a, b) => a + b, 0) / counts.length : null,
        reportedMaxShift: peaks.length ? Math.max(...peaks) : null,
      };
    })
    .filter((d) => d.modelPatients > 0 || (d.reportedMeanNow ?? 0) > 0);

  // Cylinders changed: nominal free gas per cylinder (each taken as used to empty: an upper estimate).
  const cylinderByGas = new Map<string, { cylinders: number; litres: number }>();
  for (const r of reports) {
    for (const c of r.cylinders) {
      const t = model.cylinderTypes.get(c.cylinderTypeId);
      if (!t) continue;
      const perCyl =
        nominalContents({
          gas: t.gasCode,
          waterCapacityL: t.waterCapacityL,
          fillPressureBar: t.fillPressureBar,
          maxFillingRatioKgPerL: t.maxFillingRatioKgPerL,
        })?.freeGasL ?? 0;
      const acc = cylinderByGas.get(t.gasCode) ?? { cylinders: 0, litres: 0 };
      acc.cylinders += c.used;
      acc.litres += c.used * perCyl;
      cylinderByGas.set(t.gasCode, acc);
    }
  }
  const cylinderWeekly = weeklyTotals(
    reports.map((r) => ({
      date: r.date,
      amount: r.cylinders.reduce((sum, c) => {
        const t = model.cylinderTypes.get(c.cylinderTypeId);
        return t && t.gasCode === 'O2'
          ? sum +
              c.used *
                (nominalContents({
                  gas: t.gasCode,
                  waterCapacityL: t.waterCapacityL,
                  fillPressureBar: t.fillPressureBar,
                  maxFillingRatioKgPerL: t.maxFillingRatioKgPerL,
                })?.freeGasL ?? 0)
          : sum;
      }, 0),
    })),
  );

  // Flow meters on the ward's branch.
  const meterPoints = orderedSeries(data.meters.filter((m) => m.wardId === w.id).map((m) => ({ atMs: m.takenAt.getTime(), contents: m.totalL })));
  const meterDays = meterPoints.length >= 2 ? dailyRates(meterCurve(meterPoints), zone) : [];
  const meterPerDay = perModelDay(meterDays.map((d) => ({ date: d.date, amount: d.perDay })));

  const history = data.history.filter((h) => h.wardId === w.id && h.gasCode === 'O2' && h.usageDate >= fromDate && h.usageDate <= toDate);
  const historyPerDay = perModelDay(history.map((h) => ({ date: h.usageDate, amount: h.volumeL })));

  // The best measurement the ward has: a meter, then historic usage, then the reported patients.
  const [measured, basis] =
    meterPerDay !== null
      ? [meterPerDay, 'flow meter']
      : historyPerDay !== null
        ? [historyPerDay, 'historic usage']
        : reportedPerDay !== null
          ? [reportedPerDay, 'reported patients']
          : [null, null];
  const daily = new Map<string, { date: string; modelledL: number; reportedL: number | null; meterL: number | null; historyL: number | null }>();
  const row = (date: string) => {
    let d = daily.get(date);
    if (!d) {
      d = { date, modelledL: modelledOnDate(lines, date), reportedL: null, meterL: null, historyL: null };
      daily.set(date, d);
    }
    return d;
  };
  for (const r of reportedDaily) row(r.date).reportedL = r.amount;
  for (const d of meterDays) row(d.date).meterL = d.used;
  for (const h of history) row(h.usageDate).historyL = h.volumeL;
  const primary = model.feeds.find((f) => f.wardId === w.id && f.gasCode === 'O2' && f.role === 'primary');
  return {
    id: w.id,
    name: w.name,
    department: w.department,
    modelledLPerDay: modelled,
    measuredLPerDay: measured,
    basis,
    ratio: measured !== null && modelled > 0 ? measured / modelled : null,
    suggestedFactor: suggestCorrectionFactor(measured, modelled),
    reports: reports.length,
    reportedLPerDay: reportedPerDay,
    meterLPerDay: meterPerDay,
    historyLPerDay: historyPerDay,
    devices,
    cylinders: [...cylinderByGas.entries()].map(([gasCode, v]) => ({ gasCode, cylinders: v.cylinders, litres: v.litres })),
    cylinderWeekly,
    weekly: weeklyTotals(
      [...daily.values()]
        .filter((d) => (d.meterL ?? d.historyL ?? d.reportedL) !== null)
        .map((d) => ({ date: d.date, amount: (d.meterL ?? d.historyL ?? d.reportedL)! })),
    ),
    daily: [...daily.values()].sort((a, b) => (a.date < b.date ? -1 : 1)),
    primarySource: primary ? { id: primary.sourceId, name: model.sources.find((s) => s.id === primary.sourceId)?.name ?? '' } : null,
  };
}

async function wardData(siteId: number, wardIds: number[], since: Date, fromDate: string): Promise<WardData> {
  const [reports, meters, history] = await Promise.all([
    siteReportsSince(siteId, fromDate),
    wardIds.length
      ? db()
          .getRepository(FlowMeterReading)
          .find({ where: { wardId: In(wardIds), takenAt: MoreThanOrEqual(since) }, order: { takenAt: 'ASC' } })
      : Promise.resolve([]),
    wardIds.length
      ? db()
          .getRepository(UsageHistory)
          .find({ where: { wardId: In(wardIds), usageDate: MoreThanOrEqual(fromDate) } })
      : Promise.resolve([]),
  ]);
  return { reports, meters, history };
}

/** Reconciliation of a site over the last `days` days: every source with readings and every ward. */
export async function siteReconciliation(actor: Actor, siteId: number, days: number): Promise<SiteReconciliation> {
  await getSiteFor(actor, siteId);
  const [model] = await loadSiteModels([siteId], actor.user.organisationId);
  if (!model) throw notFound('Site');
  const now = new Date();
  const since = new Date(now.getTime() - days * MS_DAY);
  const zone = model.site.timeZone;
  const fromDate = DateTime.fromJSDate(since, { zone }).toISODate()!;
  const toDate = DateTime.fromJSDate(now, { zone }).toISODate()!;
  const sources = [];
  for (const s of model.sources.filter((x) => x.type !== 'emergency_reserve')) sources.push(await reconcileSource(model, s, since));
  const wards = model.wards.filter((w) => w.active);
  const data = await wardData(
    siteId,
    wards.map((w) => w.id),
    since,
    fromDate,
  );
  return {
    site: { id: model.site.id, name: model.site.name, timeZone: zone, referenceCode: model.site.referenceCode },
    from: since.toISOString(),
    to: now.toISOString(),
    days,
    caution: RECONCILIATION_CAUTION,
    method: [
      'Tanks and stores: consumption between readings (falls in contents); a delivery is a rise of at least 2 % of a tank or half a cylinder, and the use during it is filled in at the rate around it.',
      'Daily rates are whole local days in the site’s time zone; their coefficient of variation feeds the forecast’s Monte Carlo band once seven days exist.',
      'Wards: a flow meter or historic usage where present; otherwise the model’s lines for each device scaled by the patients reported on it (a device the model lacks runs all day at its flow), plus the leakage allowance. Cylinders changed count as used to empty (an upper estimate).',
      'Suggested factor = measured ÷ modelled, offered only between 0.2 and 5.',
    ],
    sources,
    wards: wards.map((w) => reconcileWard(model, w, data, fromDate, toDate)),
  };
}

/** One source's reconciliation with its history of accepted corrections. */
export async function sourceReconciliation(actor: Actor, sourceId: number, days: number): Promise<SourceReconciliationDetail> {
  const source = await sourceFor(actor, sourceId);
  const [model] = await loadSiteModels([source.siteId], actor.user.organisationId);
  if (!model) throw notFound('Supply source');
  const s = model.sources.find((x) => x.id === sourceId) ?? source;
  const since = new Date(Date.now() - days * MS_DAY);
  const result = await reconcileSource(model, s, since);
  const audit = await db()
    .getRepository(AuditLog)
    .find({ where: { organisationId: actor.user.organisationId, entity: 'supply_source', entityId: String(sourceId) }, order: { id: 'DESC' }, take: 50 });
  const corrections = audit
    .map((a) => ({
      at: a.at.toISOString(),
      by: a.userEmail,
      before: a.beforeJson ? JSON.parse(a.beforeJson) : null,
      after: a.afterJson ? JSON.parse(a.afterJson) : null,
    }))
    .filter((a) => a.after && 'modelCorrectionFactor' in a.after && Object.keys(a.after).length <= 2)
    .map((a) => ({
      at: a.at,
      by: a.by,
      factor: a.after.modelCorrectionFactor as number,
      basis: a.after.forecastBasis as string,
      previousFactor: (a.before?.modelCorrectionFactor as number | undefined) ?? null,
    }));
  return {
    site: { id: model.site.id, name: model.site.name, timeZone: model.site.timeZone },
    days,
    caution: RECONCILIATION_CAUTION,
    source: result,
    corrections,
  };
}
