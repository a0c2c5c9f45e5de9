import { z } from 'zod';
import type { Role } from '@common/api/roles';
import { idParamSchema } from '@common/schemas/common.schema';
import {
  approvalLimitSchema,
  cancelSchema,
  changeQuantitySchema,
  createRequestSchema,
  decisionSchema,
  deliverySchema,
  outboxQuerySchema,
  rejectSchema,
  requestListQuerySchema,
  spendQuerySchema,
  subscriptionSchema,
} from '@common/schemas/orders.schema';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { idempotencyKeyOf } from './transactions';
import * as requests from './requests.service';
import * as orders from './purchase-orders.service';
import { recordDelivery } from './deliveries.service';
import { spendCsv, spendReport } from './spend.service';
import { listApprovalLimits, myApprovalLimit, setApprovalLimit } from './limits.service';
import { listOutbox, retryOutbox } from './outbox.service';
import { deleteSubscription, listSubscriptions, setSubscription } from './alerts.service';

const id = (params: unknown) => validate(idParamSchema, params, 'address').id;
const FM: Role[] = ['facilities_manager'];
const PO: Role[] = ['purchasing_officer'];
const FM_PO: Role[] = ['facilities_manager', 'purchasing_officer'];
/** Who reads requests, orders and spend: the people who raise, approve and administer them. */
const READERS: Role[] = ['facilities_manager', 'purchasing_officer', 'administrator'];
const ADMIN: Role[] = ['administrator'];
const orderListQuery = z.object({
  status: z.enum(['open', 'approved', 'ordered', 'part_delivered', 'delivered', 'all']).default('all'),
  siteId: z.coerce.number().int().positive().optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

export function orderRoutes(): RouteDef[] {
  return [
    // reorder requests
    {
      method: 'get',
      path: '/api/requests',
      access: READERS,
      handler: (req) => requests.listRequests(actorOf(req), validate(requestListQuerySchema, req.query, 'query')),
    },
    {
      method: 'post',
      path: '/api/requests',
      access: FM,
      handler: (req) => requests.createRequest(actorOf(req), validate(createRequestSchema, req.body, 'request'), idempotencyKeyOf(req)),
    },
    {
      method: 'post',
      path: '/api/requests/scan',
      access: FM_PO,
      handler: async (req) => {
        const raised = await requests.raiseRequestsForCrossings(actorOf(req).user.siteIds);
        return { raised };
      },
    },
    { method: 'get', path: '/api/requests/:id', access: READERS, handler: (req) => requests.getRequest(actorOf(req), id(req.params)) },
    {
      method: 'post',
      path: '/api/requests/:id/submit',
      access: FM,
      handler: (req) =>
        requests.submitRequest(
          actorOf(req),
          id(req.params),
          validate(z.object({ version: z.number().int().positive().optional() }), req.body, 'request').version,
          idempotencyKeyOf(req),
        ),
    },
    {
      method: 'put',
      path: '/api/requests/:id/quantity',
      access: FM_PO,
      handler: (req) => requests.changeQuantity(actorOf(req), id(req.params), validate(changeQuantitySchema, req.body, 'quantity'), idempotencyKeyOf(req)),
    },
    {
      method: 'post',
      path: '/api/requests/:id/approve',
      access: PO,
      handler: (req) => requests.approveRequest(actorOf(req), id(req.params), validate(decisionSchema, req.body, 'approval'), idempotencyKeyOf(req)),
    },
    {
      method: 'post',
      path: '/api/requests/:id/reject',
      access: PO,
      handler: (req) => requests.rejectRequest(actorOf(req), id(req.params), validate(rejectSchema, req.body, 'rejection'), idempotencyKeyOf(req)),
    },
    {
      method: 'post',
      path: '/api/requests/:id/cancel',
      access: FM_PO,
      handler: (req) => requests.cancelRequest(actorOf(req), id(req.params), validate(cancelSchema, req.body, 'cancellation'), idempotencyKeyOf(req)),
    },
    { method: 'get', path: '/api/sources/:id/order-suggestion', access: FM_PO, handler: (req) => requests.suggestionFor(actorOf(req), id(req.params)) },
    // purchase orders and deliveries
    { method: 'get', path: '/api/orders', access: READERS, handler: (req) => orders.listOrders(actorOf(req), validate(orderListQuery, req.query, 'query')) },
    { method: 'get', path: '/api/orders/:id', access: READERS, handler: (req) => orders.getOrder(actorOf(req), id(req.params)) },
    {
      method: 'get',
      path: '/api/orders/:id/pdf',
      access: READERS,
      handler: async (req, res) => {
        const { pdf, poNumber } = await orders.orderPdf(actorOf(req), id(req.params));
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader('Content-Disposition', `${req.query.download === '1' ? 'attachment' : 'inline'}; filename="${poNumber}.pdf"`);
        res.setHeader('X-Content-Type-Options', 'nosniff');
        res.send(pdf);
        return undefined;
      },
    },
    {
      method: 'post',
      path: '/api/orders/:id/deliveries',
      access: FM_PO,
      handler: (req) => recordDelivery(actorOf(req), id(req.params), validate(deliverySchema, req.body, 'delivery'), idempotencyKeyOf(req)),
    },
    // spend and rental
    { method: 'get', path: '/api/spend', access: READERS, handler: (req) => spendReport(actorOf(req), validate(spendQuerySchema, req.query, 'query')) },
    {
      method: 'get',
      path: '/api/spend.csv',
      access: READERS,
      handler: async (req, res) => {
        const csv = await spendCsv(actorOf(req), validate(spendQuerySchema, req.query, 'query'));
        res.setHeader('Content-Type', 'text/csv; charset=utf-8');
        res.setHeader('Content-Disposition', 'attachment; filename="plenum-spend.csv"');
        res.send(csv);
        return undefined;
      },
    },
    // approval limits
    { method: 'get', path: '/api/approval-limits', access: ADMIN, handler: (req) => listApprovalLimits(actorOf(req)) },
    { method: 'get', path: '/api/approval-limits/mine', access: 'authenticated', handler: (req) => myApprovalLimit(actorOf(req)) },
    {
      method: 'put',
      path: '/api/users/:id/approval-limit',
      access: ADMIN,
      handler: (req) => setApprovalLimit(actorOf(req), id(req.params), validate(approvalLimitSchema, req.body, 'approval limit')),
    },
    // mail outbox (administrators)
    { method: 'get', path: '/api/outbox', access: ADMIN, handler: (req) => listOutbox(actorOf(req), validate(outboxQuerySchema, req.query, 'query')) },
    { method: 'post', path: '/api/outbox/:id/retry', access: ADMIN, handler: (req) => retryOutbox(actorOf(req), id(req.params)) },
    // alert subscriptions (one's own)
    { method: 'get', path: '/api/subscriptions', access: 'authenticated', handler: (req) => listSubscriptions(actorOf(req)) },
    {
      method: 'put',
      path: '/api/sites/:id/subscription',
      access: 'authenticated',
      handler: (req) => setSubscription(actorOf(req), id(req.params), validate(subscriptionSchema, req.body, 'subscription')),
    },
    { method: 'delete', path: '/api/sites/:id/subscription', access: 'authenticated', handler: (req) => deleteSubscription(actorOf(req), id(req.params)) },
  ];
}
