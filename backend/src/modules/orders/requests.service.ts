import { In, type EntityManager } from 'typeorm';
import {
  MAX_ORDER_CYLINDERS,
  REQUEST_STATUS_TEXT,
  type ChangeQuantityInput,
  type CreateRequestInput,
  type DecisionInput,
  type RejectInput,
  type RequestListQuery,
  type RequestStatus,
} from '@common/schemas/orders.schema';
import type { ActionState, OrderUnit, RequestAction, RequestDetail, RequestRow } from '@common/schemas/orders.schema';
import type { Page } from '@common/schemas/common.schema';
import { db } from '../../db/db';
import { CylinderType, Supplier } from '../../db/entities/catalogue.entity';
import { Site } from '../../db/entities/site.entity';
import { ScheduledDelivery, SupplySource } from '../../db/entities/supply.entity';
import { User } from '../../db/entities/user.entity';
import { Organisation } from '../../db/entities/organisation.entity';
import { PurchaseOrder, ReorderRequest, ReorderRequestEvent, RequestApproval, UserApprovalLimit } from '../../db/entities/orders.entity';
import type { Actor } from '../../http/context';
import { AppError, badRequest, conflict, notFound } from '../../errors/app-error';
import { recordAudit } from '../audit/audit.service';
import { loadSiteModels, type SiteModel } from '../forecast/site-model';
import { outlookFor, type SourceOutlook } from '../forecast/forecast.service';
import { sourceFor } from '../supply/supply.service';
import { bumpSiteVersion } from '../forecast/site-version';
import {
  OPEN,
  addEvent,
  describeItem,
  formatMoney,
  formatQuantity,
  lineTotalMinor,
  priceFor,
  unitOf,
  usersWithRoleAtSite,
  whoOfDoer,
  type Doer,
} from './orders.shared';
import { idempotent, isDuplicateKey, transactionWithRetry } from './transactions';
import { enqueueMail } from './outbox.service';

const MS_H = 3_600_000;

// ---------- suggestion ----------

export interface Suggestion {
  unit: 'kg' | 'cylinders';
  quantity: number;
  basis: string;
  neededBy: Date | null;
}

/**
 * Suggested order quantity for a source: what the forecast's first order adds on arrival to reach the
 * order-up-to level (whole cylinders; kg for a tank), else order-up-to minus the contents now; then
 * rounded to what the supplier delivers (whole cylinders, at least the minimum bulk drop).
 */
export function suggestOrder(model: SiteModel, s: SupplySource, o: SourceOutlook): Suggestion {
  const unit = unitOf(s);
  const supplier = s.supplierId ? model.suppliers.get(s.supplierId) : undefined;
  const f = o.forecast;
  const perCyl = f?.factors.usablePerCylinderL ?? f?.factors.fullCylinderFreeGasL;
  const first = f?.orders[0];
  let raw: number | null = null;
  let basis = '';
  const upTo = s.orderUpTo ?? (unit === 'kg' ? s.capacityKg : null);
  if (first && first.amount !== null && first.amount > 0) {
    raw = unit === 'kg' ? first.amount : perCyl ? first.amount / perCyl : null;
    if (raw !== null)
      basis = `Brings the forecast contents on arrival (${new Date(f!.index.startUtcMs + first.arrivesHours * MS_H).toISOString().slice(0, 16).replace('T', ' ')} UTC) up to the order-up-to level of ${upTo ?? '—'} ${unit}.`;
  }
  if (raw === null && upTo !== null && o.contentsNow !== null) {
    const now = unit === 'kg' ? o.contentsNow : perCyl ? o.contentsNow / perCyl : 0;
    raw = upTo - now;
    basis = `Order-up-to level of ${upTo} ${unit} minus the contents now (${unit === 'kg' ? `${Math.round(now)} kg` : `${now.toFixed(1)} full-cylinder equivalents`}).`;
  }
  if (raw === null || !(raw > 0)) {
    raw = unit === 'kg' ? 0 : 1;
    basis = basis || 'No order-up-to level set: enter the quantity.';
  }
  let quantity: number;
  if (unit === 'cylinders') quantity = Math.max(1, Math.ceil(raw - 1e-6));
  else {
    const minDrop = supplier?.minBulkDropKg ?? 0;
    quantity = Math.max(Math.ceil(raw - 1e-6), minDrop, 1);
    if (minDrop > 0 && raw < minDrop) basis += ` Raised to the supplier's minimum drop of ${minDrop} kg.`;
  }
  const neededBy = o.reorderAt ? new Date(new Date(o.reorderAt).getTime() + o.leadTimeHours * MS_H) : o.emptyAt ? new Date(o.emptyAt) : null;
  return { unit, quantity, basis, neededBy };
}

/** A source's forecast crosses its reorder level inside the lead time (the overview shows it red). */
export function crossesReorderLevel(s: SupplySource, o: SourceOutlook, now: Date): boolean {
  if (s.reorderMode === 'none' || s.reorderLevel === null || s.type === 'emergency_reserve') return false;
  if (!o.reorderAt) return false;
  return new Date(o.reorderAt).getTime() - now.getTime() <= o.leadTimeHours * MS_H;
}

// ---------- creation ----------

interface NewRequest {
  organisationId: number;
  site: Site;
  source: SupplySource;
  origin: 'auto' | 'manual';
  suggestion: Suggestion;
  quantity: number;
  reason: string;
  note: string;
  submit: boolean;
  trigger: unknown;
}

/** Inserts a request; returns null when the source has an open request already (the unique open-source key). */
async function insertRequest(m: EntityManager, doer: Doer, n: NewRequest): Promise<ReorderRequest | null> {
  const pricing = await priceFor(m, n.source, n.site);
  const status: RequestStatus = n.submit && !pricing.problem ? 'submitted' : 'draft';
  const repo = m.getRepository(ReorderRequest);
  // The unique key decides a race; this look-up only spares the usual case a failed insert.
  if (await repo.exists({ where: { sourceId: n.source.id, status: In(OPEN) } })) return null;
  let saved: ReorderRequest;
  try {
    saved = await repo.save(
      repo.create({
        organisationId: n.organisationId,
        siteId: n.site.id,
        sourceId: n.source.id,
        supplierId: pricing.supplier?.id ?? null,
        origin: n.origin,
        status,
        unit: n.suggestion.unit,
        gasCode: n.source.gasCode,
        cylinderTypeId: n.source.cylinderTypeId,
        suggestedQuantity: n.suggestion.quantity,
        quantity: n.quantity,
        quantityReason: n.reason,
        unitPriceMinor: pricing.unitPriceMinor,
        totalMinor: pricing.unitPriceMinor === null ? null : lineTotalMinor(n.quantity, pricing.unitPriceMinor),
        currency: n.site.currency,
        neededBy: n.suggestion.neededBy,
        triggerJson: n.trigger === undefined ? null : JSON.stringify(n.trigger),
        problem: pricing.problem,
        note: n.note,
        requestedByUserId: doer?.user.id ?? null,
        version: 1,
      }),
    );
  } catch (e) {
    if (isDuplicateKey(e)) return null;
    throw e;
  }
  const why = n.origin === 'auto' ? 'The forecast crosses the reorder level inside the lead time.' : n.note;
  await addEvent(m, saved.id, doer, 'raised', null, 'draft', why, {
    suggested: n.suggestion.quantity,
    unit: n.suggestion.unit,
    basis: n.suggestion.basis,
    ...(n.quantity !== n.suggestion.quantity ? { quantity: n.quantity, reason: n.reason } : {}),
  });
  if (status === 'submitted') await addEvent(m, saved.id, doer, 'submitted', 'draft', 'submitted');
  else if (pricing.problem) await addEvent(m, saved.id, doer, 'held', 'draft', 'draft', pricing.problem);
  await recordAudit(m, whoOfDoer(doer, n.organisationId), {
    action: 'create',
    entity: 'reorder_request',
    entityId: String(saved.id),
    after: { sourceId: saved.sourceId, quantity: saved.quantity, unit: saved.unit, status: saved.status, origin: saved.origin },
  });
  return saved;
}

/**
 * Raises a request for every source whose forecast crosses its reorder level inside the lead time and
 * that has no open request. Idempotent: the unique open-source key refuses a second open request, so
 * running the forecast again (here or in another process) raises nothing new. Sites of all organisations
 * when `siteIds` is omitted (the timer). Returns the ids raised.
 */
export async function raiseRequestsForCrossings(siteIds?: number[], now = new Date()): Promise<number[]> {
  const ds = db();
  const sites = await ds.getRepository(Site).find(siteIds ? { where: { id: In(siteIds.length ? siteIds : [-1]) } } : {});
  const byOrg = new Map<number, number[]>();
  for (const s of sites) byOrg.set(s.organisationId, [...(byOrg.get(s.organisationId) ?? []), s.id]);
  const raised: number[] = [];
  for (const [orgId, ids] of byOrg) {
    const open = new Set<number>(
      (await ds.getRepository(ReorderRequest).find({ select: { sourceId: true }, where: { siteId: In(ids), status: In(OPEN) } })).map((r) => r.sourceId),
    );
    const models = await loadSiteModels(ids, orgId);
    for (const model of models) {
      for (const s of model.sources) {
        if (open.has(s.id) || s.reorderMode === 'none' || s.type === 'emergency_reserve') continue;
        const o = outlookFor(model, s, { now });
        if (!crossesReorderLevel(s, o, now)) continue;
        const suggestion = suggestOrder(model, s, o);
        const trigger = {
          status: o.status,
          daysOfStock: o.daysOfStock,
          reorderAt: o.reorderAt,
          emptyAt: o.emptyAt,
          contentsNow: o.contentsNow,
          unit: o.unit,
          firstRisk: o.firstRisk,
          at: now.toISOString(),
        };
        const saved = await ds.transaction((m) =>
          insertRequest(m, null, {
            organisationId: orgId,
            site: model.site,
            source: s,
            origin: 'auto',
            suggestion,
            quantity: suggestion.quantity,
            reason: '',
            note: '',
            submit: true,
            trigger,
          }),
        );
        if (saved) raised.push(saved.id);
      }
    }
  }
  return raised;
}

async function modelAndOutlook(actor: Actor, source: SupplySource) {
  const [model] = await loadSiteModels([source.siteId], actor.user.organisationId);
  if (!model) throw notFound('Site');
  const s = model.sources.find((x) => x.id === source.id) ?? source;
  return { model, s, o: outlookFor(model, s) };
}

/** The suggested quantity of a source, for the raise form. */
export async function suggestionFor(actor: Actor, sourceId: number) {
  const source = await sourceFor(actor, sourceId);
  const { model, s, o } = await modelAndOutlook(actor, source);
  const sug = suggestOrder(model, s, o);
  const pricing = await priceFor(db().manager, s, model.site);
  return {
    sourceId,
    unit: sug.unit,
    quantity: sug.quantity,
    basis: sug.basis,
    neededBy: sug.neededBy?.toISOString() ?? null,
    unitPriceMinor: pricing.unitPriceMinor,
    totalMinor: pricing.unitPriceMinor === null ? null : lineTotalMinor(sug.quantity, pricing.unitPriceMinor),
    currency: model.site.currency,
    supplierName: pricing.supplier?.name ?? null,
    problem: pricing.problem,
    outlook: { status: o.status, statusText: o.statusText, daysOfStock: o.daysOfStock, reorderAt: o.reorderAt, emptyAt: o.emptyAt },
  };
}

/** A facilities manager raises a request by hand (one open request per source still holds). */
export async function createRequest(actor: Actor, input: CreateRequestInput, key?: string) {
  const source = await sourceFor(actor, input.sourceId);
  if (source.type === 'emergency_reserve')
    throw badRequest('An emergency reserve is restocked with its primary supply, not ordered on its own', [
      { path: 'sourceId', message: 'choose a supply source' },
    ]);
  const { model, s, o } = await modelAndOutlook(actor, source);
  const suggestion = suggestOrder(model, s, o);
  const quantity = input.quantity ?? suggestion.quantity;
  checkQuantity(suggestion.unit, quantity);
  if (quantity !== suggestion.quantity && input.reason.trim().length < 3)
    throw badRequest('Say why the quantity differs from the suggestion', [
      { path: 'reason', message: `the suggestion is ${formatQuantity(suggestion.quantity, suggestion.unit)}` },
    ]);
  const id = await transactionWithRetry(db(), (m) =>
    idempotent(m, actor.user.id, key, `create-request:${input.sourceId}`, async () => {
      const saved = await insertRequest(m, actor, {
        organisationId: actor.user.organisationId,
        site: model.site,
        source: s,
        origin: 'manual',
        suggestion,
        quantity,
        reason: quantity !== suggestion.quantity ? input.reason : '',
        note: input.note,
        submit: input.submit,
        trigger: { status: o.status, daysOfStock: o.daysOfStock, reorderAt: o.reorderAt, emptyAt: o.emptyAt, contentsNow: o.contentsNow, unit: o.unit },
      });
      if (!saved) {
        const existing = await m.getRepository(ReorderRequest).findOne({ where: { sourceId: s.id, status: In(OPEN) } });
        throw conflict(
          `This source has an open request already (R-${existing?.id ?? '?'}, ${REQUEST_STATUS_TEXT[(existing?.status ?? 'draft') as RequestStatus].toLowerCase()}): change that one instead`,
          'open_request_exists',
        );
      }
      return saved.id;
    }),
  );
  return getRequest(actor, id);
}

function checkQuantity(unit: string, quantity: number) {
  if (unit === 'cylinders' && !Number.isInteger(quantity))
    throw badRequest('Cylinders are ordered whole', [{ path: 'quantity', message: 'enter whole cylinders' }]);
  if (unit === 'cylinders' && quantity > MAX_ORDER_CYLINDERS)
    throw badRequest(`At most ${MAX_ORDER_CYLINDERS.toLocaleString('en-GB')} cylinders are ordered at once`, [
      { path: 'quantity', message: `at most ${MAX_ORDER_CYLINDERS.toLocaleString('en-GB')} cylinders: check the quantity` },
    ]);
}

// ---------- reading ----------

/** A request of the actor's organisation and sites, or 404. With `lock`, the row is locked for the transaction. */
async function requestFor(m: EntityManager, actor: Actor, id: number, lock = false): Promise<ReorderRequest> {
  const qb = m.getRepository(ReorderRequest).createQueryBuilder('r').where('r.id = :id AND r.organisation_id = :org', { id, org: actor.user.organisationId });
  if (lock) qb.setLock('pessimistic_write');
  const r = await qb.getOne();
  if (!r || !actor.user.siteIds.includes(r.siteId)) throw notFound('Request');
  return r;
}

export async function listRequests(actor: Actor, q: RequestListQuery) {
  const siteIds = q.siteId ? actor.user.siteIds.filter((x) => x === q.siteId) : actor.user.siteIds;
  if (!siteIds.length) return { items: [], total: 0, page: q.page, pageSize: q.pageSize };
  const qb = db()
    .getRepository(ReorderRequest)
    .createQueryBuilder('r')
    .where('r.organisation_id = :org AND r.site_id IN (:...ids)', { org: actor.user.organisationId, ids: siteIds });
  if (q.status === 'open') qb.andWhere('r.status IN (:...st)', { st: OPEN });
  else if (q.status === 'closed') qb.andWhere('r.status NOT IN (:...st)', { st: OPEN });
  else if (q.status !== 'all') qb.andWhere('r.status = :st', { st: q.status });
  qb.orderBy("FIELD(r.status, 'submitted', 'draft', 'approved', 'ordered')", 'DESC').addOrderBy('r.id', 'DESC');
  qb.skip((q.page - 1) * q.pageSize).take(q.pageSize);
  const [rows, total] = await qb.getManyAndCount();
  const ctx = await contextFor(rows);
  return { items: rows.map((r) => presentRequestRow(r, ctx)), total, page: q.page, pageSize: q.pageSize } satisfies Page<RequestRow>;
}

interface Ctx {
  sites: Map<number, Site>;
  sources: Map<number, SupplySource>;
  suppliers: Map<number, Supplier>;
  users: Map<number, User>;
  orders: Map<number, PurchaseOrder>;
  cyl: Map<number, CylinderType>;
}

async function contextFor(rows: ReorderRequest[]): Promise<Ctx> {
  const ids = (f: (r: ReorderRequest) => number | null) => [...new Set(rows.map(f).filter((x): x is number => x !== null))];
  const ds = db();
  const q = <T extends { id: number }>(cls: new () => T, list: number[]) =>
    list.length ? ds.getRepository(cls).findBy({ id: In(list) } as never) : Promise.resolve([] as T[]);
  // One query after another: a request holds one pooled connection at a time, so a burst of requests
  // queues fairly instead of overflowing the pool's queue.
  const sites = await q(
    Site,
    ids((r) => r.siteId),
  );
  const sources = await q(
    SupplySource,
    ids((r) => r.sourceId),
  );
  const suppliers = await q(
    Supplier,
    ids((r) => r.supplierId),
  );
  const users = await q(User, [...new Set([...ids((r) => r.requestedByUserId), ...ids((r) => r.amendedByUserId)])]);
  const cyl = await q(
    CylinderType,
    ids((r) => r.cylinderTypeId),
  );
  const orders = rows.length ? await ds.getRepository(PurchaseOrder).find({ where: { requestId: In(rows.map((r) => r.id)) } }) : [];
  const map = <T extends { id: number }>(list: T[]) => new Map(list.map((x) => [x.id, x]));
  return {
    sites: map(sites),
    sources: map(sources),
    suppliers: map(suppliers),
    users: map(users),
    cyl: map(cyl),
    orders: new Map(orders.map((o) => [o.requestId, o])),
  };
}

function presentRequestRow(r: ReorderRequest, ctx: Ctx) {
  const source = ctx.sources.get(r.sourceId);
  const po = ctx.orders.get(r.id);
  return {
    id: r.id,
    reference: `R-${r.id}`,
    status: r.status as RequestStatus,
    statusText: REQUEST_STATUS_TEXT[r.status as RequestStatus],
    origin: r.origin as RequestRow['origin'],
    siteId: r.siteId,
    siteName: ctx.sites.get(r.siteId)?.name ?? '',
    sourceId: r.sourceId,
    sourceName: source?.name ?? '',
    gasCode: r.gasCode,
    description: source ? describeItem(source, r.cylinderTypeId ? (ctx.cyl.get(r.cylinderTypeId) ?? null) : null) : r.gasCode,
    supplierId: r.supplierId,
    supplierName: r.supplierId ? (ctx.suppliers.get(r.supplierId)?.name ?? '') : null,
    unit: r.unit as OrderUnit,
    suggestedQuantity: r.suggestedQuantity,
    quantity: r.quantity,
    quantityReason: r.quantityReason,
    unitPriceMinor: r.unitPriceMinor,
    totalMinor: r.totalMinor,
    currency: r.currency,
    neededBy: r.neededBy?.toISOString() ?? null,
    problem: r.problem,
    note: r.note,
    requestedBy: r.requestedByUserId ? { id: r.requestedByUserId, name: ctx.users.get(r.requestedByUserId)?.name ?? '' } : null,
    /** Who last changed the quantity or the price: like the raiser, they may not approve. */
    amendedBy: r.amendedByUserId ? { id: r.amendedByUserId, name: ctx.users.get(r.amendedByUserId)?.name ?? '' } : null,
    version: r.version,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
    order: po ? { id: po.id, poNumber: po.poNumber, status: po.status } : null,
  } satisfies RequestRow;
}

/** A request with its timeline, approvals, trigger and what the actor may do with it (and why not). */
export async function getRequest(actor: Actor, id: number) {
  const r = await requestFor(db().manager, actor, id);
  const ctx = await contextFor([r]);
  const events = await db()
    .getRepository(ReorderRequestEvent)
    .find({ where: { requestId: id }, order: { at: 'ASC', id: 'ASC' } });
  const approvals = await db()
    .getRepository(RequestApproval)
    .find({ where: { requestId: id }, order: { at: 'ASC' } });
  const limit = await db().getRepository(UserApprovalLimit).findOneBy({ userId: actor.user.id });
  const approvers = approvals.length
    ? await db()
        .getRepository(User)
        .findBy({ id: In(approvals.map((a) => a.userId)) })
    : [];
  return {
    ...presentRequestRow(r, ctx),
    trigger: r.triggerJson ? (JSON.parse(r.triggerJson) as RequestDetail['trigger']) : null,
    approvals: approvals.map((a) => ({
      userId: a.userId,
      name: approvers.find((u) => u.id === a.userId)?.name ?? '',
      at: a.at.toISOString(),
      limitMinor: a.limitMinor,
      comment: a.comment,
    })),
    timeline: events.map((e) => ({
      at: e.at.toISOString(),
      action: e.action,
      by: e.userName,
      userId: e.userId,
      fromStatus: e.fromStatus,
      toStatus: e.toStatus,
      comment: e.comment,
      detail: e.detailJson ? (JSON.parse(e.detailJson) as Record<string, unknown>) : null,
    })),
    myApprovalLimit: limit ? { limitMinor: limit.limitMinor, currency: limit.currency } : null,
    actions: actionsFor(actor, r, approvals, limit),
  } satisfies RequestDetail;
}

function actionsFor(actor: Actor, r: ReorderRequest, approvals: RequestApproval[], limit: UserApprovalLimit | null): Record<RequestAction, ActionState> {
  const roles = actor.user.roles;
  const po = roles.includes('purchasing_officer');
  const fm = roles.includes('facilities_manager');
  const ok: ActionState = { allowed: true, reason: null };
  const no = (reason: string): ActionState => ({ allowed: false, reason });
  const approve = (() => {
    if (!po) return no('Only purchasing officers approve requests.');
    if (r.status !== 'submitted') return no(`The request is ${REQUEST_STATUS_TEXT[r.status as RequestStatus].toLowerCase()}.`);
    if (r.requestedByUserId === actor.user.id) return no('You raised this request: another purchasing officer must approve it.');
    if (r.amendedByUserId === actor.user.id) return no('You changed the quantity or price of this request last: another purchasing officer must approve it.');
    if (approvals.some((a) => a.userId === actor.user.id)) return no('You gave the first approval: a second purchasing officer must approve it.');
    if (!limit || limit.limitMinor <= 0) return no('You have no approval limit: ask an administrator to set one.');
    if (r.totalMinor !== null && approvals.length > 0 && r.totalMinor > limit.limitMinor)
      return no(
        `The total of ${formatMoney(r.totalMinor, r.currency)} is above your limit of ${formatMoney(limit.limitMinor, limit.currency)}: the second approval needs an officer whose limit covers it.`,
      );
    return ok;
  })();
  return {
    approve,
    reject: po ? (r.status === 'submitted' ? ok : no('Only a request awaiting approval can be rejected.')) : no('Only purchasing officers reject requests.'),
    submit: fm ? (r.status === 'draft' ? (r.problem ? no(r.problem) : ok) : no('Only a draft is submitted.')) : no('Facilities managers submit requests.'),
    cancel:
      fm || po
        ? ['draft', 'submitted'].includes(r.status)
          ? ok
          : no('Only a draft or a request awaiting approval can be cancelled.')
        : no('Your role cannot cancel requests.'),
    changeQuantity:
      fm || po
        ? ['draft', 'submitted'].includes(r.status)
          ? ok
          : no('The quantity is fixed once the request is approved.')
        : no('Your role cannot change requests.'),
  };
}

// ---------- transitions ----------

function checkVersion(r: ReorderRequest, version: number | undefined) {
  if (version !== undefined && version !== r.version) {
    throw conflict(
      `This request changed since you opened it (it is now ${REQUEST_STATUS_TEXT[r.status as RequestStatus].toLowerCase()}): reload and check it again`,
      'stale_request',
    );
  }
}

async function bump(m: EntityManager, r: ReorderRequest, patch: Partial<ReorderRequest>): Promise<void> {
  await m.getRepository(ReorderRequest).update({ id: r.id }, { ...patch, version: r.version + 1 });
}

export async function submitRequest(actor: Actor, id: number, version: number | undefined, key?: string) {
  await transactionWithRetry(db(), (m) =>
    idempotent(m, actor.user.id, key, `submit:${id}`, async () => {
      const r = await requestFor(m, actor, id, true);
      checkVersion(r, version);
      if (r.status !== 'draft')
        throw conflict(`Only a draft is submitted; this request is ${REQUEST_STATUS_TEXT[r.status as RequestStatus].toLowerCase()}`, 'invalid_transition');
      // Prices and the supplier are taken again at submission: the price list may have changed since the draft.
      const source = await m.getRepository(SupplySource).findOneByOrFail({ id: r.sourceId });
      const site = await m.getRepository(Site).findOneByOrFail({ id: r.siteId });
      const pricing = await priceFor(m, source, site);
      if (pricing.problem) {
        await bump(m, r, { problem: pricing.problem, supplierId: pricing.supplier?.id ?? null });
        throw conflict(pricing.problem, 'request_problem');
      }
      // A price that changed since the draft is the submitter's change (the four-eyes rule counts it).
      const repriced = pricing.unitPriceMinor !== r.unitPriceMinor;
      await bump(m, r, {
        status: 'submitted',
        problem: '',
        supplierId: pricing.supplier!.id,
        unitPriceMinor: pricing.unitPriceMinor,
        totalMinor: lineTotalMinor(r.quantity, pricing.unitPriceMinor!),
        ...(repriced ? { amendedByUserId: actor.user.id } : {}),
      });
      await addEvent(
        m,
        id,
        actor,
        'submitted',
        'draft',
        'submitted',
        '',
        repriced ? { priceChanged: { from: r.unitPriceMinor, to: pricing.unitPriceMinor, currency: r.currency } } : undefined,
      );
      await recordAudit(m, whoOfDoer(actor, r.organisationId), {
        action: 'submit',
        entity: 'reorder_request',
        entityId: String(id),
        before: { status: 'draft' },
        after: { status: 'submitted' },
      });
      return id;
    }),
  );
  return getRequest(actor, id);
}

export async function changeQuantity(actor: Actor, id: number, input: ChangeQuantityInput, key?: string) {
  await transactionWithRetry(db(), (m) =>
    idempotent(m, actor.user.id, key, `quantity:${id}`, async () => {
      const r = await requestFor(m, actor, id, true);
      checkVersion(r, input.version);
      if (!['draft', 'submitted'].includes(r.status)) throw conflict('The quantity is fixed once the request is approved', 'invalid_transition');
      checkQuantity(r.unit, input.quantity);
      const approvals = await m.getRepository(RequestApproval).find({ where: { requestId: id } });
      if (approvals.length) await m.getRepository(RequestApproval).delete({ requestId: id });
      const totalMinor = r.unitPriceMinor === null ? null : lineTotalMinor(input.quantity, r.unitPriceMinor);
      await bump(m, r, { quantity: input.quantity, quantityReason: input.reason, totalMinor, amendedByUserId: actor.user.id });
      await addEvent(m, id, actor, 'quantity_changed', r.status, r.status, input.reason, {
        from: r.quantity,
        to: input.quantity,
        unit: r.unit,
        ...(approvals.length ? { approvalsCleared: approvals.length } : {}),
      });
      await recordAudit(m, whoOfDoer(actor, r.organisationId), {
        action: 'update',
        entity: 'reorder_request',
        entityId: String(id),
        before: { quantity: r.quantity, totalMinor: r.totalMinor },
        after: { quantity: input.quantity, totalMinor, reason: input.reason },
      });
      return id;
    }),
  );
  return getRequest(actor, id);
}

export async function cancelRequest(actor: Actor, id: number, input: { reason: string; version?: number }, key?: string) {
  await transactionWithRetry(db(), (m) =>
    idempotent(m, actor.user.id, key, `cancel:${id}`, async () => {
      const r = await requestFor(m, actor, id, true);
      checkVersion(r, input.version);
      if (!['draft', 'submitted'].includes(r.status))
        throw conflict(`A request that is ${REQUEST_STATUS_TEXT[r.status as RequestStatus].toLowerCase()} cannot be cancelled here`, 'invalid_transition');
      await bump(m, r, { status: 'cancelled' });
      await addEvent(m, id, actor, 'cancelled', r.status, 'cancelled', input.reason);
      await recordAudit(m, whoOfDoer(actor, r.organisationId), {
        action: 'cancel',
        entity: 'reorder_request',
        entityId: String(id),
        before: { status: r.status },
        after: { status: 'cancelled', reason: input.reason },
      });
      return id;
    }),
  );
  return getRequest(actor, id);
}

export async function rejectRequest(actor: Actor, id: number, input: RejectInput, key?: string) {
  await transactionWithRetry(db(), (m) =>
    idempotent(m, actor.user.id, key, `reject:${id}`, async () => {
      const r = await requestFor(m, actor, id, true);
      checkVersion(r, input.version);
      if (r.status !== 'submitted')
        throw conflict(
          `Only a request awaiting approval can be rejected; this one is ${REQUEST_STATUS_TEXT[r.status as RequestStatus].toLowerCase()}`,
          'invalid_transition',
        );
      await bump(m, r, { status: 'rejected' });
      await addEvent(m, id, actor, 'rejected', 'submitted', 'rejected', input.comment);
      await recordAudit(m, whoOfDoer(actor, r.organisationId), {
        action: 'reject',
        entity: 'reorder_request',
        entityId: String(id),
        before: { status: 'submitted' },
        after: { status: 'rejected', comment: input.comment },
      });
      const source = await m.getRepository(SupplySource).findOneByOrFail({ id: r.sourceId });
      const site = await m.getRepository(Site).findOneByOrFail({ id: r.siteId });
      const recipients = r.requestedByUserId
        ? await m.getRepository(User).findBy({ id: r.requestedByUserId })
        : await usersWithRoleAtSite(m, r.organisationId, r.siteId, 'facilities_manager');
      if (recipients.length) {
        await enqueueMail(m, {
          organisationId: r.organisationId,
          kind: 'rejection',
          to: recipients.map((u) => u.email).join(', '),
          subject: `Reorder request R-${r.id} rejected: ${source.name}, ${site.name}`,
          text: [
            `Reorder request R-${r.id} for ${source.name} at ${site.name} was rejected by ${actor.user.name}.`,
            '',
            `Quantity: ${formatQuantity(r.quantity, r.unit)}${r.totalMinor !== null ? ` (${formatMoney(r.totalMinor, r.currency)})` : ''}`,
            `Reason: ${input.comment}`,
            '',
            'The source has no open request now: raise a new one if stock is still needed, or check its forecast in Plenum.',
          ].join('\n'),
          requestId: r.id,
        });
      }
      return id;
    }),
  );
  return getRequest(actor, id);
}

/**
 * Approval. The request row is locked for the transaction, so double clicks, two officers at once and
 * retries serialise: the first approval wins, the rest find the request approved (or, with the same
 * Idempotency-Key, get the first answer back). Within an officer's limit one approval suffices; above it
 * the approval is recorded as the first and a second officer whose limit covers the total must approve.
 * The final approval numbers the purchase order, schedules the delivery the forecast counts and queues the
 * e-mail to the supplier, all in the same transaction.
 */
export async function approveRequest(actor: Actor, id: number, input: DecisionInput, key?: string) {
  const org = actor.user.organisationId;
  // The sequence row exists before any approval locks it (its own statement, so concurrent first
  // approvals never deadlock on creating it).
  await db().query('INSERT IGNORE INTO po_sequence (organisation_id, last_value) VALUES (?, 0)', [org]);
  await transactionWithRetry(db(), (m) =>
    idempotent(m, actor.user.id, key, `approve:${id}`, async () => {
      const r = await requestFor(m, actor, id, true);
      if (r.status !== 'submitted') {
        const po = await m.getRepository(PurchaseOrder).findOneBy({ requestId: id });
        throw conflict(
          `This request is ${REQUEST_STATUS_TEXT[r.status as RequestStatus].toLowerCase()} already${po ? ` (purchase order ${po.poNumber})` : ''}: nothing was approved twice`,
          'not_awaiting_approval',
        );
      }
      checkVersion(r, input.version);
      if (r.requestedByUserId === actor.user.id)
        throw new AppError(409, 'self_approval', 'You raised this request, so you cannot approve it: another purchasing officer must.');
      if (r.amendedByUserId === actor.user.id)
        throw new AppError(
          409,
          'own_change_approval',
          'You changed the quantity or price of this request last, so you cannot approve it: another purchasing officer must.',
        );
      if (r.problem || r.totalMinor === null || r.unitPriceMinor === null || !r.supplierId)
        throw conflict(r.problem || 'This request has no price: it cannot be approved', 'request_problem');
      const limit = await m.getRepository(UserApprovalLimit).findOneBy({ userId: actor.user.id });
      if (!limit || limit.limitMinor <= 0)
        throw new AppError(409, 'no_approval_limit', 'You have no approval limit: ask an administrator to set one before approving.');
      if (limit.currency !== r.currency)
        throw new AppError(
          409,
          'approval_limit_currency',
          `Your approval limit is in ${limit.currency}; this request is in ${r.currency}: ask an administrator.`,
        );
      const prior = await m.getRepository(RequestApproval).find({ where: { requestId: id } });
      if (prior.some((a) => a.userId === actor.user.id))
        throw new AppError(409, 'second_approver_needed', 'You gave the first approval: a second purchasing officer must approve this request.');
      const total = r.totalMinor;
      if (prior.length > 0 && total > limit.limitMinor) {
        throw new AppError(
          409,
          'above_approval_limit',
          `The total of ${formatMoney(total, r.currency)} is above your limit of ${formatMoney(limit.limitMinor, limit.currency)}: the second approval needs an officer whose limit covers it.`,
        );
      }
      await m
        .getRepository(RequestApproval)
        .insert({ requestId: id, userId: actor.user.id, limitMinor: limit.limitMinor, totalMinor: total, comment: input.comment });
      if (prior.length === 0 && total > limit.limitMinor) {
        await bump(m, r, {});
        await addEvent(m, id, actor, 'approved_first', 'submitted', 'submitted', input.comment, {
          totalMinor: total,
          limitMinor: limit.limitMinor,
          note: 'Above this approver’s limit: a second approval is needed.',
        });
        await recordAudit(m, whoOfDoer(actor, org), {
          action: 'approve_first',
          entity: 'reorder_request',
          entityId: String(id),
          after: { totalMinor: total, limitMinor: limit.limitMinor },
        });
        return id;
      }
      await bump(m, r, { status: 'approved' });
      await addEvent(m, id, actor, 'approved', 'submitted', 'approved', input.comment, {
        totalMinor: total,
        limitMinor: limit.limitMinor,
        approvals: prior.length + 1,
      });
      await createPurchaseOrder(m, actor, r, [...prior.map((a) => a.userId), actor.user.id]);
      return id;
    }),
  );
  return getRequest(actor, id);
}

async function createPurchaseOrder(m: EntityManager, actor: Actor, r: ReorderRequest, approverIds: number[]): Promise<void> {
  const source = await m.getRepository(SupplySource).findOneByOrFail({ id: r.sourceId });
  const site = await m.getRepository(Site).findOneByOrFail({ id: r.siteId });
  const supplier = await m.getRepository(Supplier).findOneByOrFail({ id: r.supplierId! });
  const cyl = r.cylinderTypeId ? await m.getRepository(CylinderType).findOneBy({ id: r.cylinderTypeId }) : null;
  const approvers = await m.getRepository(User).findBy({ id: In(approverIds) });
  const org = await m.getRepository(Organisation).findOneByOrFail({ id: r.organisationId });
  const leadH = source.leadTimeHours ?? supplier.leadTimeHours;
  const now = Date.now();
  const windowStart = new Date(Math.ceil((now + leadH * MS_H) / MS_H) * MS_H);
  const windowEnd = new Date(windowStart.getTime() + 24 * MS_H);
  // The forecast counts the order from its expected arrival until the delivery is recorded.
  const sd = await m.getRepository(ScheduledDelivery).save(
    m.getRepository(ScheduledDelivery).create({
      sourceId: source.id,
      dueAt: windowStart,
      kg: r.unit === 'kg' ? r.quantity : null,
      cylinders: r.unit === 'cylinders' ? r.quantity : null,
      status: 'scheduled',
      reference: `R-${r.id}`,
    }),
  );
  // Number last, so the sequence row is locked for the shortest time; a rollback returns the number.
  await m.query('UPDATE po_sequence SET last_value = last_value + 1 WHERE organisation_id = ?', [r.organisationId]);
  const [{ last_value: seqRaw }] = (await m.query('SELECT last_value FROM po_sequence WHERE organisation_id = ?', [r.organisationId])) as {
    last_value: number;
  }[];
  const seq = Number(seqRaw);
  const poNumber = `PO-${String(seq).padStart(6, '0')}`;
  const approvedBy = approverIds.map((uid) => ({ userId: uid, name: approvers.find((u) => u.id === uid)?.name ?? '' }));
  const po = await m.getRepository(PurchaseOrder).save(
    m.getRepository(PurchaseOrder).create({
      organisationId: r.organisationId,
      requestId: r.id,
      seq,
      poNumber,
      siteId: site.id,
      sourceId: source.id,
      supplierId: supplier.id,
      status: 'approved',
      description: describeItem(source, cyl),
      unit: r.unit,
      quantity: r.quantity,
      unitPriceMinor: r.unitPriceMinor!,
      totalMinor: r.totalMinor!,
      currency: r.currency,
      windowStart,
      windowEnd,
      deliveryAddress: [site.name, site.address].filter(Boolean).join('\n'),
      contactName: actor.user.name,
      contactEmail: actor.user.email,
      approvedByJson: JSON.stringify(approvedBy),
      scheduledDeliveryId: sd.id,
      deliveredQuantity: null,
      sentAt: null,
      pdf: null,
    }),
  );
  await m.getRepository(ScheduledDelivery).update({ id: sd.id }, { reference: poNumber });
  await bumpSiteVersion(m, site.id);
  const copyTo = r.requestedByUserId
    ? await m.getRepository(User).findBy({ id: r.requestedByUserId })
    : await usersWithRoleAtSite(m, r.organisationId, r.siteId, 'facilities_manager');
  await enqueueMail(m, {
    organisationId: r.organisationId,
    kind: 'purchase_order',
    to: supplier.orderEmail,
    cc: copyTo.map((u) => u.email).join(', '),
    subject: `Purchase order ${poNumber} from ${org.name}: ${formatQuantity(r.quantity, r.unit)} ${po.description}`,
    text: [
      `Dear ${supplier.name},`,
      '',
      `please deliver the attached purchase order ${poNumber}.`,
      '',
      `Item: ${po.description}`,
      `Quantity: ${formatQuantity(r.quantity, r.unit)}`,
      `Total: ${formatMoney(r.totalMinor!, r.currency)} (${formatMoney(r.unitPriceMinor!, r.currency)} per ${r.unit === 'kg' ? 'kg' : 'cylinder'}, from your price list)`,
      `Deliver to: ${[site.name, site.address].filter(Boolean).join(', ')}`,
      `Delivery window: ${windowStart.toISOString().slice(0, 16).replace('T', ' ')} to ${windowEnd.toISOString().slice(0, 16).replace('T', ' ')} UTC`,
      `Contact: ${actor.user.name} <${actor.user.email}>`,
      '',
      'Please quote the order number on the delivery note.',
      '',
      `${org.name}`,
    ].join('\n'),
    purchaseOrderId: po.id,
    requestId: r.id,
    dedupeKey: `po:${po.id}`,
  });
  await addEvent(m, r.id, actor, 'po_created', 'approved', 'approved', `Purchase order ${poNumber} queued for e-mail to ${supplier.orderEmail}`, {
    purchaseOrderId: po.id,
    poNumber,
    windowStart: windowStart.toISOString(),
  });
  await recordAudit(m, whoOfDoer(actor, r.organisationId), {
    action: 'create',
    entity: 'purchase_order',
    entityId: String(po.id),
    after: { poNumber, requestId: r.id, totalMinor: po.totalMinor, currency: po.currency },
  });
}
