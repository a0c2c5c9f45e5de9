import { Organisation } from './organisation.entity';
import { Site } from './site.entity';
import { User, UserRole, UserSite } from './user.entity';
import { CylinderType, Gas, Supplier, SupplierPrice } from './catalogue.entity';
import { AuditLog } from './audit-log.entity';
import { MailAttachment, MailMessage } from './mail.entity';
import { DeviceFlow, Scenario, ScheduledDelivery, SourceReading, SupplySource, TherapyLineRow, Ward, WardFeed } from './supply.entity';
import { CapacitySignoff, PipeRun, PipelineZone, RuleSet } from './capacity.entity';
import {
  AlertEvent,
  AlertState,
  DeliveryRecord,
  IdempotencyKey,
  MailOutbox,
  PoSequence,
  PurchaseOrder,
  ReorderRequest,
  ReorderRequestEvent,
  RequestApproval,
  SiteSubscription,
  UserApprovalLimit,
} from './orders.entity';
import { UserWard } from './ward-grant.entity';
import { FlowMeterReading, ImportFile, ImportJob, UsageHistory, UsageReminder, UsageReport, UsageReportLine } from './usage.entity';

/** Every entity of the DataSource, in one list. */
export const entities = [
  Organisation,
  Site,
  User,
  UserRole,
  UserSite,
  Gas,
  CylinderType,
  Supplier,
  SupplierPrice,
  AuditLog,
  MailMessage,
  MailAttachment,
  Ward,
  SupplySource,
  SourceReading,
  WardFeed,
  TherapyLineRow,
  DeviceFlow,
  Scenario,
  ScheduledDelivery,
  RuleSet,
  PipelineZone,
  PipeRun,
  CapacitySignoff,
  ReorderRequest,
  ReorderRequestEvent,
  RequestApproval,
  PoSequence,
  PurchaseOrder,
  DeliveryRecord,
  MailOutbox,
  IdempotencyKey,
  UserApprovalLimit,
  SiteSubscription,
  AlertState,
  AlertEvent,
  UsageReport,
  UsageReportLine,
  UsageReminder,
  ImportFile,
  ImportJob,
  FlowMeterReading,
  UsageHistory,
  UserWard,
];
