import { Column, CreateDateColumn, Entity, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import { bigintMoney } from '../bigint-money';

/**
 * A reorder request for one source: raised by Plenum when the forecast crosses the reorder level, or by a
 * facilities manager. Money in integer minor units of `currency` (the site's). The table also has a
 * generated `open_source_id` with a unique key (one open request per source); it is not mapped here.
 */
@Entity('reorder_request')
export class ReorderRequest {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int' })
  sourceId!: number;

  @Column({ type: 'int', nullable: true })
  supplierId!: number | null;

  /** auto | manual */
  @Column({ type: 'varchar', length: 8 })
  origin!: string;

  /** draft | submitted | approved | ordered | part_delivered | delivered | rejected | cancelled */
  @Column({ type: 'varchar', length: 16 })
  status!: string;

  /** kg (bulk liquid) | cylinders */
  @Column({ type: 'varchar', length: 10 })
  unit!: string;

  @Column({ type: 'varchar', length: 16 })
  gasCode!: string;

  @Column({ type: 'int', nullable: true })
  cylinderTypeId!: number | null;

  @Column({ type: 'double' })
  suggestedQuantity!: number;

  @Column({ type: 'double' })
  quantity!: number;

  @Column({ type: 'varchar', length: 500, default: '' })
  quantityReason!: string;

  @Column({ type: 'int', nullable: true })
  unitPriceMinor!: number | null;

  @Column({ type: 'bigint', nullable: true, transformer: bigintMoney })
  totalMinor!: number | null;

  @Column({ type: 'char', length: 3 })
  currency!: string;

  /** When the stock should arrive: the forecast's reorder time plus the lead time. */
  @Column({ type: 'datetime', precision: 3, nullable: true })
  neededBy!: Date | null;

  /** The outlook that raised the request (days of stock, reorder and empty times, contents). */
  @Column({ type: 'longtext', nullable: true })
  triggerJson!: string | null;

  /** What stops the request from going on (no supplier, no price, currency mismatch); '' when none. */
  @Column({ type: 'varchar', length: 500, default: '' })
  problem!: string;

  @Column({ type: 'varchar', length: 1000, default: '' })
  note!: string;

  @Column({ type: 'int', nullable: true })
  requestedByUserId!: number | null;

  /** Who last changed the quantity or the price (counted as a raiser by the four-eyes rule). */
  @Column({ type: 'int', nullable: true })
  amendedByUserId!: number | null;

  /** Bumped on every change: clients send it back so a stale screen cannot approve a changed request. */
  @Column({ type: 'int', default: 1 })
  version!: number;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** One step of a request's timeline: who did what, when, and the status it moved between. */
@Entity('reorder_request_event')
export class ReorderRequestEvent {
  @PrimaryGeneratedColumn({ type: 'bigint' })
  id!: string;

  @Column({ type: 'int' })
  requestId!: number;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  at!: Date;

  @Column({ type: 'int', nullable: true })
  userId!: number | null;

  @Column({ type: 'varchar', length: 190, default: '' })
  userName!: string;

  @Column({ type: 'varchar', length: 24 })
  action!: string;

  @Column({ type: 'varchar', length: 16, nullable: true })
  fromStatus!: string | null;

  @Column({ type: 'varchar', length: 16, nullable: true })
  toStatus!: string | null;

  @Column({ type: 'varchar', length: 1000, default: '' })
  comment!: string;

  @Column({ type: 'longtext', nullable: true })
  detailJson!: string | null;
}

@Entity('request_approval')
export class RequestApproval {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  requestId!: number;

  @Column({ type: 'int' })
  userId!: number;

  /** The approver's limit when they approved, minor units. */
  @Column({ type: 'bigint', transformer: bigintMoney })
  limitMinor!: number;

  @Column({ type: 'bigint', transformer: bigintMoney })
  totalMinor!: number;

  @Column({ type: 'varchar', length: 1000, default: '' })
  comment!: string;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  at!: Date;
}

/** The last purchase-order number issued per organisation (gapless: taken in the approving transaction). */
@Entity('po_sequence')
export class PoSequence {
  @PrimaryColumn({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'int', default: 0 })
  lastValue!: number;
}

@Entity('purchase_order')
export class PurchaseOrder {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'int' })
  requestId!: number;

  @Column({ type: 'int' })
  seq!: number;

  @Column({ type: 'varchar', length: 32 })
  poNumber!: string;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int' })
  sourceId!: number;

  @Column({ type: 'int' })
  supplierId!: number;

  /** approved (e-mail queued) | ordered (e-mailed) | part_delivered | delivered */
  @Column({ type: 'varchar', length: 16 })
  status!: string;

  @Column({ type: 'varchar', length: 300 })
  description!: string;

  @Column({ type: 'varchar', length: 10 })
  unit!: string;

  @Column({ type: 'double' })
  quantity!: number;

  @Column({ type: 'int' })
  unitPriceMinor!: number;

  @Column({ type: 'bigint', transformer: bigintMoney })
  totalMinor!: number;

  @Column({ type: 'char', length: 3 })
  currency!: string;

  @Column({ type: 'datetime', precision: 3 })
  windowStart!: Date;

  @Column({ type: 'datetime', precision: 3 })
  windowEnd!: Date;

  @Column({ type: 'varchar', length: 700, default: '' })
  deliveryAddress!: string;

  @Column({ type: 'varchar', length: 190, default: '' })
  contactName!: string;

  @Column({ type: 'varchar', length: 190, default: '' })
  contactEmail!: string;

  /** JSON [{userId, name, at}] */
  @Column({ type: 'varchar', length: 1000, default: '[]' })
  approvedByJson!: string;

  @Column({ type: 'int', nullable: true })
  scheduledDeliveryId!: number | null;

  @Column({ type: 'double', nullable: true })
  deliveredQuantity!: number | null;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  sentAt!: Date | null;

  /** The rendered order, kept once made so the supplier, the requester and the screen see the same file. */
  @Column({ type: 'longblob', nullable: true, select: false })
  pdf!: Buffer | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

@Entity('delivery_record')
export class DeliveryRecord {
  @PrimaryGeneratedColumn({ type: 'int' })
  id!: number;

  @Column({ type: 'int' })
  purchaseOrderId!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int' })
  sourceId!: number;

  @Column({ type: 'varchar', length: 60 })
  deliveryNote!: string;

  @Column({ type: 'datetime', precision: 3 })
  deliveredAt!: Date;

  @Column({ type: 'double' })
  quantity!: number;

  @Column({ type: 'varchar', length: 10 })
  unit!: string;

  @Column({ type: 'int', default: 0 })
  emptiesCollected!: number;

  @Column({ type: 'bigint', nullable: true })
  readingId!: string | null;

  @Column({ type: 'varchar', length: 500, default: '' })
  note!: string;

  @Column({ type: 'int', nullable: true })
  recordedByUserId!: number | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;
}

/** A message waiting to go (or gone) through SMTP; written in the transaction of the change it reports. */
@Entity('mail_outbox')
export class MailOutbox {
  @PrimaryGeneratedColumn({ type: 'bigint' })
  id!: string;

  @Column({ type: 'int' })
  organisationId!: number;

  /** purchase_order | rejection | alert | digest */
  @Column({ type: 'varchar', length: 20 })
  kind!: string;

  @Column({ type: 'varchar', length: 500 })
  toAddress!: string;

  @Column({ type: 'varchar', length: 1000, default: '' })
  ccAddress!: string;

  @Column({ type: 'varchar', length: 300 })
  subject!: string;

  @Column({ type: 'longtext' })
  textBody!: string;

  /** The purchase order whose PDF goes with the message. */
  @Column({ type: 'int', nullable: true })
  purchaseOrderId!: number | null;

  @Column({ type: 'int', nullable: true })
  requestId!: number | null;

  @Column({ type: 'varchar', length: 190, nullable: true })
  dedupeKey!: string | null;

  /** pending | sent | failed */
  @Column({ type: 'varchar', length: 10, default: 'pending' })
  status!: string;

  @Column({ type: 'int', default: 0 })
  attempts!: number;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  nextAttemptAt!: Date;

  @Column({ type: 'varchar', length: 1000, default: '' })
  lastError!: string;

  @Column({ type: 'varchar', length: 300, nullable: true })
  messageId!: string | null;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  sentAt!: Date | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;
}

@Entity('idempotency_key')
export class IdempotencyKey {
  @PrimaryColumn({ type: 'int' })
  userId!: number;

  @PrimaryColumn({ type: 'varchar', length: 100 })
  idemKey!: string;

  @Column({ type: 'varchar', length: 120 })
  scope!: string;

  @Column({ type: 'longtext', nullable: true })
  responseJson!: string | null;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt!: Date;
}

/** How much a purchasing officer may approve alone, minor units of `currency`. */
@Entity('user_approval_limit')
export class UserApprovalLimit {
  @PrimaryColumn({ type: 'int' })
  userId!: number;

  @Column({ type: 'int' })
  organisationId!: number;

  @Column({ type: 'bigint', transformer: bigintMoney })
  limitMinor!: number;

  @Column({ type: 'char', length: 3 })
  currency!: string;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** A user's alert subscription to a site: immediate messages or a daily digest, below `policyDays` of stock. */
@Entity('site_subscription')
export class SiteSubscription {
  @PrimaryColumn({ type: 'int' })
  userId!: number;

  @PrimaryColumn({ type: 'int' })
  siteId!: number;

  /** immediate | digest */
  @Column({ type: 'varchar', length: 10 })
  mode!: string;

  @Column({ type: 'double' })
  policyDays!: number;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  lastDigestAt!: Date | null;
}

/** What a subscriber was last told about a source, so a recompute that changes nothing sends nothing. */
@Entity('alert_state')
export class AlertState {
  @PrimaryColumn({ type: 'int' })
  userId!: number;

  @PrimaryColumn({ type: 'int' })
  sourceId!: number;

  @Column({ type: 'boolean', default: false })
  below!: boolean;

  @Column({ type: 'varchar', length: 32, nullable: true })
  riskCode!: string | null;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt!: Date;
}

/** A change waiting for a subscriber's daily digest. */
@Entity('alert_event')
export class AlertEvent {
  @PrimaryGeneratedColumn({ type: 'bigint' })
  id!: string;

  @Column({ type: 'int' })
  userId!: number;

  @Column({ type: 'int' })
  siteId!: number;

  @Column({ type: 'int' })
  sourceId!: number;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  at!: Date;

  @Column({ type: 'varchar', length: 1000 })
  text!: string;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  digestedAt!: Date | null;
}
