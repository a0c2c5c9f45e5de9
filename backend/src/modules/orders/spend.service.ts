import { In } from 'typeorm';
import { DateTime } from 'luxon';
import type { SpendQuery } from '@common/schemas/orders.schema';
import type { SpendReport, SpendRow } from '@common/schemas/orders.schema';
import { toCsv } from '@common/api/csv';
import { db } from '../../db/db';
import { Supplier } from '../../db/entities/catalogue.entity';
import { Site } from '../../db/entities/site.entity';
import { SupplySource } from '../../db/entities/supply.entity';
import type { Actor } from '../../http/context';
import { badRequest } from '../../errors/app-error';

export type { SpendRow };

/** Cylinders a reading says are on site (full, in use and empty ones all carry rental). */
export function cylindersOnSite(kind: string, detail: Record<string, unknown> | null, cylindersPerBank: number | null): number | null {
  if (!detail) return null;
  if (kind === 'store_count') return Number(detail.full ?? 0) + ((detail.inUseGaugeBar as unknown[] | undefined)?.length ?? 0) + Number(detail.empty ?? 0);
  if (kind === 'bank_gauges') return 2 * (cylindersPerBank ?? 1) + Number(detail.spareFull ?? 0);
  return null;
}

/**
 * Cylinder-days per month from a source's counts: each day holds the cylinders of the latest count at or
 * before the end of that day (UTC days), from the first count on; days after `untilMs` are not counted.
 */
export function cylinderDaysByMonth(counts: { atMs: number; cylinders: number }[], fromMs: number, untilMs: number): Map<string, number> {
  const out = new Map<string, number>();
  if (!counts.length) return out;
  const sorted = [...counts].sort((a, b) => a.atMs - b.atMs);
  let i = -1;
  const DAY = 86_400_000;
  for (let dayStart = Math.floor(fromMs / DAY) * DAY; dayStart < untilMs; dayStart += DAY) {
    const dayEnd = dayStart + DAY;
    while (i + 1 < sorted.length && sorted[i + 1].atMs < dayEnd) i++;
    if (i < 0) continue;
    const month = new Date(dayStart).toISOString().slice(0, 7);
    out.set(month, (out.get(month) ?? 0) + sorted[i].cylinders);
  }
  return out;
}

function monthRange(q: SpendQuery): { from: string; to: string; fromMs: number; toMs: number } {
  const now = DateTime.utc();
  const to = q.to ?? now.toFormat('yyyy-MM');
  const from = q.from ?? DateTime.fromFormat(to, 'yyyy-MM', { zone: 'utc' }).minus({ months: 11 }).toFormat('yyyy-MM');
  const fromDt = DateTime.fromFormat(from, 'yyyy-MM', { zone: 'utc' });
  const toDt = DateTime.fromFormat(to, 'yyyy-MM', { zone: 'utc' }).plus({ months: 1 });
  if (!fromDt.isValid || !toDt.isValid) throw badRequest('Use months as yyyy-MM', [{ path: 'from', message: 'yyyy-MM' }]);
  if (toDt <= fromDt) throw badRequest('The range ends before it starts', [{ path: 'to', message: 'after "from"' }]);
  if (toDt.diff(fromDt, 'months').months > 60) throw badRequest('Ask for at most five years at a time', [{ path: 'from', message: 'at most 60 months' }]);
  return { from, to, fromMs: fromDt.toMillis(), toMs: toDt.toMillis() };
}

/**
 * Spend by month, site, gas and supplier: orders placed (value ordered and value delivered) and cylinder
 * rental (cylinders on site × days × the supplier's daily rate). Integer minor units of each row's currency.
 */
export async function spendReport(actor: Actor, q: SpendQuery): Promise<SpendReport> {
  const range = monthRange(q);
  const siteIds = q.siteId ? actor.user.siteIds.filter((x) => x === q.siteId) : actor.user.siteIds;
  const empty = { from: range.from, to: range.to, months: [] as string[], rows: [] as SpendRow[], currencies: [] as string[] };
  if (!siteIds.length) return empty;
  const ds = db();
  const sites = await ds.getRepository(Site).find({ where: { id: In(siteIds), organisationId: actor.user.organisationId } });
  if (!sites.length) return empty;
  const ids = sites.map((s) => s.id);
  const siteName = new Map(sites.map((s) => [s.id, s.name]));
  const siteCurrency = new Map(sites.map((s) => [s.id, s.currency]));
  const suppliers = new Map((await ds.getRepository(Supplier).find({ where: { organisationId: actor.user.organisationId } })).map((s) => [s.id, s]));
  const rows = new Map<string, SpendRow>();
  const rowFor = (month: string, siteId: number, gasCode: string, supplierId: number, currency: string) => {
    const k = `${month}|${siteId}|${gasCode}|${supplierId}|${currency}`;
    let r = rows.get(k);
    if (!r) {
      r = {
        month,
        siteId,
        siteName: siteName.get(siteId) ?? '',
        gasCode,
        supplierId,
        supplierName: suppliers.get(supplierId)?.name ?? '',
        currency,
        orderedMinor: 0,
        deliveredMinor: 0,
        rentalMinor: 0,
        cylinderDays: 0,
      };
      rows.set(k, r);
    }
    return r;
  };

  const orders: { month: string; site_id: number; gas_code: string; supplier_id: number; currency: string; ordered: string; delivered: string }[] =
    await ds.query(
      `SELECT DATE_FORMAT(p.created_at, '%Y-%m') AS month, p.site_id, r.gas_code, p.supplier_id, p.currency,
            SUM(p.total_minor) AS ordered,
            SUM(CASE WHEN p.delivered_quantity IS NULL THEN 0 ELSE ROUND(p.delivered_quantity * p.unit_price_minor) END) AS delivered
       FROM purchase_order p JOIN reorder_request r ON r.id = p.request_id
      WHERE p.organisation_id = ? AND p.site_id IN (?) AND p.created_at >= ? AND p.created_at < ?
      GROUP BY month, p.site_id, r.gas_code, p.supplier_id, p.currency`,
      [actor.user.organisationId, ids, new Date(range.fromMs), new Date(range.toMs)],
    );
  for (const o of orders) {
    const r = rowFor(o.month, Number(o.site_id), o.gas_code, Number(o.supplier_id), o.currency);
    r.orderedMinor += Number(o.ordered);
    r.deliveredMinor += Number(o.delivered);
  }

  // Rental: cylinder sources with a supplier that charges it.
  const sources = (await ds.getRepository(SupplySource).find({ where: { siteId: In(ids) } })).filter(
    (s) => s.type !== 'bulk_liquid' && s.supplierId && (suppliers.get(s.supplierId)?.rentalMinorPerCylinderDay ?? 0) > 0,
  );
  if (sources.length) {
    const untilMs = Math.min(range.toMs, Date.now());
    const readings: { source_id: number; taken_at: Date; kind: string; detail_json: string | null }[] = await ds.query(
      `SELECT source_id, taken_at, kind, detail_json FROM source_reading
        WHERE source_id IN (?) AND kind IN ('store_count','bank_gauges') AND taken_at < ?
          AND (taken_at >= ? OR id IN (SELECT MAX(id) FROM source_reading r2 WHERE r2.source_id IN (?) AND r2.taken_at < ? AND r2.kind IN ('store_count','bank_gauges') GROUP BY r2.source_id))
        ORDER BY taken_at`,
      [sources.map((s) => s.id), new Date(untilMs), new Date(range.fromMs), sources.map((s) => s.id), new Date(range.fromMs)],
    );
    for (const s of sources) {
      const sup = suppliers.get(s.supplierId!)!;
      const counts = readings
        .filter((r) => Number(r.source_id) === s.id)
        .map((r) => ({
          atMs: new Date(r.taken_at).getTime(),
          cylinders: cylindersOnSite(r.kind, r.detail_json ? JSON.parse(r.detail_json) : null, s.cylindersPerBank),
        }))
        .filter((c): c is { atMs: number; cylinders: number } => c.cylinders !== null);
      for (const [month, days] of cylinderDaysByMonth(counts, range.fromMs, untilMs)) {
        const r = rowFor(month, s.siteId, s.gasCode, sup.id, siteCurrency.get(s.siteId) ?? sup.currency);
        r.cylinderDays += days;
        r.rentalMinor += days * sup.rentalMinorPerCylinderDay;
      }
    }
  }
  const months: string[] = [];
  for (let d = DateTime.fromMillis(range.fromMs, { zone: 'utc' }); d.toMillis() < range.toMs; d = d.plus({ months: 1 })) months.push(d.toFormat('yyyy-MM'));
  const list = [...rows.values()].sort(
    (a, b) =>
      a.month.localeCompare(b.month) ||
      a.siteName.localeCompare(b.siteName) ||
      a.gasCode.localeCompare(b.gasCode) ||
      a.supplierName.localeCompare(b.supplierName),
  );
  return { from: range.from, to: range.to, months, rows: list, currencies: [...new Set(list.map((r) => r.currency))] } satisfies SpendReport;
}

export async function spendCsv(actor: Actor, q: SpendQuery): Promise<string> {
  const r = await spendReport(actor, q);
  const minor = (n: number) => Number((n / 100).toFixed(2));
  return toCsv(
    ['month', 'site', 'gas', 'supplier', 'currency', 'ordered', 'delivered', 'rental', 'cylinder_days', 'ordered_minor', 'delivered_minor', 'rental_minor'],
    r.rows.map((x) => [
      x.month,
      x.siteName,
      x.gasCode,
      x.supplierName,
      x.currency,
      minor(x.orderedMinor),
      minor(x.deliveredMinor),
      minor(x.rentalMinor),
      x.cylinderDays,
      x.orderedMinor,
      x.deliveredMinor,
      x.rentalMinor,
    ]),
  );
}
