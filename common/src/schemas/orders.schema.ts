import { z } from 'zod';
import { currencySchema } from './common.schema';

/** Request and response schemas of reorder requests, purchase orders, deliveries, spend and alerts. */

export const REQUEST_STATUSES = ['draft', 'submitted', 'approved', 'ordered', 'part_delivered', 'delivered', 'rejected', 'cancelled'] as const;
export type RequestStatus = (typeof REQUEST_STATUSES)[number];
/** Statuses in which a request still holds its source's one open slot. */
export const OPEN_REQUEST_STATUSES: readonly RequestStatus[] = ['draft', 'submitted', 'approved', 'ordered'];

export const REQUEST_STATUS_TEXT: Record<RequestStatus, string> = {
  draft: 'Draft',
  submitted: 'Awaiting approval',
  approved: 'Approved — order being sent',
  ordered: 'Ordered',
  part_delivered: 'Delivered in part (closed)',
  delivered: 'Delivered',
  rejected: 'Rejected',
  cancelled: 'Cancelled',
};

const text = (max: number) => z.string().trim().max(max, `at most ${max} characters`);
/** The largest bulk order or delivery, kg (several full road tankers; the scheduled-delivery limit too). */
export const MAX_ORDER_KG = 200_000;
/** The largest cylinder order or delivery. */
export const MAX_ORDER_CYLINDERS = 10_000;
/** The largest approval limit, minor units (£1,000,000,000.00); totals and limits are BIGINT in the database. */
export const MAX_APPROVAL_LIMIT_MINOR = 100_000_000_000;
const maxQuantityText = `at most ${MAX_ORDER_KG.toLocaleString('en-GB')} kg or ${MAX_ORDER_CYLINDERS.toLocaleString('en-GB')} cylinders: check the quantity`;
/** A quantity: whole cylinders, or kg for a bulk tank (checked against the request's unit by the server). */
const quantity = z.number({ error: 'quantity must be a number' }).positive('must be above 0').max(MAX_ORDER_KG, maxQuantityText);

export const requestListQuerySchema = z.object({
  status: z.enum([...REQUEST_STATUSES, 'open', 'closed', 'all']).default('all'),
  siteId: z.coerce.number().int().positive().optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type RequestListQuery = z.infer<typeof requestListQuerySchema>;

export const createRequestSchema = z.object({
  sourceId: z.number({ error: 'choose a source' }).int().positive(),
  /** Omit to take the suggested quantity; a different quantity needs a reason. */
  quantity: quantity.nullable().default(null),
  reason: text(500).default(''),
  note: text(1000).default(''),
  /** Submit for approval at once (otherwise it stays a draft). */
  submit: z.boolean().default(false),
});
export type CreateRequestInput = z.infer<typeof createRequestSchema>;

export const changeQuantitySchema = z.object({
  quantity,
  reason: text(500).min(3, 'say why the quantity changes'),
  version: z.number().int().positive().optional(),
});
export type ChangeQuantityInput = z.infer<typeof changeQuantitySchema>;

export const decisionSchema = z.object({
  comment: text(1000).default(''),
  /** The version the approver saw; a request changed since is refused rather than approved unseen. */
  version: z.number().int().positive().optional(),
});
export type DecisionInput = z.infer<typeof decisionSchema>;

export const rejectSchema = decisionSchema.extend({ comment: text(1000).min(3, 'say why the request is rejected') });
export type RejectInput = z.infer<typeof rejectSchema>;

export const cancelSchema = z.object({ reason: text(500).min(3, 'say why the request is cancelled'), version: z.number().int().positive().optional() });

export const deliverySchema = z.object({
  deliveryNote: text(60).min(1, 'enter the delivery-note number'),
  deliveredAt: z.iso.datetime({ offset: true, error: 'use an ISO date and time' }),
  /** Cylinders (whole) or kg, as on the order. */
  quantity: z.number({ error: 'quantity must be a number' }).min(0, 'must be ≥ 0').max(MAX_ORDER_KG, maxQuantityText),
  emptiesCollected: z
    .number()
    .int('whole cylinders')
    .min(0, 'must be ≥ 0')
    .max(MAX_ORDER_CYLINDERS, `at most ${MAX_ORDER_CYLINDERS.toLocaleString('en-GB')} cylinders`)
    .default(0),
  note: text(500).default(''),
});
export type DeliveryRecordInput = z.infer<typeof deliverySchema>;

export const approvalLimitSchema = z.object({
  limitMinor: z
    .number({ error: 'enter a limit' })
    .int('in minor units (whole pence or cents)')
    .min(0, 'must be ≥ 0')
    .max(MAX_APPROVAL_LIMIT_MINOR, `at most ${MAX_APPROVAL_LIMIT_MINOR.toLocaleString('en-GB')} minor units (1,000,000,000.00)`),
  currency: currencySchema,
});
export type ApprovalLimitInput = z.infer<typeof approvalLimitSchema>;

export const spendQuerySchema = z.object({
  from: z
    .string()
    .regex(/^\d{4}-\d{2}$/, 'use yyyy-MM')
    .optional(),
  to: z
    .string()
    .regex(/^\d{4}-\d{2}$/, 'use yyyy-MM')
    .optional(),
  siteId: z.coerce.number().int().positive().optional(),
});
export type SpendQuery = z.infer<typeof spendQuerySchema>;

export const SUBSCRIPTION_MODES = ['immediate', 'digest'] as const;
export const subscriptionSchema = z.object({
  mode: z.enum(SUBSCRIPTION_MODES),
  policyDays: z.number({ error: 'enter days of stock' }).min(0.5, 'at least half a day').max(365),
});
export type SubscriptionInput = z.infer<typeof subscriptionSchema>;

export const outboxQuerySchema = z.object({
  status: z.enum(['pending', 'sent', 'failed', 'attention', 'all']).default('attention'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

/** Header carrying a client-chosen key that makes a write safe to repeat. */
export const IDEMPOTENCY_HEADER = 'idempotency-key';
export const idempotencyKeySchema = z
  .string()
  .regex(/^[\w-]{8,100}$/, 'use 8–100 letters, digits, - or _')
  .optional();

// ---------- responses (what the orders presenters send; the browser reads the same types) ----------

export type OrderUnit = 'kg' | 'cylinders';

/** One reorder request in a list. */
export interface RequestRow {
  id: number;
  reference: string;
  status: RequestStatus;
  statusText: string;
  origin: 'auto' | 'manual';
  siteId: number;
  siteName: string;
  sourceId: number;
  sourceName: string;
  gasCode: string;
  description: string;
  supplierId: number | null;
  supplierName: string | null;
  unit: OrderUnit;
  suggestedQuantity: number;
  quantity: number;
  quantityReason: string;
  unitPriceMinor: number | null;
  totalMinor: number | null;
  currency: string;
  neededBy: string | null;
  problem: string;
  note: string;
  requestedBy: { id: number; name: string } | null;
  /** Who last changed the quantity or price (may not approve, like the raiser). */
  amendedBy: { id: number; name: string } | null;
  version: number;
  createdAt: string;
  updatedAt: string;
  order: { id: number; poNumber: string; status: string } | null;
}

/** Whether the caller may take an action on a request, and why not. */
export interface ActionState {
  allowed: boolean;
  reason: string | null;
}

export type RequestAction = 'approve' | 'reject' | 'submit' | 'cancel' | 'changeQuantity';

export interface RequestDetail extends RequestRow {
  trigger: { status?: string; daysOfStock?: number | null; reorderAt?: string | null; emptyAt?: string | null } | null;
  approvals: { userId: number; name: string; at: string; limitMinor: number; comment: string }[];
  timeline: {
    at: string;
    action: string;
    by: string;
    userId: number | null;
    fromStatus: string | null;
    toStatus: string | null;
    comment: string;
    detail: Record<string, unknown> | null;
  }[];
  myApprovalLimit: { limitMinor: number; currency: string } | null;
  actions: Record<RequestAction, ActionState>;
}

/** One purchase order in a list. */
export interface OrderRow {
  id: number;
  poNumber: string;
  status: string;
  statusText: string;
  requestId: number;
  siteId: number;
  siteName: string;
  sourceId: number;
  sourceName: string;
  supplierId: number;
  supplierName: string;
  description: string;
  unit: OrderUnit;
  quantity: number;
  deliveredQuantity: number | null;
  unitPriceMinor: number;
  totalMinor: number;
  currency: string;
  windowStart: string;
  windowEnd: string;
  deliveryAddress: string;
  contact: { name: string; email: string };
  approvedBy: { userId: number; name: string }[];
  sentAt: string | null;
  createdAt: string;
}

export interface OrderDetail extends OrderRow {
  pdfUrl: string;
  request: { id: number; reference: string; status: string; origin: string };
  delivery: {
    id: number;
    deliveryNote: string;
    deliveredAt: string;
    quantity: number;
    unit: string;
    emptiesCollected: number;
    note: string;
    readingId: string | null;
  } | null;
  emails: {
    id: number;
    kind: string;
    to: string;
    cc: string;
    status: string;
    attempts: number;
    lastError: string;
    sentAt: string | null;
    nextAttemptAt: string;
  }[];
}

/** Spend of one month, site, gas, supplier and currency (integer minor units). */
export interface SpendRow {
  month: string;
  siteId: number;
  siteName: string;
  gasCode: string;
  supplierId: number;
  supplierName: string;
  currency: string;
  orderedMinor: number;
  deliveredMinor: number;
  rentalMinor: number;
  cylinderDays: number;
}

export interface SpendReport {
  from: string;
  to: string;
  months: string[];
  rows: SpendRow[];
  currencies: string[];
}

/** A purchasing officer with their approval limit (integer minor units; null: none set, so they cannot approve). */
export interface ApprovalLimitRow {
  userId: number;
  name: string;
  email: string;
  active: boolean;
  limitMinor: number | null;
  currency: string | null;
}

/** One's own alert subscription to a site. */
export interface SubscriptionView {
  siteId: number;
  siteName: string;
  mode: (typeof SUBSCRIPTION_MODES)[number];
  /** Alert when a source's days of stock fall below this. */
  policyDays: number;
  lastDigestAt: string | null;
}
