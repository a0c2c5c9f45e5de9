import { z } from 'zod';
import { GAS_CODES_CATALOGUE } from './admin.schema';

/** Request schemas of supply sources, wards, readings, the demand model, scenarios and deliveries. */

export const DEPARTMENTS = ['ward', 'critical_care', 'theatre', 'emergency', 'recovery', 'maternity', 'day_unit', 'other'] as const;
export const SOURCE_TYPES = ['bulk_liquid', 'manifold', 'cylinder_store', 'emergency_reserve'] as const;
export type SourceType = (typeof SOURCE_TYPES)[number];
export const REORDER_MODES = ['none', 'days', 'percent', 'amount'] as const;
export const FORECAST_BASES = ['model', 'measured', 'scaled'] as const;
export const FEED_ROLES = ['primary', 'secondary', 'reserve'] as const;
export const THERAPY_DEVICES = ['nasal_cannula', 'simple_mask', 'non_rebreather', 'venturi_35', 'hfno', 'cpap', 'ventilator', 'theatre', 'custom'] as const;
export const READING_METHODS = ['manual', 'telemetry', 'delivery_note', 'import'] as const;

/** A number whose type error names the field; range errors keep their own (or zod's) wording. */
const num = (what: string) => z.number({ error: (issue) => (issue.code === 'invalid_type' ? `${what} must be a number` : undefined) });
const gasCode = z.enum(GAS_CODES_CATALOGUE, { error: 'choose a gas' });
const LOCAL_RE = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/;
export const localTimeSchema = z.string().regex(LOCAL_RE, 'use a local date and time, yyyy-MM-ddTHH:mm');

export const wardSchema = z.object({
  name: z.string().trim().min(1, 'required').max(120),
  department: z.enum(DEPARTMENTS),
  beds: num('beds').int('whole beds').min(0).max(2000),
  leakagePercent: num('leakage').min(0, 'must be ≥ 0 %').max(50, 'above 50 %? check the pressure-decay test').default(0),
  active: z.boolean().default(true),
});
export type WardInput = z.infer<typeof wardSchema>;

export const calibrationPointSchema = z.object({ reading: num('reading'), kg: num('kg').min(0) });

export const sourceSchema = z
  .object({
    name: z.string().trim().min(1, 'required').max(120),
    type: z.enum(SOURCE_TYPES),
    gasCode,
    supplierId: z.number().int().positive().nullable().default(null),
    capacityKg: num('capacity').positive('must be above 0').max(200_000).nullable().default(null),
    evaporationPercentPerDay: num('evaporation').min(0).max(10, 'above 10 %/day is not a working tank').nullable().default(null),
    /** Bulk liquid: working pressure of the tank, bar(g); empty = 7 bar g (the usual UK relief setting). */
    operatingPressureBar: num('operating pressure').min(0, 'must be ≥ 0 bar g').max(45, 'above 45 bar g is not a liquid tank').nullable().default(null),
    vaporiserM3H: num('vaporiser rating').positive().max(10_000).nullable().default(null),
    vaporiserDerating: num('derating').gt(0, 'between 0 and 1').max(1, 'between 0 and 1').nullable().default(null),
    minLevelAlarmPercent: num('alarm level').min(0).max(100).nullable().default(null),
    reservePercent: num('reserve').min(0).max(100).nullable().default(null),
    calibration: z.array(calibrationPointSchema).max(500).nullable().default(null),
    calibrationUnit: z.string().trim().max(24).nullable().default(null),
    cylinderTypeId: z.number().int().positive().nullable().default(null),
    cylindersPerBank: num('cylinders per bank').int().min(1).max(100).nullable().default(null),
    regulatorLMin: num('regulator capacity').positive().max(100_000).nullable().default(null),
    changeoverGaugeBar: num('changeover pressure').min(0).max(300).nullable().default(null),
    temperatureC: num('temperature').min(-40).max(50).nullable().default(null),
    backsUp: z.array(z.number().int().positive()).max(50).default([]),
    reorderMode: z.enum(REORDER_MODES).default('none'),
    reorderLevel: num('reorder level').min(0).nullable().default(null),
    orderUpTo: num('order-up-to').positive().nullable().default(null),
    leadTimeHours: num('lead time')
      .int()
      .min(0)
      .max(24 * 60)
      .nullable()
      .default(null),
    forecastBasis: z.enum(FORECAST_BASES).default('model'),
    notes: z.string().trim().max(1000).default(''),
    active: z.boolean().default(true),
  })
  .superRefine((s, ctx) => {
    const need = (key: keyof typeof s, message: string) => {
      if (s[key] === null || s[key] === undefined) ctx.addIssue({ code: 'custom', path: [key], message });
    };
    if (s.type === 'bulk_liquid') {
      need('capacityKg', 'a tank needs its capacity (kg)');
      need('evaporationPercentPerDay', 'enter the normal evaporation rate (% of capacity per day)');
      if (s.gasCode === 'N2O_O2_50' || s.gasCode.startsWith('HE_O2'))
        ctx.addIssue({ code: 'custom', path: ['gasCode'], message: 'mixtures are not held as bulk liquid' });
    } else {
      need('cylinderTypeId', 'choose the cylinder type');
    }
    if (s.type === 'manifold') need('cylindersPerBank', 'how many cylinders in each bank?');
    if (s.reorderMode !== 'none') {
      need('reorderLevel', 'enter the reorder level');
      need('orderUpTo', 'enter the order-up-to level');
      if (s.reorderMode === 'percent' && s.reorderLevel !== null && s.reorderLevel > 100)
        ctx.addIssue({ code: 'custom', path: ['reorderLevel'], message: 'a percentage is at most 100' });
      if (s.reorderMode === 'amount' && s.reorderLevel !== null && s.orderUpTo !== null && s.reorderLevel >= s.orderUpTo)
        ctx.addIssue({ code: 'custom', path: ['reorderLevel'], message: 'must be below the order-up-to level' });
    }
    if (s.type === 'bulk_liquid' && s.orderUpTo !== null && s.capacityKg !== null && s.orderUpTo > s.capacityKg)
      ctx.addIssue({ code: 'custom', path: ['orderUpTo'], message: 'cannot exceed the capacity' });
    if (s.calibration) {
      for (let i = 1; i < s.calibration.length; i++) {
        if (!(s.calibration[i].reading > s.calibration[i - 1].reading))
          ctx.addIssue({ code: 'custom', path: ['calibration', i, 'reading'], message: 'readings must rise down the table' });
      }
    }
  });
export type SourceInput = z.infer<typeof sourceSchema>;

const takenAt = z.iso.datetime({ offset: true, error: 'use an ISO date-time with offset, e.g. 2027-01-04T08:30:00Z' });

export const readingSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({ kind: z.literal('level_percent'), value: num('level').min(0, '0–100 %').max(100, '0–100 %') }),
    z.object({ kind: z.literal('kg'), value: num('mass').min(0) }),
    z.object({ kind: z.literal('litres_liquid'), value: num('litres of liquid').min(0) }),
    z.object({ kind: z.literal('calibration'), value: num('gauge reading') }),
    z.object({
      kind: z.literal('bank_gauges'),
      dutyBar: num('duty bank gauge').min(0).max(350),
      standbyBar: num('standby bank gauge').min(0).max(350),
      spareFull: num('spare cylinders').int().min(0).max(1000).default(0),
    }),
    z.object({
      kind: z.literal('store_count'),
      full: num('full cylinders').int().min(0).max(100_000),
      inUseGaugeBar: z.array(num('gauge').min(0).max(350)).max(1000).default([]),
      inUseNetKg: z.array(num('net weight').min(0).max(1000)).max(1000).default([]),
      empty: num('empty cylinders').int().min(0).max(100_000).default(0),
    }),
  ],
  { error: 'choose how the reading was taken' },
);

export const readingInputSchema = z.intersection(
  readingSchema,
  z.object({
    takenAt,
    method: z.enum(READING_METHODS).default('manual'),
    note: z.string().trim().max(500).default(''),
  }),
);
export type ReadingInput = z.infer<typeof readingInputSchema>;

const hoursList = z.array(num('hour').int().min(0, 'local hour 0–23').max(23, 'local hour 0–23')).max(24).nullable().default(null);
const weekdayList = z.array(num('weekday').int().min(1, 'ISO weekday 1–7').max(7, 'ISO weekday 1–7')).max(7).nullable().default(null);

export const therapyLineSchema = z
  .object({
    gasCode,
    device: z.enum(THERAPY_DEVICES),
    patients: num('patients').min(0).max(1000),
    flowLMin: num('flow').min(0, 'flow must be ≥ 0').max(1000).nullable().default(null),
    hours: hoursList,
    weekdays: weekdayList,
    label: z.string().trim().max(120).default(''),
  })
  .superRefine((t, ctx) => {
    if ((t.device === 'custom' || t.device === 'theatre') && t.flowLMin === null)
      ctx.addIssue({ code: 'custom', path: ['flowLMin'], message: 'enter the flow for this line' });
  });
export const therapyLinesSchema = z.object({ lines: z.array(therapyLineSchema).max(200) });
export type TherapyLineInput = z.infer<typeof therapyLineSchema>;

export const wardFeedsSchema = z.object({
  feeds: z.array(z.object({ sourceId: z.number().int().positive(), gasCode, role: z.enum(FEED_ROLES) })).max(50),
});

export const scenarioSchema = z
  .object({
    name: z.string().trim().min(1, 'required').max(120),
    multiplier: num('multiplier').min(0).max(10).default(1),
    extraPatients: num('extra patients').min(0).max(1000).default(0),
    extraFlowLMin: num('flow per extra patient').min(0).max(200).default(0),
    wardId: z.number().int().positive().nullable().default(null),
    wardChange: z.enum(['open', 'close']).nullable().default(null),
    fromLocal: localTimeSchema,
    untilLocal: localTimeSchema.nullable().default(null),
    note: z.string().trim().max(500).default(''),
  })
  .superRefine((s, ctx) => {
    if (s.untilLocal && s.untilLocal <= s.fromLocal) ctx.addIssue({ code: 'custom', path: ['untilLocal'], message: 'must be after the start' });
    if (s.wardChange && !s.wardId) ctx.addIssue({ code: 'custom', path: ['wardId'], message: 'choose the ward that opens or closes' });
    if (s.extraPatients > 0 && s.extraFlowLMin === 0) ctx.addIssue({ code: 'custom', path: ['extraFlowLMin'], message: 'enter the flow per extra patient' });
  });
export type ScenarioInput = z.infer<typeof scenarioSchema>;

export const deliverySchema = z
  .object({
    dueAt: takenAt,
    kg: num('kg').positive().max(200_000).nullable().default(null),
    cylinders: num('cylinders').int().positive().max(10_000).nullable().default(null),
    reference: z.string().trim().max(120).default(''),
  })
  .refine((d) => (d.kg === null) !== (d.cylinders === null), { path: ['kg'], message: 'give kg (bulk) or cylinders, not both' });
export type DeliveryInput = z.infer<typeof deliverySchema>;

export const deviceFlowsSchema = z.object({
  flows: z.array(z.object({ device: z.enum(THERAPY_DEVICES), flowLMin: num('flow').min(0).max(200) })).max(20),
});

export const forecastQuerySchema = z.object({
  scenario: z.coerce.number().int().positive().optional(),
  draws: z.coerce.number().int().min(0).max(1000).default(200),
  horizonDays: z.coerce.number().int().min(1).max(365).default(90),
});

// ---------- responses (what the server's supply presenters send; the browser reads the same types) ----------

export const READING_KINDS = ['level_percent', 'kg', 'litres_liquid', 'calibration', 'bank_gauges', 'store_count'] as const;
export type ReadingKind = (typeof READING_KINDS)[number];
export type ReorderMode = (typeof REORDER_MODES)[number];
export type ForecastBasis = (typeof FORECAST_BASES)[number];
export type FeedRole = (typeof FEED_ROLES)[number];
export type Department = (typeof DEPARTMENTS)[number];
export type TherapyDevice = (typeof THERAPY_DEVICES)[number];
export type ReadingMethod = (typeof READING_METHODS)[number];

/** A supply source as the server presents it (the fields of sourceSchema plus its ids). */
export interface SourceView {
  id: number;
  siteId: number;
  name: string;
  type: SourceType;
  gasCode: string;
  supplierId: number | null;
  capacityKg: number | null;
  evaporationPercentPerDay: number | null;
  vaporiserM3H: number | null;
  vaporiserDerating: number | null;
  minLevelAlarmPercent: number | null;
  reservePercent: number | null;
  calibration: { reading: number; kg: number }[] | null;
  calibrationUnit: string | null;
  cylinderTypeId: number | null;
  cylindersPerBank: number | null;
  regulatorLMin: number | null;
  changeoverGaugeBar: number | null;
  /** Bulk liquid: working pressure, bar(g); null = the 7 bar g default. */
  operatingPressureBar?: number | null;
  temperatureC: number | null;
  backsUp: number[];
  reorderMode: ReorderMode;
  reorderLevel: number | null;
  orderUpTo: number | null;
  leadTimeHours: number | null;
  forecastBasis: ForecastBasis;
  modelCorrectionFactor: number;
  notes: string;
  active: boolean;
}

/** A reading of a source; `contents` in the source's unit (kg for a tank, litres of free gas for cylinders). */
export interface ReadingView {
  id: string;
  takenAt: string;
  kind: ReadingKind;
  value: number | null;
  detail: { dutyBar?: number; standbyBar?: number; spareFull?: number; full?: number; inUseGaugeBar?: number[]; empty?: number } | null;
  contents: number;
  method: ReadingMethod;
  takenByUserId: number | null;
  takenByName: string | null;
  note: string;
}

export interface ReadingPage {
  items: ReadingView[];
  total: number;
  page: number;
  pageSize: number;
}

export interface WardView {
  id: number;
  siteId: number;
  name: string;
  department: Department;
  beds: number;
  leakagePercent: number;
  active: boolean;
}

export interface ScenarioView {
  id: number;
  siteId: number;
  name: string;
  multiplier: number;
  extraPatients: number;
  extraFlowLMin: number;
  wardId: number | null;
  wardChange: 'open' | 'close' | null;
  fromLocal: string;
  untilLocal: string | null;
  note: string;
}

export interface TherapyLineView {
  id: number;
  gasCode: string;
  device: TherapyDevice;
  patients: number;
  flowLMin: number | null;
  hours: number[] | null;
  weekdays: number[] | null;
  label: string;
}

export interface DeliveryView {
  id: number;
  sourceId: number;
  dueAt: string;
  kg: number | null;
  cylinders: number | null;
  status: string;
  reference: string;
}

/** A device's flow: the documented default and the organisation's own, when it set one. */
export interface DeviceFlowView {
  device: TherapyDevice;
  label: string;
  defaultFlowLMin: number;
  rangeLMin: readonly [number, number];
  source: string;
  flowLMin: number;
  edited: boolean;
}
