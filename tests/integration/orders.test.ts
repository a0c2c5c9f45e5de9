import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SMTPServer } from 'smtp-server';
import { PDFParse } from 'pdf-parse';
import { In } from 'typeorm';
import { compressedContents } from '@common/gas/contents';
import { startMailService, stopMailService } from '@backend/mail/mail-service';
import { MailAttachment, MailMessage } from '@backend/db/entities/mail.entity';
import { MailOutbox, PurchaseOrder, ReorderRequest } from '@backend/db/entities/orders.entity';
import { ScheduledDelivery, SourceReading } from '@backend/db/entities/supply.entity';
import { SupplierPrice } from '@backend/db/entities/catalogue.entity';
import { raiseRequestsForCrossings } from '@backend/modules/orders/requests.service';
import { drainOutbox } from '@backend/modules/orders/outbox.service';
import { runAlertPass } from '@backend/modules/orders/alerts.service';
import { createTestOrg, signedIn, startTestApp, type Client, type TestApp, type TestOrg } from '../support/test-app';
import { addUser, cylinderStore, freePort } from '../support/order-helpers';

let app: TestApp;
let org: TestOrg;
let siteId: number;
let mail: SMTPServer;
let smtpPort: number;
let fm: Client;
let po: Client;
let poId: number;

const HOUR = 3_600_000;
/** The start of the current hour: a store count taken then starts the forecast exactly on the hour grid. */
const thisHour = () => new Date(Math.floor(Date.now() / HOUR) * HOUR);

/** Free gas in a full 10 L cylinder at 200 bar gauge and 15 °C, L at 15 °C / 1.01325 bar (the gas engine, real gas). */
const perCylL = compressedContents({ gas: 'O2', waterCapacityL: 10, gaugeBar: 200, temperatureC: 15, reference: '15C' }).freeGasL;

beforeAll(async () => {
  smtpPort = await freePort();
  app = await startTestApp({ SMTP_PORT: String(smtpPort), OUTBOX_BACKOFF_BASE_MS: '20', OUTBOX_BACKOFF_MAX_MS: '100', OUTBOX_MAX_ATTEMPTS: '3' });
  mail = await startMailService(app.ds, smtpPort);
  org = await createTestOrg(app.ds);
  siteId = org.siteIds[0];
  fm = await signedIn(app, org.users.facilities_manager);
  const officer = await addUser(app.ds, org, ['purchasing_officer'], 5_000_000);
  poId = officer.id;
  po = await signedIn(app, officer.email);
});
afterAll(async () => {
  await stopMailService(mail);
  await app.close();
});

async function openRequests(sourceId: number) {
  return app.ds.getRepository(ReorderRequest).find({ where: { sourceId, status: In(['draft', 'submitted', 'approved', 'ordered']) } });
}

/** Messages the local mail service received whose subject has `text` (and, when given, sent to `to`). */
async function messagesAbout(text: string, to?: string) {
  const qb = app.ds
    .getRepository(MailMessage)
    .createQueryBuilder('m')
    .where('m.subject LIKE :q', { q: `%${text}%` });
  if (to) qb.andWhere('m.mail_to LIKE :to', { to: `%${to}%` });
  return qb.getMany();
}

async function pdfText(buf: Buffer) {
  const p = new PDFParse({ data: buf });
  try {
    const r = await p.getText();
    return { text: r.text, pages: r.total };
  } finally {
    await p.destroy();
  }
}

describe('reorder requests raised from the forecast', () => {
  it('raises one request for a crossing however often the forecast runs, with the quantity from the order-up-to level', async () => {
    // 8 full cylinders, below the reorder level of 10: the forecast orders at once, arriving after 24 h.
    const st = await cylinderStore(app.ds, org, siteId, { full: 8, countedAt: thisHour() });
    const runs = await Promise.all([
      raiseRequestsForCrossings([siteId]),
      raiseRequestsForCrossings([siteId]),
      raiseRequestsForCrossings([siteId]),
      raiseRequestsForCrossings([siteId]),
    ]);
    for (let i = 0; i < 3; i++) runs.push(await raiseRequestsForCrossings([siteId]));
    const scan = await fm.post('/api/requests/scan');
    expect(scan.status).toBe(200);
    const open = await openRequests(st.source.id);
    expect(open).toHaveLength(1);
    expect(runs.flat().filter((id) => id === open[0].id)).toHaveLength(1);
    const r = open[0];
    expect(r.status).toBe('submitted');
    expect(r.origin).toBe('auto');
    // 10 L/min for 24 h = 14,400 L used before the order arrives; it then fills to 30 cylinders in whole
    // cylinders (rounded down by the rule): floor(30 − (8 − 14,400 / perCyl)) cylinders.
    const expected = Math.floor(30 - (8 - 14_400 / perCylL));
    // A 10 L cylinder at 200 bar holds about 2.1 m³ of oxygen (common practice: the label contents of this size).
    expect(perCylL).toBeGreaterThan(2000);
    expect(perCylL).toBeLessThan(2250);
    expect(r.quantity).toBe(expected);
    expect(r.unit).toBe('cylinders');
    expect(r.totalMinor).toBe(expected * 2600);
    const detail = await po.get(`/api/requests/${r.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.timeline.map((e: { action: string }) => e.action)).toEqual(['raised', 'submitted']);
    expect(detail.body.timeline[0].by).toBe('Plenum');
  });

  it('refuses a second open request by hand and explains which one is open', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 8, countedAt: thisHour() });
    await raiseRequestsForCrossings([siteId]);
    const res = await fm.post('/api/requests', { sourceId: st.source.id });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('open_request_exists');
    expect(res.body.error.message).toMatch(/open request already \(R-\d+/);
  });

  it('asks for a reason when the quantity differs from the suggestion, and records the change on the timeline', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 25, countedAt: thisHour() });
    const sug = await fm.get(`/api/sources/${st.source.id}/order-suggestion`);
    expect(sug.status).toBe(200);
    const noReason = await fm.post('/api/requests', { sourceId: st.source.id, quantity: sug.body.quantity + 3 });
    expect(noReason.status).toBe(400);
    const made = await fm.post('/api/requests', { sourceId: st.source.id, quantity: sug.body.quantity + 3, reason: 'Ward opening next week', submit: true });
    expect(made.status).toBe(200);
    expect(made.body.status).toBe('submitted');
    const changed = await po.put(`/api/requests/${made.body.id}/quantity`, { quantity: 6, reason: 'Storage space only for six' });
    expect(changed.status).toBe(200);
    expect(changed.body.quantity).toBe(6);
    expect(changed.body.totalMinor).toBe(6 * 2600);
    const step = changed.body.timeline.find((e: { action: string }) => e.action === 'quantity_changed');
    expect(step.detail).toMatchObject({ from: sug.body.quantity + 3, to: 6 });
    expect(step.comment).toBe('Storage space only for six');
    const half = await po.put(`/api/requests/${made.body.id}/quantity`, { quantity: 2.5, reason: 'half a cylinder' });
    expect(half.status).toBe(400);
  });
});

describe('quantities and money stay in range', () => {
  it('refuses an unbounded quantity with 400 and a message, and leaves the request as it was', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 25, countedAt: thisHour() });
    const made = await fm.post('/api/requests', { sourceId: st.source.id, submit: true });
    expect(made.status).toBe(200);
    const huge = await po.put(`/api/requests/${made.body.id}/quantity`, { quantity: 1_000_000, reason: 'typo' });
    expect(huge.status, JSON.stringify(huge.body)).toBe(400);
    expect(huge.body.error.details).toContainEqual({ path: 'quantity', message: expect.stringMatching(/at most 200,000/) });
    const cyl = await po.put(`/api/requests/${made.body.id}/quantity`, { quantity: 10_001, reason: 'typo' });
    expect(cyl.status, JSON.stringify(cyl.body)).toBe(400);
    expect(cyl.body.error.details).toContainEqual({ path: 'quantity', message: expect.stringMatching(/at most 10,000 cylinders/) });
    const same = await fm.get(`/api/requests/${made.body.id}`);
    expect(same.body.quantity).toBe(made.body.quantity);
    expect(same.body.version).toBe(made.body.version);
  });

  it('stores and reads back as a number a total above the 32-bit range, up to the purchase order', async () => {
    // £1,000,000.00 a cylinder (the price list's maximum) × 100 cylinders = 10,000,000,000 minor units,
    // above 2,147,483,647 (2^31 − 1, the largest signed 32-bit integer).
    const st = await cylinderStore(app.ds, org, siteId, { full: 25, countedAt: thisHour(), priceMinor: 100_000_000 });
    const made = await fm.post('/api/requests', { sourceId: st.source.id, quantity: 100, reason: 'Stocking a new wing', submit: true });
    expect(made.status, JSON.stringify(made.body)).toBe(200);
    expect(made.body.totalMinor).toBe(10_000_000_000);
    const big = await signedIn(app, (await addUser(app.ds, org, ['purchasing_officer'], 20_000_000_000)).email);
    const ok = await big.post(`/api/requests/${made.body.id}/approve`, {});
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.status).toBe('approved');
    expect(ok.body.myApprovalLimit.limitMinor).toBe(20_000_000_000);
    expect(ok.body.approvals[0].limitMinor).toBe(20_000_000_000);
    const order = await app.ds.getRepository(PurchaseOrder).findOneByOrFail({ requestId: made.body.id });
    expect(order.totalMinor).toBe(10_000_000_000);
    const req = await app.ds.getRepository(ReorderRequest).findOneByOrFail({ id: made.body.id });
    expect(req.totalMinor).toBe(10_000_000_000);
  });
});

describe('approval, purchase order and e-mail', () => {
  it('approves, numbers the order, sends it with a PDF that parses, and copies the requester', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 8, countedAt: thisHour() });
    const [id] = await raiseRequestsForCrossings([siteId]).then(async () => (await openRequests(st.source.id)).map((r) => r.id));
    const ok = await po.post(`/api/requests/${id}/approve`, { comment: 'Fine' }, {});
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.status).toBe('approved');
    expect(ok.body.order.poNumber).toMatch(/^PO-\d{6}$/);
    const order = await app.ds.getRepository(PurchaseOrder).findOneByOrFail({ requestId: id });
    // The forecast counts the order from its expected arrival.
    const sd = await app.ds.getRepository(ScheduledDelivery).findOneByOrFail({ id: order.scheduledDeliveryId! });
    expect(sd.status).toBe('scheduled');
    expect(sd.cylinders).toBe(order.quantity);
    expect(sd.reference).toBe(order.poNumber);

    await drainOutbox(app.ds);
    const got = await messagesAbout(order.poNumber, st.supplier.orderEmail);
    expect(got).toHaveLength(1);
    expect(got[0].mailTo).toContain(st.supplier.orderEmail);
    expect(got[0].mailTo).toContain(org.users.facilities_manager); // auto-raised: the site's facilities managers get the copy
    const att = await app.ds.getRepository(MailAttachment).findOneByOrFail({ mailMessageId: got[0].id });
    expect(att.contentType).toBe('application/pdf');
    expect(att.content.subarray(0, 5).toString()).toBe('%PDF-');
    const { text, pages } = await pdfText(att.content);
    expect(pages).toBe(1);
    expect(text).toContain(order.poNumber);
    expect(text).toContain('10 L · 200 bar');
    expect(text).toContain(st.supplier.name);
    expect(text).toContain(`£${((order.quantity * 2600) / 100).toFixed(2)}`);
    expect(text).toMatch(/Delivery window/i);

    const after = await po.get(`/api/requests/${id}`);
    expect(after.body.status).toBe('ordered');
    expect(after.body.timeline.map((e: { action: string }) => e.action)).toEqual(['raised', 'submitted', 'approved', 'po_created', 'ordered']);
    const pdf = await po.request('GET', `/api/orders/${order.id}/pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get('content-type')).toBe('application/pdf');
  });

  it('gives one order and one e-mail for a double click, two officers at once and a retry', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 8, countedAt: thisHour() });
    await raiseRequestsForCrossings([siteId]);
    const [r] = await openRequests(st.source.id);
    const other = await signedIn(app, (await addUser(app.ds, org, ['purchasing_officer'], 5_000_000)).email);
    const key = `approve-${r.id}-once`;
    const h = { 'idempotency-key': key };
    const [a, b, c] = await Promise.all([
      po.request('POST', `/api/requests/${r.id}/approve`, {}, { headers: h }),
      po.request('POST', `/api/requests/${r.id}/approve`, {}, { headers: h }),
      other.post(`/api/requests/${r.id}/approve`, {}),
    ]);
    const statuses = [a.status, b.status, c.status].sort();
    // Either the double click won (both 200 with one answer) and the other officer got 409, or the other won.
    if (c.status === 200) expect([a.status, b.status]).toEqual([409, 409]);
    else {
      expect(statuses).toEqual([200, 200, 409]);
      expect(a.body.order.poNumber).toBe(b.body.order.poNumber);
      expect(c.body.error.code).toBe('not_awaiting_approval');
    }
    const retry = await po.request('POST', `/api/requests/${r.id}/approve`, {}, { headers: h });
    if (c.status !== 200) expect(retry.status).toBe(200);
    expect(await app.ds.getRepository(PurchaseOrder).countBy({ requestId: r.id })).toBe(1);
    expect(await app.ds.getRepository(MailOutbox).countBy({ requestId: r.id, kind: 'purchase_order' })).toBe(1);
    await drainOutbox(app.ds);
    const order = await app.ds.getRepository(PurchaseOrder).findOneByOrFail({ requestId: r.id });
    expect(await messagesAbout(order.poNumber, st.supplier.orderEmail)).toHaveLength(1);
  });

  it('refuses self-approval, a missing limit and an approval above the limit with clear errors; a second officer completes it', async () => {
    const both = await addUser(app.ds, org, ['facilities_manager', 'purchasing_officer'], 5_000_000);
    const self = await signedIn(app, both.email);
    const st = await cylinderStore(app.ds, org, siteId, { full: 25, countedAt: thisHour() });
    const made = await self.post('/api/requests', { sourceId: st.source.id, submit: true });
    expect(made.status).toBe(200);
    const mine = await self.post(`/api/requests/${made.body.id}/approve`, {});
    expect(mine.status).toBe(409);
    expect(mine.body.error.code).toBe('self_approval');
    expect(mine.body.error.message).toMatch(/you raised this request/i);

    const noLimit = await signedIn(app, (await addUser(app.ds, org, ['purchasing_officer'])).email);
    const nl = await noLimit.post(`/api/requests/${made.body.id}/approve`, {});
    expect(nl.status).toBe(409);
    expect(nl.body.error.code).toBe('no_approval_limit');

    const total = made.body.totalMinor as number;
    const low1 = await signedIn(app, (await addUser(app.ds, org, ['purchasing_officer'], total - 1)).email);
    const low2 = await signedIn(app, (await addUser(app.ds, org, ['purchasing_officer'], total - 1)).email);
    const first = await low1.post(`/api/requests/${made.body.id}/approve`, {});
    expect(first.status).toBe(200);
    expect(first.body.status).toBe('submitted');
    expect(first.body.approvals).toHaveLength(1);
    expect(first.body.timeline.at(-1).action).toBe('approved_first');
    const again = await low1.post(`/api/requests/${made.body.id}/approve`, {});
    expect(again.body.error.code).toBe('second_approver_needed');
    const second = await low2.post(`/api/requests/${made.body.id}/approve`, {});
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('above_approval_limit');
    expect(second.body.error.message).toMatch(/above your limit/);
    const done = await po.post(`/api/requests/${made.body.id}/approve`, { version: first.body.version });
    expect(done.status, JSON.stringify(done.body)).toBe(200);
    expect(done.body.status).toBe('approved');
    expect(done.body.approvals).toHaveLength(2);
  });

  it('counts whoever last changed the quantity or the price as the raiser: another officer must approve', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 25, countedAt: thisHour() });
    const made = await fm.post('/api/requests', { sourceId: st.source.id, submit: true });
    expect(made.status).toBe(200);
    // The officer raises the quantity (14 → 50 in the review's case) and would then approve it alone.
    const bigger = await po.put(`/api/requests/${made.body.id}/quantity`, { quantity: 50, reason: 'Stock up before the holidays' });
    expect(bigger.status).toBe(200);
    expect(bigger.body.totalMinor).toBe(50 * 2600); // 50 cylinders × £26.00 from the price list
    expect(bigger.body.amendedBy).toEqual({ id: poId, name: expect.any(String) });
    expect(bigger.body.actions.approve).toMatchObject({ allowed: false, reason: expect.stringMatching(/you changed the quantity or price/i) });
    const alone = await po.post(`/api/requests/${made.body.id}/approve`, {});
    expect(alone.status).toBe(409);
    expect(alone.body.error.code).toBe('own_change_approval');
    expect(alone.body.error.message).toMatch(/you changed the quantity or price of this request last/i);
    expect(await app.ds.getRepository(PurchaseOrder).countBy({ requestId: made.body.id })).toBe(0);
    // A second officer approves what the first changed.
    const other = await signedIn(app, (await addUser(app.ds, org, ['purchasing_officer'], 5_000_000)).email);
    const ok = await other.post(`/api/requests/${made.body.id}/approve`, {});
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.status).toBe('approved');

    // A price taken anew at submission counts too: the person who submits at the new price is not the approver.
    const both = await addUser(app.ds, org, ['facilities_manager', 'purchasing_officer'], 5_000_000);
    const self = await signedIn(app, both.email);
    const st2 = await cylinderStore(app.ds, org, siteId, { full: 25, countedAt: thisHour() });
    const draft = await fm.post('/api/requests', { sourceId: st2.source.id });
    expect(draft.body.status).toBe('draft');
    await app.ds.getRepository(SupplierPrice).update({ supplierId: st2.supplier.id }, { priceMinor: 4600 });
    const sub = await self.post(`/api/requests/${draft.body.id}/submit`, {});
    expect(sub.status).toBe(200);
    expect(sub.body.unitPriceMinor).toBe(4600);
    const mine = await self.post(`/api/requests/${draft.body.id}/approve`, {});
    expect(mine.status).toBe(409);
    expect(mine.body.error.code).toBe('own_change_approval');
  });

  it('refuses an approval of a request changed since the screen was opened', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 25, countedAt: thisHour() });
    const made = await fm.post('/api/requests', { sourceId: st.source.id, submit: true });
    await fm.put(`/api/requests/${made.body.id}/quantity`, { quantity: 3, reason: 'fewer needed' });
    const stale = await po.post(`/api/requests/${made.body.id}/approve`, { version: made.body.version });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_request');
  });

  it('sends the requester a notice when a request is rejected', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 25, countedAt: thisHour() });
    const made = await fm.post('/api/requests', { sourceId: st.source.id, submit: true });
    const noComment = await po.post(`/api/requests/${made.body.id}/reject`, {});
    expect(noComment.status).toBe(400);
    const rej = await po.post(`/api/requests/${made.body.id}/reject`, { comment: 'Stock moved from the clinic instead' });
    expect(rej.status).toBe(200);
    expect(rej.body.status).toBe('rejected');
    await drainOutbox(app.ds);
    const got = await messagesAbout(`R-${made.body.id} rejected`, org.users.facilities_manager);
    expect(got).toHaveLength(1);
    expect(got[0].mailTo).toBe(org.users.facilities_manager);
    expect(got[0].textBody).toContain('Stock moved from the clinic instead');
  });

  it('keeps purchase-order numbers gapless and unique under 50 concurrent approvals', async () => {
    const org2 = await createTestOrg(app.ds);
    const officer = await addUser(app.ds, org2, ['purchasing_officer'], 100_000_000);
    const c = await signedIn(app, officer.email);
    const ids: number[] = [];
    for (let i = 0; i < 50; i++) {
      const st = await cylinderStore(app.ds, org2, org2.siteIds[0], { full: 25, countedAt: thisHour() });
      const r = await app.ds.getRepository(ReorderRequest).save(
        app.ds.getRepository(ReorderRequest).create({
          organisationId: org2.organisationId,
          siteId: org2.siteIds[0],
          sourceId: st.source.id,
          supplierId: st.supplier.id,
          origin: 'auto',
          status: 'submitted',
          unit: 'cylinders',
          gasCode: 'O2',
          cylinderTypeId: st.cylinderType.id,
          suggestedQuantity: 5,
          quantity: 5,
          quantityReason: '',
          unitPriceMinor: 2600,
          totalMinor: 13_000,
          currency: 'GBP',
          neededBy: null,
          triggerJson: null,
          problem: '',
          note: '',
          requestedByUserId: null,
          version: 1,
        }),
      );
      ids.push(r.id);
    }
    const t0 = performance.now();
    const res = await Promise.all(ids.map((id) => c.post(`/api/requests/${id}/approve`, {})));
    const ms = performance.now() - t0;
    expect(res.map((r) => r.status)).toEqual(ids.map(() => 200));
    const orders = await app.ds.getRepository(PurchaseOrder).find({ where: { organisationId: org2.organisationId }, order: { seq: 'ASC' } });
    expect(orders.map((o) => o.seq)).toEqual(Array.from({ length: 50 }, (_, i) => i + 1));
    expect(new Set(orders.map((o) => o.poNumber)).size).toBe(50);
    console.info(`50 concurrent approvals: ${ms.toFixed(0)} ms`);
    // These orders were only for the numbering: their e-mails need not go.
    await app.ds.getRepository(MailOutbox).delete({ organisationId: org2.organisationId });
  });
});

describe('the mail outbox', () => {
  async function queue(n: number, tag: string) {
    await app.ds.transaction(async (m) => {
      for (let i = 0; i < n; i++) {
        await m.getRepository(MailOutbox).insert({
          organisationId: org.organisationId,
          kind: 'alert',
          toAddress: 'someone@test.example',
          ccAddress: '',
          subject: `${tag} message ${i}`,
          textBody: 'test',
          purchaseOrderId: null,
          requestId: null,
          dedupeKey: null,
          status: 'pending',
          attempts: 0,
          nextAttemptAt: new Date(),
          lastError: '',
          messageId: null,
          sentAt: null,
        });
      }
    });
  }

  it('two workers running at once send each message once', async () => {
    const tag = `pair-${Date.now()}`;
    await drainOutbox(app.ds, 10_000); // whatever earlier tests left, so the two workers race over these only
    await queue(20, tag);
    const { createDataSource } = await import('@backend/db/data-source');
    const second = createDataSource({ poolSize: 3 });
    await second.initialize();
    try {
      const [a, b] = await Promise.all([drainOutbox(app.ds), drainOutbox(second)]);
      expect(a + b).toBe(20);
      console.info(`two workers: ${a} and ${b} messages`);
    } finally {
      await second.destroy();
    }
    const got = await messagesAbout(tag);
    expect(got).toHaveLength(20);
    expect(new Set(got.map((m) => m.subject)).size).toBe(20);
  }, 120_000);

  it('holds messages while the mail service is down and delivers each once when it returns', async () => {
    const tag = `outage-${Date.now()}`;
    await stopMailService(mail);
    await queue(5, tag);
    await drainOutbox(app.ds);
    const waiting = await app.ds
      .getRepository(MailOutbox)
      .createQueryBuilder('o')
      .where('o.subject LIKE :q', { q: `${tag}%` })
      .getMany();
    expect(waiting.every((o) => o.status === 'pending' && o.attempts >= 1 && o.lastError !== '')).toBe(true);
    // Refused connections are retried until the service answers (never marked failed, however many attempts).
    for (let i = 0; i < 4; i++) {
      await new Promise((r) => setTimeout(r, 120));
      await drainOutbox(app.ds);
    }
    expect(
      await app.ds
        .getRepository(MailOutbox)
        .createQueryBuilder('o')
        .where('o.subject LIKE :q AND o.status = :s', { q: `${tag}%`, s: 'pending' })
        .getCount(),
    ).toBe(5);
    mail = await startMailService(app.ds, smtpPort);
    for (let i = 0; i < 5 && (await messagesAbout(tag)).length < 5; i++) {
      await new Promise((r) => setTimeout(r, 120));
      await drainOutbox(app.ds);
    }
    const got = await messagesAbout(tag);
    expect(got).toHaveLength(5);
    expect(new Set(got.map((m) => m.subject)).size).toBe(5);
    const admin = await signedIn(app, org.users.administrator);
    const list = await admin.get('/api/outbox?status=sent');
    expect(list.status).toBe(200);
  });
});

describe('deliveries', () => {
  it('a delivery moves stock and the forecast at once; a short one closes the order in part', async () => {
    const st = await cylinderStore(app.ds, org, siteId, { full: 8, countedAt: new Date(thisHour().getTime() - 2 * HOUR) });
    await raiseRequestsForCrossings([siteId]);
    const [r] = await openRequests(st.source.id);
    const approved = await po.post(`/api/requests/${r.id}/approve`, {});
    const orderId = approved.body.order.id as number;
    const before = await fm.get(`/api/sources/${st.source.id}?draws=0`);
    const deliveredAt = new Date(Date.now() - 30 * 60_000).toISOString();
    const short = r.quantity - 4;
    const res = await po.post(`/api/orders/${orderId}/deliveries`, { deliveryNote: 'DN-4471', deliveredAt, quantity: short, emptiesCollected: 6 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.status).toBe('part_delivered');
    expect(res.body.delivery.deliveryNote).toBe('DN-4471');
    const after = await fm.get(`/api/sources/${st.source.id}?draws=0`);
    // Contents now rise by the delivered cylinders' free gas (the forecast's own use since the count is kept).
    expect(after.body.outlook.contents - before.body.outlook.contents).toBeCloseTo(short * perCylL, 0);
    // Days of stock move by the delivered gas over the ward's use of 10 L/min = 14,400 L a day.
    expect(after.body.outlook.daysOfStock - before.body.outlook.daysOfStock).toBeCloseTo((short * perCylL) / 14_400, 1);
    const reading = await app.ds.getRepository(SourceReading).findOneByOrFail({ sourceId: st.source.id, method: 'delivery_note' });
    expect(JSON.parse(reading.detailJson!).full).toBe(8 + short);
    const sd = await app.ds
      .getRepository(ScheduledDelivery)
      .findOneByOrFail({ id: (await app.ds.getRepository(PurchaseOrder).findOneByOrFail({ id: orderId })).scheduledDeliveryId! });
    expect(sd.status).toBe('delivered');
    const req = await po.get(`/api/requests/${r.id}`);
    expect(req.body.status).toBe('part_delivered');
    const twice = await po.post(`/api/orders/${orderId}/deliveries`, { deliveryNote: 'DN-4471', deliveredAt, quantity: 4 });
    expect(twice.status).toBe(409);
    expect(twice.body.error.code).toBe('already_delivered');
  });
});

describe('spend, rental and alerts', () => {
  it('reports spend by month, site, gas and supplier with rental from the counts, and exports CSV with formulas neutralised', async () => {
    const org3 = await createTestOrg(app.ds);
    const officer = await addUser(app.ds, org3, ['purchasing_officer'], 100_000_000);
    const c = await signedIn(app, officer.email);
    const dayStart = new Date(Math.floor(Date.now() / 86_400_000) * 86_400_000);
    // Counted 3 days ago at midnight UTC: that day, the next two and today = 4 cylinder-days per cylinder.
    const st = await cylinderStore(app.ds, org3, org3.siteIds[0], {
      full: 8,
      countedAt: new Date(dayStart.getTime() - 3 * 86_400_000),
      supplierName: '=HYPERLINK("x")',
      rentalMinorPerCylinderDay: 9,
    });
    await raiseRequestsForCrossings([org3.siteIds[0]]);
    const [r] = await app.ds.getRepository(ReorderRequest).findBy({ sourceId: st.source.id });
    expect((await c.post(`/api/requests/${r.id}/approve`, {})).status).toBe(200);
    const spend = await c.get('/api/spend');
    expect(spend.status).toBe(200);
    const rows = spend.body.rows as { month: string; orderedMinor: number; rentalMinor: number; cylinderDays: number; gasCode: string }[];
    expect(rows.reduce((s, x) => s + x.orderedMinor, 0)).toBe(r.totalMinor);
    // 8 cylinders × 4 days × 9 p a cylinder-day.
    expect(rows.reduce((s, x) => s + x.cylinderDays, 0)).toBe(32);
    expect(rows.reduce((s, x) => s + x.rentalMinor, 0)).toBe(32 * 9);
    const csv = await c.request('GET', '/api/spend.csv');
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/);
    const text = String(csv.body);
    expect(text.split('\r\n')[0]).toBe('month,site,gas,supplier,currency,ordered,delivered,rental,cylinder_days,ordered_minor,delivered_minor,rental_minor');
    expect(text).toContain(`"'=HYPERLINK(""x"")"`);
  });

  it('sends one alert per change to a subscriber, not one per recompute', async () => {
    const org4 = await createTestOrg(app.ds);
    const fm4 = await signedIn(app, org4.users.facilities_manager);
    await cylinderStore(app.ds, org4, org4.siteIds[0], { full: 8, countedAt: thisHour() });
    const sub = await fm4.put(`/api/sites/${org4.siteIds[0]}/subscription`, { mode: 'immediate', policyDays: 30 });
    expect(sub.status).toBe(200);
    const first = await runAlertPass();
    const second = await runAlertPass();
    const third = await runAlertPass();
    expect(first).toBeGreaterThanOrEqual(1);
    expect(second + third).toBe(0);
    const queued = await app.ds.getRepository(MailOutbox).findBy({ organisationId: org4.organisationId, kind: 'alert' });
    expect(queued).toHaveLength(1);
    expect(queued[0].toAddress).toBe(org4.users.facilities_manager);
    expect(queued[0].textBody).toMatch(/below your alert level of 30 days/);
  });
});
