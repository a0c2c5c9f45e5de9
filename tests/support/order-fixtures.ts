import type { DataSource } from 'typeorm';
import { Supplier } from '@backend/db/entities/catalogue.entity';
import { MailOutbox, PurchaseOrder, ReorderRequest } from '@backend/db/entities/orders.entity';
import type { TestOrg } from './test-app';
import { uniq } from './test-app';

/** A submitted request, a delivered order (on a closed request) and a failed outbox message of a site. */
export async function createOrderFixtures(ds: DataSource, org: TestOrg, siteId: number, sourceId: number): Promise<Record<string, number>> {
  const tag = uniq('ord');
  const sup = await ds.getRepository(Supplier).save(
    ds.getRepository(Supplier).create({
      organisationId: org.organisationId,
      name: `Order supplier ${tag}`,
      orderEmail: `orders-${tag}@test.example`,
      phone: '',
      leadTimeHours: 24,
      rentalMinorPerCylinderDay: 0,
      minBulkDropKg: 0,
      currency: 'GBP',
      active: true,
    }),
  );
  const base = {
    organisationId: org.organisationId,
    siteId,
    sourceId,
    supplierId: sup.id,
    unit: 'cylinders',
    gasCode: 'O2',
    cylinderTypeId: null,
    suggestedQuantity: 4,
    quantity: 4,
    quantityReason: '',
    unitPriceMinor: 1000,
    totalMinor: 4000,
    currency: 'GBP',
    neededBy: null,
    triggerJson: null,
    problem: '',
    note: '',
    requestedByUserId: null,
    version: 1,
  };
  const open = await ds.getRepository(ReorderRequest).save(ds.getRepository(ReorderRequest).create({ ...base, origin: 'auto', status: 'submitted' }));
  const closed = await ds.getRepository(ReorderRequest).save(ds.getRepository(ReorderRequest).create({ ...base, origin: 'manual', status: 'delivered' }));
  const seq = 900_000 + Math.floor(Math.random() * 99_999);
  const po = await ds.getRepository(PurchaseOrder).save(
    ds.getRepository(PurchaseOrder).create({
      organisationId: org.organisationId,
      requestId: closed.id,
      seq,
      poNumber: `PO-FX-${seq}`,
      siteId,
      sourceId,
      supplierId: sup.id,
      status: 'delivered',
      description: 'Oxygen cylinders, fixture',
      unit: 'cylinders',
      quantity: 4,
      unitPriceMinor: 1000,
      totalMinor: 4000,
      currency: 'GBP',
      windowStart: new Date(),
      windowEnd: new Date(Date.now() + 86_400_000),
      deliveryAddress: '',
      contactName: '',
      contactEmail: '',
      approvedByJson: '[]',
      scheduledDeliveryId: null,
      deliveredQuantity: 4,
      sentAt: new Date(),
      pdf: null,
    }),
  );
  const mail = await ds.getRepository(MailOutbox).save(
    ds.getRepository(MailOutbox).create({
      organisationId: org.organisationId,
      kind: 'alert',
      toAddress: `nobody-${tag}@test.example`,
      ccAddress: '',
      subject: tag,
      textBody: 'fixture',
      purchaseOrderId: null,
      requestId: null,
      dedupeKey: null,
      status: 'failed',
      attempts: 5,
      nextAttemptAt: new Date(),
      lastError: 'fixture',
      messageId: null,
      sentAt: null,
    }),
  );
  return { requests: open.id, orders: po.id, outbox: Number(mail.id) };
}
