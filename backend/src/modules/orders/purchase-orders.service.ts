import { In, type DataSource } from 'typeorm';
import type { Page } from '@common/schemas/common.schema';
import type { OrderDetail, OrderRow, OrderUnit } from '@common/schemas/orders.schema';
import { db } from '../../db/db';
import { Supplier } from '../../db/entities/catalogue.entity';
import { Organisation } from '../../db/entities/organisation.entity';
import { Site } from '../../db/entities/site.entity';
import { SupplySource } from '../../db/entities/supply.entity';
import { DeliveryRecord, MailOutbox, PurchaseOrder, ReorderRequest } from '../../db/entities/orders.entity';
import type { Actor } from '../../http/context';
import { notFound } from '../../errors/app-error';
import { renderPurchaseOrderPdf } from './po-pdf';

export const ORDER_STATUS_TEXT: Record<string, string> = {
  approved: 'Approved — e-mail queued',
  ordered: 'Ordered (e-mailed)',
  part_delivered: 'Delivered in part (closed)',
  delivered: 'Delivered',
};

/**
 * The order's PDF: rendered once and kept with the order, so the supplier, the requester's copy and the
 * screen show the same file. Rendering happens outside any approval transaction.
 */
export async function pdfForOrder(ds: DataSource, id: number): Promise<{ pdf: Buffer; poNumber: string }> {
  const rows: { pdf: Buffer | null; po_number: string }[] = await ds.query('SELECT pdf, po_number FROM purchase_order WHERE id = ?', [id]);
  if (!rows.length) throw notFound('Purchase order');
  if (rows[0].pdf) return { pdf: Buffer.from(rows[0].pdf), poNumber: rows[0].po_number };
  const po = await ds.getRepository(PurchaseOrder).findOneByOrFail({ id });
  const site = await ds.getRepository(Site).findOneByOrFail({ id: po.siteId });
  const supplier = await ds.getRepository(Supplier).findOneByOrFail({ id: po.supplierId });
  const source = await ds.getRepository(SupplySource).findOneByOrFail({ id: po.sourceId });
  const org = await ds.getRepository(Organisation).findOneByOrFail({ id: po.organisationId });
  const pdf = await renderPurchaseOrderPdf({
    poNumber: po.poNumber,
    issuedAt: po.createdAt,
    organisationName: org.name,
    siteName: site.name,
    deliveryAddress: po.deliveryAddress,
    timeZone: site.timeZone,
    supplier: { name: supplier.name, orderEmail: supplier.orderEmail, phone: supplier.phone },
    lines: [
      {
        description: po.description,
        sourceName: source.name,
        quantity: po.quantity,
        unit: po.unit,
        unitPriceMinor: po.unitPriceMinor,
        totalMinor: po.totalMinor,
      },
    ],
    currency: po.currency,
    windowStart: po.windowStart,
    windowEnd: po.windowEnd,
    contact: { name: po.contactName, email: po.contactEmail },
    approvedBy: (JSON.parse(po.approvedByJson) as { name: string }[]).map((a) => a.name),
    requestReference: `R-${po.requestId}`,
  });
  // Whoever renders first keeps theirs; a concurrent render is discarded in favour of the stored file.
  await ds.query('UPDATE purchase_order SET pdf = ? WHERE id = ? AND pdf IS NULL', [pdf, id]);
  const again: { pdf: Buffer }[] = await ds.query('SELECT pdf FROM purchase_order WHERE id = ?', [id]);
  return { pdf: Buffer.from(again[0].pdf), poNumber: po.poNumber };
}

async function orderFor(actor: Actor, id: number): Promise<PurchaseOrder> {
  const po = await db().getRepository(PurchaseOrder).findOneBy({ id, organisationId: actor.user.organisationId });
  if (!po || !actor.user.siteIds.includes(po.siteId)) throw notFound('Purchase order');
  return po;
}

export async function orderPdf(actor: Actor, id: number) {
  const po = await orderFor(actor, id);
  return pdfForOrder(db(), po.id);
}

function presentOrder(po: PurchaseOrder, names: { site?: string; supplier?: string; source?: string }) {
  return {
    id: po.id,
    poNumber: po.poNumber,
    status: po.status,
    statusText: ORDER_STATUS_TEXT[po.status] ?? po.status,
    requestId: po.requestId,
    siteId: po.siteId,
    siteName: names.site ?? '',
    sourceId: po.sourceId,
    sourceName: names.source ?? '',
    supplierId: po.supplierId,
    supplierName: names.supplier ?? '',
    description: po.description,
    unit: po.unit as OrderUnit,
    quantity: po.quantity,
    deliveredQuantity: po.deliveredQuantity,
    unitPriceMinor: po.unitPriceMinor,
    totalMinor: po.totalMinor,
    currency: po.currency,
    windowStart: po.windowStart.toISOString(),
    windowEnd: po.windowEnd.toISOString(),
    deliveryAddress: po.deliveryAddress,
    contact: { name: po.contactName, email: po.contactEmail },
    approvedBy: JSON.parse(po.approvedByJson) as { userId: number; name: string }[],
    sentAt: po.sentAt?.toISOString() ?? null,
    createdAt: po.createdAt.toISOString(),
  } satisfies OrderRow;
}

export async function listOrders(actor: Actor, q: { status?: string; siteId?: number; page: number; pageSize: number }) {
  const siteIds = q.siteId ? actor.user.siteIds.filter((x) => x === q.siteId) : actor.user.siteIds;
  if (!siteIds.length) return { items: [], total: 0, page: q.page, pageSize: q.pageSize };
  const qb = db()
    .getRepository(PurchaseOrder)
    .createQueryBuilder('p')
    .where('p.organisation_id = :org AND p.site_id IN (:...ids)', { org: actor.user.organisationId, ids: siteIds });
  if (q.status === 'open') qb.andWhere("p.status IN ('approved','ordered')");
  else if (q.status && q.status !== 'all') qb.andWhere('p.status = :st', { st: q.status });
  qb.orderBy('p.seq', 'DESC')
    .skip((q.page - 1) * q.pageSize)
    .take(q.pageSize);
  const [rows, total] = await qb.getManyAndCount();
  const names = await namesFor(rows);
  return {
    items: rows.map((p) =>
      presentOrder(p, { site: names.sites.get(p.siteId), supplier: names.suppliers.get(p.supplierId), source: names.sources.get(p.sourceId) }),
    ),
    total,
    page: q.page,
    pageSize: q.pageSize,
  } satisfies Page<OrderRow>;
}

async function namesFor(rows: PurchaseOrder[]) {
  const uniq = (f: (p: PurchaseOrder) => number) => [...new Set(rows.map(f))];
  const ds = db();
  const sites = rows.length ? await ds.getRepository(Site).findBy({ id: In(uniq((p) => p.siteId)) }) : [];
  const suppliers = rows.length ? await ds.getRepository(Supplier).findBy({ id: In(uniq((p) => p.supplierId)) }) : [];
  const sources = rows.length ? await ds.getRepository(SupplySource).findBy({ id: In(uniq((p) => p.sourceId)) }) : [];
  return {
    sites: new Map(sites.map((s) => [s.id, s.name])),
    suppliers: new Map(suppliers.map((s) => [s.id, s.name])),
    sources: new Map(sources.map((s) => [s.id, s.name])),
  };
}

/** An order with its delivery, its e-mail's progress and the request it came from. */
export async function getOrder(actor: Actor, id: number) {
  const po = await orderFor(actor, id);
  const names = await namesFor([po]);
  const delivery = await db().getRepository(DeliveryRecord).findOneBy({ purchaseOrderId: id });
  const mails = await db()
    .getRepository(MailOutbox)
    .find({
      select: { id: true, kind: true, toAddress: true, ccAddress: true, status: true, attempts: true, lastError: true, sentAt: true, nextAttemptAt: true },
      where: { purchaseOrderId: id },
    });
  const request = await db().getRepository(ReorderRequest).findOneByOrFail({ id: po.requestId });
  return {
    ...presentOrder(po, { site: names.sites.get(po.siteId), supplier: names.suppliers.get(po.supplierId), source: names.sources.get(po.sourceId) }),
    pdfUrl: `/api/orders/${po.id}/pdf`,
    request: { id: request.id, reference: `R-${request.id}`, status: request.status, origin: request.origin },
    delivery: delivery
      ? {
          id: delivery.id,
          deliveryNote: delivery.deliveryNote,
          deliveredAt: delivery.deliveredAt.toISOString(),
          quantity: delivery.quantity,
          unit: delivery.unit,
          emptiesCollected: delivery.emptiesCollected,
          note: delivery.note,
          readingId: delivery.readingId,
        }
      : null,
    emails: mails.map((x) => ({
      id: Number(x.id),
      kind: x.kind,
      to: x.toAddress,
      cc: x.ccAddress,
      status: x.status,
      attempts: x.attempts,
      lastError: x.lastError,
      sentAt: x.sentAt?.toISOString() ?? null,
      nextAttemptAt: x.nextAttemptAt.toISOString(),
    })),
  } satisfies OrderDetail;
}
