import { MAX_ORDER_CYLINDERS, type DeliveryRecordInput } from '@common/schemas/orders.schema';
import type { ReadingInput } from '@common/schemas/supply.schema';
import { db } from '../../db/db';
import { CylinderType } from '../../db/entities/catalogue.entity';
import { Site } from '../../db/entities/site.entity';
import { ScheduledDelivery, SourceReading, SupplySource } from '../../db/entities/supply.entity';
import { DeliveryRecord, PurchaseOrder, ReorderRequest } from '../../db/entities/orders.entity';
import type { Actor } from '../../http/context';
import { badRequest, conflict, notFound } from '../../errors/app-error';
import { logger } from '../../logger';
import { recordAudit } from '../audit/audit.service';
import { loadSiteModels } from '../forecast/site-model';
import { outlookFor } from '../forecast/forecast.service';
import { bumpSiteVersion } from '../forecast/site-version';
import { contentsOfReading, presentReading } from '../supply/supply.service';
import { addEvent, formatQuantity, whoOfDoer } from './orders.shared';
import { idempotent, transactionWithRetry } from './transactions';
import { raiseRequestsForCrossings } from './requests.service';
import { getOrder } from './purchase-orders.service';

interface PlannedReading {
  takenAt: Date;
  input: ReadingInput;
  note: string;
}

/**
 * The reading a delivery writes, so stock and the forecast move at once:
 * - a bulk tank is read at the delivery time as the forecast contents then plus the kg delivered (capped
 *   at the tank's capacity);
 * - cylinder sources add the delivered cylinders to their latest count (spares on a manifold, full ones in a
 *   store) at that count's time, so the forecast keeps the use since the count and adds the cylinders.
 * Null when a reading taken after the delivery exists: it already shows the delivered stock.
 */
async function planReading(actor: Actor, po: PurchaseOrder, input: DeliveryRecordInput): Promise<PlannedReading | null> {
  const [model] = await loadSiteModels([po.siteId], actor.user.organisationId);
  if (!model) throw notFound('Site');
  const s = model.sources.find((x) => x.id === po.sourceId);
  if (!s) throw conflict('The source of this order is no longer active', 'source_inactive');
  const deliveredAt = new Date(input.deliveredAt);
  const latest = model.latestReading.get(s.id);
  if (latest && latest.takenAt.getTime() > deliveredAt.getTime()) return null;
  const label = `Delivery note ${input.deliveryNote} (${po.poNumber})`;
  if (s.type === 'bulk_liquid') {
    // This order's own scheduled delivery must not count twice in the projection.
    const without = { ...model, deliveries: model.deliveries.filter((d) => d.id !== po.scheduledDeliveryId) };
    const o = outlookFor(without, s, { now: deliveredAt });
    const before = o.contentsNow ?? latest?.contents ?? 0;
    const cap = s.capacityKg ?? Infinity;
    const after = Math.min(cap, before + input.quantity);
    const capped = before + input.quantity > cap;
    return {
      takenAt: deliveredAt,
      input: { kind: 'kg', value: Number(after.toFixed(3)), takenAt: deliveredAt.toISOString(), method: 'delivery_note', note: '' } as ReadingInput,
      note: `${label}: +${input.quantity} kg on the forecast contents of ${Math.round(before)} kg${capped ? ` (capped at the tank's ${cap} kg: check the delivery note)` : ''}`,
    };
  }
  const qty = Math.round(input.quantity);
  const detail = latest?.detailJson ? (JSON.parse(latest.detailJson) as Record<string, unknown>) : null;
  const at = latest ? new Date(latest.takenAt.getTime() + 1) : deliveredAt;
  const since = latest ? ` added to the count of ${latest.takenAt.toISOString().slice(0, 16).replace('T', ' ')} UTC` : '';
  if (latest?.kind === 'bank_gauges' || (!latest && s.type === 'manifold')) {
    const d = { dutyBar: Number(detail?.dutyBar ?? 0), standbyBar: Number(detail?.standbyBar ?? 0), spareFull: Number(detail?.spareFull ?? 0) + qty };
    return {
      takenAt: at,
      input: { kind: 'bank_gauges', ...d, takenAt: at.toISOString(), method: 'delivery_note', note: '' } as ReadingInput,
      note: `${label}: +${qty} spare full cylinders${since}`,
    };
  }
  const d = {
    full: Number(detail?.full ?? 0) + qty,
    inUseGaugeBar: (detail?.inUseGaugeBar as number[] | undefined) ?? [],
    empty: Math.max(0, Number(detail?.empty ?? 0) - input.emptiesCollected),
  };
  return {
    takenAt: at,
    input: { kind: 'store_count', ...d, takenAt: at.toISOString(), method: 'delivery_note', note: '' } as ReadingInput,
    note: `${label}: +${qty} full cylinders, ${input.emptiesCollected} empties collected${since}`,
  };
}

/**
 * Records the delivery of an order: delivery note, quantity and empties collected. Stock is updated with a
 * delivery-note reading, the order's scheduled delivery is marked delivered, and a short delivery closes
 * the order in part. One delivery per order; the order row is locked so a double submit records it once.
 */
export async function recordDelivery(actor: Actor, orderId: number, input: DeliveryRecordInput, key?: string) {
  const deliveredAt = new Date(input.deliveredAt);
  if (deliveredAt.getTime() > Date.now() + 5 * 60_000)
    throw badRequest('A delivery cannot be in the future', [{ path: 'deliveredAt', message: 'in the future' }]);
  const found = await db().getRepository(PurchaseOrder).findOneBy({ id: orderId, organisationId: actor.user.organisationId });
  if (!found || !actor.user.siteIds.includes(found.siteId)) throw notFound('Purchase order');
  if (found.unit === 'cylinders' && !Number.isInteger(input.quantity))
    throw badRequest('Cylinders are delivered whole', [{ path: 'quantity', message: 'enter whole cylinders' }]);
  if (found.unit === 'cylinders' && input.quantity > MAX_ORDER_CYLINDERS)
    throw badRequest(`At most ${MAX_ORDER_CYLINDERS.toLocaleString('en-GB')} cylinders are delivered at once`, [
      { path: 'quantity', message: `at most ${MAX_ORDER_CYLINDERS.toLocaleString('en-GB')} cylinders: check the delivery note` },
    ]);
  if (deliveredAt.getTime() < found.createdAt.getTime() - 86_400_000)
    throw badRequest('The delivery is dated before the order', [{ path: 'deliveredAt', message: 'before the order' }]);
  const plan = found.status === 'approved' || found.status === 'ordered' ? await planReading(actor, found, input) : null;

  await transactionWithRetry(db(), (m) =>
    idempotent(m, actor.user.id, key, `delivery:${orderId}`, async () => {
      const po = await m.getRepository(PurchaseOrder).createQueryBuilder('p').setLock('pessimistic_write').where('p.id = :id', { id: orderId }).getOneOrFail();
      if (po.status !== 'approved' && po.status !== 'ordered') {
        const d = await m.getRepository(DeliveryRecord).findOneBy({ purchaseOrderId: orderId });
        throw conflict(
          `This order is ${po.status.replace('_', ' ')} already${d ? ` (delivery note ${d.deliveryNote})` : ''}: a delivery is recorded once`,
          'already_delivered',
        );
      }
      const source = await m.getRepository(SupplySource).findOneByOrFail({ id: po.sourceId });
      let readingId: string | null = null;
      let readingNote = 'A reading taken after the delivery already shows the stock; no delivery reading written.';
      if (plan) {
        const site = await m.getRepository(Site).findOneByOrFail({ id: po.siteId });
        const cyl = source.cylinderTypeId ? await m.getRepository(CylinderType).findOneBy({ id: source.cylinderTypeId }) : null;
        const contents = contentsOfReading(source, site, cyl, plan.input);
        const { kind, takenAt: _t, method: _m, note: _n, ...rest } = plan.input as ReadingInput & Record<string, unknown>;
        const value = 'value' in rest ? (rest.value as number) : null;
        const saved = await m.getRepository(SourceReading).save(
          m.getRepository(SourceReading).create({
            sourceId: source.id,
            takenAt: plan.takenAt,
            kind,
            value,
            detailJson: 'value' in rest ? null : JSON.stringify(rest),
            contents,
            method: 'delivery_note',
            note: plan.note.slice(0, 500),
            takenByUserId: actor.user.id,
          }),
        );
        readingId = saved.id;
        readingNote = plan.note;
        await recordAudit(m, whoOfDoer(actor, po.organisationId), {
          action: 'create',
          entity: 'source_reading',
          entityId: saved.id,
          after: presentReading(saved),
        });
      }
      const short = input.quantity < po.quantity;
      const status = short ? 'part_delivered' : 'delivered';
      await m.getRepository(DeliveryRecord).insert({
        purchaseOrderId: po.id,
        siteId: po.siteId,
        sourceId: po.sourceId,
        deliveryNote: input.deliveryNote,
        deliveredAt,
        quantity: input.quantity,
        unit: po.unit,
        emptiesCollected: input.emptiesCollected,
        readingId,
        note: input.note,
        recordedByUserId: actor.user.id,
      });
      await m.getRepository(PurchaseOrder).update({ id: po.id }, { status, deliveredQuantity: input.quantity });
      if (po.scheduledDeliveryId) await m.getRepository(ScheduledDelivery).update({ id: po.scheduledDeliveryId }, { status: 'delivered' });
      await bumpSiteVersion(m, po.siteId);
      const r = await m
        .getRepository(ReorderRequest)
        .createQueryBuilder('r')
        .setLock('pessimistic_write')
        .where('r.id = :id', { id: po.requestId })
        .getOneOrFail();
      await m.getRepository(ReorderRequest).update({ id: r.id }, { status, version: r.version + 1 });
      const comment = `${formatQuantity(input.quantity, po.unit)} of ${formatQuantity(po.quantity, po.unit)} delivered, note ${input.deliveryNote}${input.emptiesCollected ? `, ${input.emptiesCollected} empties collected` : ''}${short ? '; the order is closed in part' : ''}. ${readingNote}`;
      await addEvent(m, r.id, actor, short ? 'part_delivered' : 'delivered', r.status, status, comment, {
        deliveryNote: input.deliveryNote,
        quantity: input.quantity,
        emptiesCollected: input.emptiesCollected,
        readingId,
      });
      await recordAudit(m, whoOfDoer(actor, po.organisationId), {
        action: 'deliver',
        entity: 'purchase_order',
        entityId: String(po.id),
        before: { status: po.status },
        after: { status, quantity: input.quantity, deliveryNote: input.deliveryNote },
      });
      return orderId;
    }),
  );
  // The forecast has moved: a source still short (a part delivery, say) gets a new request at once.
  await raiseRequestsForCrossings([found.siteId]).catch((e: Error) => logger.error(`reorder scan after delivery: ${e.message}`));
  return getOrder(actor, orderId);
}
