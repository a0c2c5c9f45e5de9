import type { EntityManager } from 'typeorm';
import { cylinderTypeName } from '@common/catalogue/cylinder-type';
import { GAS_INFO, type GasCode } from '@common/gas/gases';
import { CylinderType, Supplier, SupplierPrice } from '../entities/catalogue.entity';
import { Site } from '../entities/site.entity';
import { ScheduledDelivery, SourceReading, SupplySource } from '../entities/supply.entity';
import {
  DeliveryRecord,
  MailOutbox,
  PurchaseOrder,
  ReorderRequest,
  ReorderRequestEvent,
  RequestApproval,
  SiteSubscription,
  UserApprovalLimit,
} from '../entities/orders.entity';
import type { FoundationIds } from './demo-foundation';

const DAY = 86_400_000;

/**
 * Demo orders: approval limits, six months of delivered orders (so spend and rental have a history), one
 * order on its way, one request awaiting approval, one draft, one rejected, and alert subscriptions.
 * Invented quantities and prices, consistent with the demo price list.
 */
export async function seedOrders(m: EntityManager, ids: FoundationIds, now = new Date()): Promise<void> {
  const purchasing = ids.userIds['purchasing@plenum.example'];
  const facilities = ids.userIds['facilities@plenum.example'];
  await m.getRepository(UserApprovalLimit).insert({ userId: purchasing, organisationId: ids.organisationId, limitMinor: 250_000, currency: 'GBP' });
  await m.getRepository(SiteSubscription).insert([
    { userId: facilities, siteId: ids.hospitalId, mode: 'immediate', policyDays: 3, lastDigestAt: null },
    { userId: purchasing, siteId: ids.hospitalId, mode: 'digest', policyDays: 5, lastDigestAt: null },
    { userId: purchasing, siteId: ids.clinicId, mode: 'digest', policyDays: 5, lastDigestAt: null },
  ]);

  const sites = new Map((await m.getRepository(Site).findBy([{ id: ids.hospitalId }, { id: ids.clinicId }])).map((s) => [s.id, s]));
  const source = async (siteId: number, name: string) => m.getRepository(SupplySource).findOneByOrFail({ siteId, name });
  const air = await source(ids.hospitalId, 'Medical air manifold');
  const entonox = await source(ids.hospitalId, 'Maternity 50:50 store');
  const portable = await source(ids.hospitalId, 'Portable oxygen store (2 L · 230 bar)');
  const clinicO2 = await source(ids.clinicId, 'Clinic oxygen manifold');
  const supplier = await m.getRepository(Supplier).findOneByOrFail({ id: ids.supplierIds.cylinders });
  const price = async (s: SupplySource) =>
    (await m.getRepository(SupplierPrice).findOneByOrFail({ supplierId: supplier.id, cylinderTypeId: s.cylinderTypeId! })).priceMinor;
  const describe = async (s: SupplySource) => {
    const c = await m.getRepository(CylinderType).findOneByOrFail({ id: s.cylinderTypeId! });
    return `${GAS_INFO[s.gasCode as GasCode].name} cylinders, ${cylinderTypeName(c.waterCapacityL, c.fillPressureBar)}`;
  };
  const event = (
    requestId: number,
    at: Date,
    userId: number | null,
    userName: string,
    action: string,
    fromStatus: string | null,
    toStatus: string | null,
    comment = '',
  ) => m.getRepository(ReorderRequestEvent).insert({ requestId, at, userId, userName, action, fromStatus, toStatus, comment, detailJson: null });
  let seq = 0;

  async function request(s: SupplySource, status: string, origin: 'auto' | 'manual', quantity: number, at: Date, extra: Partial<ReorderRequest> = {}) {
    const unitPriceMinor = await price(s);
    return m.getRepository(ReorderRequest).save(
      m.getRepository(ReorderRequest).create({
        organisationId: ids.organisationId,
        siteId: s.siteId,
        sourceId: s.id,
        supplierId: supplier.id,
        origin,
        status,
        unit: 'cylinders',
        gasCode: s.gasCode,
        cylinderTypeId: s.cylinderTypeId,
        suggestedQuantity: quantity,
        quantity,
        quantityReason: '',
        unitPriceMinor,
        totalMinor: quantity * unitPriceMinor,
        currency: 'GBP',
        neededBy: new Date(at.getTime() + 2 * DAY),
        triggerJson: null,
        problem: '',
        note: '',
        requestedByUserId: origin === 'manual' ? facilities : null,
        version: 1,
        createdAt: at,
        ...extra,
      }),
    );
  }

  /** An order placed `daysAgo` and (unless `deliveredInDays` is null) delivered that many days later. */
  async function order(s: SupplySource, quantity: number, daysAgo: number, deliveredQuantity: number | null, deliveredInDays = 1) {
    const at = new Date(now.getTime() - daysAgo * DAY);
    const delivered = deliveredQuantity !== null;
    const status = delivered ? (deliveredQuantity < quantity ? 'part_delivered' : 'delivered') : 'ordered';
    const r = await request(s, status, 'auto', quantity, at);
    await event(r.id, at, null, 'Plenum', 'raised', null, 'draft', 'The forecast crosses the reorder level inside the lead time.');
    await event(r.id, at, null, 'Plenum', 'submitted', 'draft', 'submitted');
    const approvedAt = new Date(at.getTime() + 3 * 3_600_000);
    await m
      .getRepository(RequestApproval)
      .insert({ requestId: r.id, userId: purchasing, limitMinor: 250_000, totalMinor: r.totalMinor!, comment: '', at: approvedAt });
    await event(r.id, approvedAt, purchasing, 'Saoirse Vantongeren', 'approved', 'submitted', 'approved');
    seq += 1;
    const poNumber = `PO-${String(seq).padStart(6, '0')}`;
    const site = sites.get(s.siteId)!;
    const windowStart = new Date(approvedAt.getTime() + supplier.leadTimeHours * 3_600_000);
    const sd = await m
      .getRepository(ScheduledDelivery)
      .save(
        m
          .getRepository(ScheduledDelivery)
          .create({ sourceId: s.id, dueAt: windowStart, kg: null, cylinders: quantity, status: delivered ? 'delivered' : 'scheduled', reference: poNumber }),
      );
    const po = await m.getRepository(PurchaseOrder).save(
      m.getRepository(PurchaseOrder).create({
        organisationId: ids.organisationId,
        requestId: r.id,
        seq,
        poNumber,
        siteId: s.siteId,
        sourceId: s.id,
        supplierId: supplier.id,
        status: delivered ? status : 'ordered',
        description: await describe(s),
        unit: 'cylinders',
        quantity,
        unitPriceMinor: r.unitPriceMinor!,
        totalMinor: r.totalMinor!,
        currency: 'GBP',
        windowStart,
        windowEnd: new Date(windowStart.getTime() + DAY),
        deliveryAddress: [site.name, site.address].join('\n'),
        contactName: 'Saoirse Vantongeren',
        contactEmail: 'purchasing@plenum.example',
        approvedByJson: JSON.stringify([{ userId: purchasing, name: 'Saoirse Vantongeren' }]),
        scheduledDeliveryId: sd.id,
        deliveredQuantity: deliveredQuantity,
        sentAt: new Date(approvedAt.getTime() + 60_000),
        pdf: null,
        createdAt: approvedAt,
      }),
    );
    await event(
      r.id,
      approvedAt,
      purchasing,
      'Saoirse Vantongeren',
      'po_created',
      'approved',
      'approved',
      `Purchase order ${poNumber} queued for e-mail to ${supplier.orderEmail}`,
    );
    await event(
      r.id,
      new Date(approvedAt.getTime() + 60_000),
      null,
      'Plenum',
      'ordered',
      'approved',
      'ordered',
      `Purchase order ${poNumber} e-mailed to ${supplier.orderEmail}`,
    );
    await m.getRepository(MailOutbox).insert({
      organisationId: ids.organisationId,
      kind: 'purchase_order',
      toAddress: supplier.orderEmail,
      ccAddress: 'facilities@plenum.example',
      subject: `Purchase order ${poNumber} (demo history)`,
      textBody: 'Demo history: this message was not sent.',
      purchaseOrderId: po.id,
      requestId: r.id,
      dedupeKey: `po:${po.id}`,
      status: 'sent',
      attempts: 1,
      nextAttemptAt: approvedAt,
      lastError: '',
      messageId: null,
      sentAt: new Date(approvedAt.getTime() + 60_000),
    });
    if (delivered) {
      const deliveredAt = new Date(approvedAt.getTime() + deliveredInDays * DAY);
      await m.getRepository(DeliveryRecord).insert({
        purchaseOrderId: po.id,
        siteId: s.siteId,
        sourceId: s.id,
        deliveryNote: `DN-${70_000 + seq * 37}`,
        deliveredAt,
        quantity: deliveredQuantity,
        unit: 'cylinders',
        emptiesCollected: Math.max(0, deliveredQuantity - 1),
        readingId: null,
        note: '',
        recordedByUserId: purchasing,
      });
      await event(
        r.id,
        deliveredAt,
        purchasing,
        'Saoirse Vantongeren',
        status,
        'ordered',
        status,
        `${deliveredQuantity} of ${quantity} cylinders delivered${deliveredQuantity < quantity ? '; the order is closed in part' : ''}.`,
      );
    }
    return r;
  }

  // Six months of history: monthly orders for the maternity and portable stores, air every other month.
  for (let k = 6; k >= 1; k--) {
    await order(entonox, 10, k * 30 + 4, k === 3 ? 8 : 10);
    await order(portable, 30, k * 30 + 12, 30);
    if (k % 2 === 0) await order(air, 12, k * 30 + 20, 12);
  }
  // Store counts of the past months, so cylinder rental has a history (the latest counts stay the newest).
  for (let k = 6; k >= 1; k--) {
    const takenAt = new Date(now.getTime() - (k * 30 + 1) * DAY);
    await m.getRepository(SourceReading).insert([
      {
        sourceId: entonox.id,
        takenAt,
        kind: 'store_count',
        value: null,
        detailJson: JSON.stringify({ full: 12 + (k % 3), inUseGaugeBar: [90], empty: 3 }),
        contents: 0,
        method: 'manual',
        takenByUserId: facilities,
        note: 'Monthly count (demo history)',
      },
      {
        sourceId: portable.id,
        takenAt,
        kind: 'store_count',
        value: null,
        detailJson: JSON.stringify({ full: 30 + (k % 4) * 2, inUseGaugeBar: [150, 90], empty: 12 }),
        contents: 0,
        method: 'manual',
        takenByUserId: facilities,
        note: 'Monthly count (demo history)',
      },
    ]);
  }
  // On its way: the clinic manifold's order, e-mailed yesterday.
  await order(clinicO2, 4, 1, null);
  // Awaiting approval: the air manifold, raised by Plenum this morning.
  const pending = await request(air, 'submitted', 'auto', 14, new Date(now.getTime() - 5 * 3_600_000), {
    triggerJson: JSON.stringify({ status: 'reorder', note: 'demo' }),
  });
  await event(pending.id, pending.createdAt, null, 'Plenum', 'raised', null, 'draft', 'The forecast crosses the reorder level inside the lead time.');
  await event(pending.id, pending.createdAt, null, 'Plenum', 'submitted', 'draft', 'submitted');
  // A draft by hand, and a rejected one.
  const draft = await request(portable, 'draft', 'manual', 20, new Date(now.getTime() - 2 * 3_600_000), {
    note: 'Extra portables for the winter transfers',
    quantityReason: 'Winter transfer peak',
    suggestedQuantity: 16,
  });
  await event(draft.id, draft.createdAt, facilities, 'Morwenna Tallis', 'raised', null, 'draft', 'Extra portables for the winter transfers');
  const rejected = await request(entonox, 'rejected', 'manual', 6, new Date(now.getTime() - 12 * DAY));
  await event(rejected.id, rejected.createdAt, facilities, 'Morwenna Tallis', 'raised', null, 'draft');
  await event(rejected.id, rejected.createdAt, facilities, 'Morwenna Tallis', 'submitted', 'draft', 'submitted');
  await event(
    rejected.id,
    new Date(rejected.createdAt.getTime() + 4 * 3_600_000),
    purchasing,
    'Saoirse Vantongeren',
    'rejected',
    'submitted',
    'rejected',
    'Covered by the monthly order arriving on Thursday.',
  );
  await m.query('INSERT INTO po_sequence (organisation_id, last_value) VALUES (?, ?)', [ids.organisationId, seq]);
}
