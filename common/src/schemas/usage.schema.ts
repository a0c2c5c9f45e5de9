import { z } from 'zod';
import { OXYGEN_DEVICES } from '../forecast/demand-model';
import type { WardView } from './supply.schema';

/**
 * Schemas of ward usage reports, CSV uploads (readings, telemetry, store counts, flow meters, historic
 * usage) and reconciliation queries: shared by the server's validation and the browser's forms.
 */

const LOCAL_DATE_RE = /^\d{4}-\d{2}-\d{2}$/;
export const localDateSchema = z
  .string()
  .regex(LOCAL_DATE_RE, 'use a date, yyyy-MM-dd')
  .refine((d) => {
    const t = new Date(`${d}T00:00:00Z`);
    return !Number.isNaN(t.getTime()) && t.toISOString().slice(0, 10) === d;
  }, 'not a calendar date');

const count = (what: string, max: number) =>
  z
    .number({ error: `${what} must be a number` })
    .int(`${what}: whole numbers`)
    .min(0, `${what} cannot be negative`)
    .max(max, `${what}: above ${max}? check the count`);

// ---------- usage reports ----------

export const usageDeviceLineSchema = z
  .object({
    device: z.enum(OXYGEN_DEVICES, { error: 'choose a device' }),
    /** Patients on the device when the report is made. */
    patientsNow: count('patients now', 500),
    /** Most patients on the device at any one time during the shift (≥ now). */
    patientsShift: count('patients over the shift', 500),
  })
  .refine((l) => l.patientsShift >= l.patientsNow, { path: ['patientsShift'], message: 'the most over the shift cannot be below the number now' });
export type UsageDeviceLine = z.infer<typeof usageDeviceLineSchema>;

export const usageCylinderLineSchema = z.object({
  cylinderTypeId: z.number().int().positive('choose a cylinder type'),
  /** Cylinders the ward changed (used up) during the day. */
  used: count('cylinders used', 1000),
  /** Cylinders sent back to the store (empty or not needed). */
  returned: count('cylinders returned', 1000),
});
export type UsageCylinderLine = z.infer<typeof usageCylinderLineSchema>;

const usageBody = {
  devices: z.array(usageDeviceLineSchema).max(OXYGEN_DEVICES.length),
  cylinders: z.array(usageCylinderLineSchema).max(50),
  note: z.string().trim().max(1000, 'keep the note under 1,000 characters').default(''),
};

function uniqueLines(r: { devices: UsageDeviceLine[]; cylinders: UsageCylinderLine[] }, ctx: z.RefinementCtx) {
  const seen = new Set<string>();
  r.devices.forEach((d, i) => {
    if (seen.has(d.device)) ctx.addIssue({ code: 'custom', path: ['devices', i, 'device'], message: 'this device is listed twice' });
    seen.add(d.device);
  });
  const types = new Set<number>();
  r.cylinders.forEach((c, i) => {
    if (types.has(c.cylinderTypeId)) ctx.addIssue({ code: 'custom', path: ['cylinders', i, 'cylinderTypeId'], message: 'this cylinder type is listed twice' });
    types.add(c.cylinderTypeId);
  });
}

/** A new daily report of a ward (the ward is in the address; the date is the ward's local date). */
export const usageReportCreateSchema = z.object({ date: localDateSchema, ...usageBody }).superRefine(uniqueLines);
export type UsageReportCreate = z.infer<typeof usageReportCreateSchema>;

/** An edit of a filed report (its ward and date do not change). */
export const usageReportUpdateSchema = z.object(usageBody).superRefine(uniqueLines);
export type UsageReportUpdate = z.infer<typeof usageReportUpdateSchema>;

export const usageListQuerySchema = z.object({
  /** The local date to open (a filed report or a prefilled draft); default today at the site. */
  date: localDateSchema.optional(),
  days: z.coerce.number().int().min(1).max(92).default(14),
});

export const usageStatusQuerySchema = z.object({ date: localDateSchema.optional() });

// ---------- uploads ----------

export const IMPORT_KINDS = ['tank_readings', 'flow_meter_totals', 'store_counts', 'historic_usage'] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];

export const IMPORT_KIND_LABELS: Record<ImportKind, string> = {
  tank_readings: 'Tank readings or telemetry',
  flow_meter_totals: 'Flow-meter totals',
  store_counts: 'Cylinder store counts',
  historic_usage: 'Historic usage',
};

export interface ImportColumn {
  key: string;
  label: string;
  required: boolean;
  /** Other header spellings that map to this column automatically (lower case, spaces as _). */
  aliases: readonly string[];
  description: string;
  /** Example values for the template (one per template row). */
  examples: readonly string[];
}

/** The columns of each kind of upload, in template order. */
export const IMPORT_COLUMNS: Record<ImportKind, readonly ImportColumn[]> = {
  tank_readings: [
    {
      key: 'time',
      label: 'Time',
      required: true,
      aliases: ['timestamp', 'date_time', 'datetime', 'taken_at', 'time_utc', 'reading_time', 'date'],
      description: 'When the reading was taken: 2027-01-04T08:30 (site time) or with an offset, 2027-01-04T08:30:00Z',
      examples: ['2027-01-04T08:00', '2027-01-04T09:00', '2027-01-04T10:00'],
    },
    {
      key: 'level',
      label: 'Level',
      required: true,
      aliases: ['value', 'reading', 'contents', 'level_percent', 'percent', 'kg', 'mass_kg', 'litres', 'dp', 'differential_pressure'],
      description: 'The reading, in the unit of the unit column (or the unit chosen on upload)',
      examples: ['62.5', '62.1', '61.8'],
    },
    {
      key: 'unit',
      label: 'Unit',
      required: false,
      aliases: ['units', 'uom'],
      description: '% (level), kg, L (litres of liquid) or the unit of the tank’s calibration table (differential pressure)',
      examples: ['%', '%', '%'],
    },
    {
      key: 'source',
      label: 'Tank',
      required: false,
      aliases: ['tank', 'source_name', 'source_id', 'vessel'],
      description: 'The tank’s name or number in Plenum; leave out to use the tank chosen on upload',
      examples: ['', '', ''],
    },
    {
      key: 'note',
      label: 'Note',
      required: false,
      aliases: ['comment', 'notes', 'remark'],
      description: 'Free text',
      examples: ['', 'after the morning round', ''],
    },
  ],
  flow_meter_totals: [
    {
      key: 'time',
      label: 'Time',
      required: true,
      aliases: ['timestamp', 'date_time', 'datetime', 'taken_at', 'date'],
      description: 'When the meter was read',
      examples: ['2027-01-04T08:00', '2027-01-05T08:00', '2027-01-06T08:00'],
    },
    {
      key: 'total',
      label: 'Meter total',
      required: true,
      aliases: ['reading', 'value', 'register', 'totaliser', 'volume'],
      description: 'The meter’s running total of free gas at the site’s reference conditions',
      examples: ['1520.4', '1541.9', '1563.0'],
    },
    { key: 'unit', label: 'Unit', required: false, aliases: ['units', 'uom'], description: 'm3 or L of free gas', examples: ['m3', 'm3', 'm3'] },
    { key: 'note', label: 'Note', required: false, aliases: ['comment', 'notes'], description: 'Free text', examples: ['', '', ''] },
  ],
  store_counts: [
    {
      key: 'time',
      label: 'Time',
      required: true,
      aliases: ['timestamp', 'date_time', 'datetime', 'taken_at', 'date', 'counted_at'],
      description: 'When the store was counted',
      examples: ['2027-01-04T08:00', '2027-01-05T08:00', '2027-01-06T08:00'],
    },
    { key: 'full', label: 'Full', required: true, aliases: ['full_cylinders', 'full_count'], description: 'Full cylinders', examples: ['24', '21', '30'] },
    {
      key: 'in_use_gauges_bar',
      label: 'In-use gauges (bar)',
      required: false,
      aliases: ['in_use', 'in_use_gauge_bar', 'part_used', 'gauges'],
      description: 'Gauge pressure of each part-used cylinder, separated by spaces or |',
      examples: ['150 90', '120', ''],
    },
    {
      key: 'empty',
      label: 'Empty',
      required: false,
      aliases: ['empties', 'empty_cylinders'],
      description: 'Empty cylinders waiting for collection',
      examples: ['4', '7', '1'],
    },
    {
      key: 'source',
      label: 'Store',
      required: false,
      aliases: ['store', 'source_name', 'source_id'],
      description: 'The store’s name or number in Plenum; leave out to use the store chosen on upload',
      examples: ['', '', ''],
    },
    { key: 'note', label: 'Note', required: false, aliases: ['comment', 'notes'], description: 'Free text', examples: ['', '', 'delivery of 10 at 09:00'] },
  ],
  historic_usage: [
    {
      key: 'date',
      label: 'Date',
      required: true,
      aliases: ['day', 'usage_date', 'period', 'time'],
      description: 'The local day the usage belongs to, 2026-11-30',
      examples: ['2026-11-30', '2026-12-01', '2026-12-01'],
    },
    {
      key: 'ward',
      label: 'Ward',
      required: true,
      aliases: ['ward_name', 'department', 'area', 'ward_id'],
      description: 'The ward’s name or number in Plenum',
      examples: ['Ward name', 'Ward name', 'Ward name'],
    },
    {
      key: 'gas',
      label: 'Gas',
      required: false,
      aliases: ['gas_code', 'product'],
      description: 'Gas code (O2, AIR, N2O, N2O_O2_50, …); O2 when left out',
      examples: ['O2', 'O2', 'AIR'],
    },
    {
      key: 'volume',
      label: 'Volume',
      required: true,
      aliases: ['used', 'usage', 'quantity', 'volume_l', 'litres', 'm3'],
      description: 'Free gas used that day at the site’s reference conditions',
      examples: ['12500', '13100', '2100'],
    },
    { key: 'unit', label: 'Unit', required: false, aliases: ['units', 'uom'], description: 'L or m3 of free gas', examples: ['L', 'L', 'L'] },
    { key: 'note', label: 'Note', required: false, aliases: ['comment', 'notes'], description: 'Free text', examples: ['', '', ''] },
  ],
};

export const DATE_ORDERS = ['ymd', 'dmy', 'mdy'] as const;

const optionalId = z.preprocess((v) => (v === '' || v === null || v === undefined ? undefined : v), z.coerce.number().int().positive().optional());
const bool = z.preprocess((v) => v === true || v === 'true' || v === '1' || v === 'on', z.boolean());
const mappingSchema = z.preprocess(
  (v) => {
    if (typeof v !== 'string') return v;
    if (v.trim() === '') return undefined;
    try {
      return JSON.parse(v);
    } catch {
      return v;
    }
  },
  z.record(z.string().max(64), z.string().max(200), { error: 'mapping must be {column: header}' }).optional(),
);

/** The form fields of an upload (multipart: every value arrives as text). */
export const importOptionsSchema = z.object({
  kind: z.enum(IMPORT_KINDS, { error: `choose what the file holds: ${IMPORT_KINDS.join(', ')}` }),
  /** Target source for tank readings and store counts (unless the file has a source column), or the meter's source. */
  sourceId: optionalId,
  /** Target ward of a flow meter. */
  wardId: optionalId,
  /** Unit when the file has no unit column: %, kg, L, m3 or the calibration unit. */
  unit: z.preprocess((v) => (v === '' ? undefined : v), z.string().trim().max(24).optional()),
  dateOrder: z.preprocess((v) => (v === '' || v === undefined ? 'ymd' : v), z.enum(DATE_ORDERS)),
  /** Canonical column → the file's header (when the headers differ from the template). */
  mapping: mappingSchema,
  /** The same file (by content) was imported before and the user wants it again. */
  confirmDuplicate: bool.default(false),
});
export type ImportOptions = z.infer<typeof importOptionsSchema>;

/** A new mapping (and target) for an uploaded file before it is checked again. */
export const importRemapSchema = z.object({
  sourceId: z.number().int().positive().optional(),
  wardId: z.number().int().positive().optional(),
  unit: z.string().trim().max(24).optional(),
  dateOrder: z.enum(DATE_ORDERS).default('ymd'),
  mapping: z.record(z.string().max(64), z.string().max(200)).default({}),
});
export type ImportRemap = z.infer<typeof importRemapSchema>;

export const importCommitSchema = z.object({ confirmDuplicate: z.boolean().default(false) });

export const importTemplateQuerySchema = z.object({ kind: z.enum(IMPORT_KINDS, { error: `kind is one of ${IMPORT_KINDS.join(', ')}` }) });

export const IMPORT_STATUSES = ['mapping', 'validating', 'ready', 'invalid', 'queued', 'running', 'done', 'failed', 'cancelled'] as const;
export type ImportStatus = (typeof IMPORT_STATUSES)[number];

export interface ImportRowError {
  /** Line of the file (1 = the header), as a spreadsheet numbers it. */
  row: number;
  column: string;
  value: string;
  reason: string;
}

export const EXPORT_TABLES = [
  'usage_reports',
  'readings',
  'sources',
  'wards',
  'therapy_lines',
  'deliveries',
  'flow_meter_readings',
  'usage_history',
  'imports',
] as const;
export type ExportTable = (typeof EXPORT_TABLES)[number];
export const exportQuerySchema = z.object({ table: z.enum(EXPORT_TABLES, { error: `table is one of ${EXPORT_TABLES.join(', ')}` }) });

// ---------- reconciliation ----------

export const reconciliationQuerySchema = z.object({
  days: z.coerce.number().int().min(7, 'at least 7 days').max(365).default(28),
});

// ---------- responses: daily usage reports (what the server sends; the browser reads the same types) ----------

/** A filed report of one ward and local date. */
export interface UsageReportView {
  id: number;
  wardId: number;
  siteId: number;
  date: string;
  devices: UsageDeviceLine[];
  cylinders: UsageCylinderLine[];
  note: string;
  submittedAt: string;
  submittedBy: string | null;
  updatedAt: string;
  updatedBy: string | null;
}

/** Whether the caller may still change a report, until when, and why not. */
export interface UsageEditRule {
  canEdit: boolean;
  editableUntil: string;
  reason: string | null;
}

export type FiledReport = UsageReportView & UsageEditRule;

/** What the report screen needs for one ward and local date. */
export interface ReportScreenData {
  ward: WardView;
  site: { id: number; name: string; timeZone: string; referenceCode: string };
  date: string;
  today: string;
  report: FiledReport | null;
  draft: { date: string; devices: UsageDeviceLine[]; cylinders: UsageCylinderLine[]; note: string; prefilledFrom: string | null } | null;
  previous: UsageReportView | null;
  canCreate: boolean;
  createRule: string | null;
  devices: { device: UsageDeviceLine['device']; label: string; flowLMin: number; modelPatients: number }[];
  cylinderTypes: { id: number; gasCode: string; name: string; freeGasL: number | null }[];
  recent: { id: number; date: string; patientsNow: number; cylindersUsed: number; submittedBy: string | null; submittedAt: string }[];
  editWindowHours: number;
}

/** One report with its ward and its change history (from the audit log). */
export interface UsageReportDetail extends FiledReport {
  ward: WardView;
  history: { at: string; action: string; userEmail: string | null }[];
}

/** Which wards of a site have filed their report for a local date. */
export interface UsageStatus {
  site: { id: number; name: string; timeZone: string };
  date: string;
  reminderLocalTime: string;
  wards: { wardId: number; name: string; department: string; reportId: number | null; submittedAt: string | null; submittedBy: string | null }[];
}

// ---------- responses: reconciliation of measured and modelled use ----------

export interface WeekTotal {
  /** ISO week, yyyy-Www. */
  week: string;
  total: number;
  days: number;
  perDay: number;
}

/** One local day of a source: measured and modelled use in litres of free gas, over `hours` of the day. */
export interface DayPoint {
  date: string;
  measuredL: number;
  modelledL: number;
  hours: number;
}

export interface SourceReconciliation {
  id: number;
  name: string;
  type: string;
  gasCode: string;
  modelledLPerDay: number;
  correctedLPerDay: number;
  measuredLPerDay: number | null;
  ratio: number | null;
  suggestedFactor: number | null;
  acceptedFactor: number;
  forecastBasis: 'model' | 'measured' | 'scaled';
  dailyCv: number | null;
  demandCv: { cv: number; measured: boolean; days: number };
  readings: number;
  spanHours: number;
  refills: { at: string; delivered: number; unit: string }[];
  daily: DayPoint[];
  weekly: WeekTotal[];
  wardsFed: { id: number; name: string }[];
  note: string | null;
}

export interface WardReconciliation {
  id: number;
  name: string;
  department: string;
  modelledLPerDay: number;
  measuredLPerDay: number | null;
  /** Which measurement `measuredLPerDay` comes from (flow meter, historic usage, reported patients). */
  basis: string | null;
  ratio: number | null;
  suggestedFactor: number | null;
  reports: number;
  reportedLPerDay: number | null;
  meterLPerDay: number | null;
  historyLPerDay: number | null;
  devices: { device: string; label: string; modelPatients: number; reportedMeanNow: number | null; reportedMaxShift: number | null }[];
  cylinders: { gasCode: string; cylinders: number; litres: number }[];
  /** Oxygen of the cylinders reported used, litres of free gas per week. */
  cylinderWeekly: WeekTotal[];
  weekly: WeekTotal[];
  daily: { date: string; modelledL: number; reportedL: number | null; meterL: number | null; historyL: number | null }[];
  primarySource: { id: number; name: string } | null;
}

export interface SiteReconciliation {
  site: { id: number; name: string; timeZone: string; referenceCode: string };
  from: string;
  to: string;
  days: number;
  caution: string;
  method: string[];
  sources: SourceReconciliation[];
  wards: WardReconciliation[];
}

export interface SourceReconciliationDetail {
  site: { id: number; name: string; timeZone: string };
  days: number;
  caution: string;
  source: SourceReconciliation;
  corrections: { at: string; by: string | null; factor: number; basis: string; previousFactor: number | null }[];
}

// ---------- responses: uploads ----------

/** One checked row as the upload's preview shows it (times in site time, values in words). */
export interface ImportPreviewRow {
  row: number;
  time: string;
  target?: string;
  reading: string;
  contents: string | null;
}

/** An upload job: its file, mapping, progress, errors and what the caller may do next. */
export interface ImportJobView {
  id: number;
  siteId: number;
  kind: ImportKind;
  kindLabel: string;
  status: ImportStatus;
  phase: 'check' | 'import' | null;
  file: { name: string; sizeBytes: number; sha256: string; lines: number } | null;
  options: {
    sourceId: number | null;
    wardId: number | null;
    unit: string | null;
    headerUnit: string | null;
    dateOrder: (typeof DATE_ORDERS)[number];
    separator: ',' | ';';
  };
  mapping: Record<string, string>;
  columns: readonly ImportColumn[];
  header: string[];
  sample: string[][];
  totalRows: number | null;
  processedRows: number;
  insertedRows: number;
  progress: number;
  errorCount: number;
  errors: ImportRowError[];
  preview: {
    rows: ImportPreviewRow[];
    firstAt: string | null;
    lastAt: string | null;
    targets: { id: number; name: string; rows: number }[];
    checkedUpToId?: number;
  } | null;
  message: string;
  cancelRequested: boolean;
  confirmDuplicate: boolean;
  canCommit: boolean;
  canCancel: boolean;
  canRemap: boolean;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

/** What can be uploaded: the size limit and each kind's columns. */
export interface ImportKinds {
  maxMb: number;
  kinds: { kind: ImportKind; label: string; columns: readonly ImportColumn[] }[];
}
