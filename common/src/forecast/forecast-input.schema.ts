import { z } from 'zod';
import { GAS_CODES, type GasCode } from '../gas/gases';
import { isPremixedMixture } from '../gas/mixture-cautions';
import { REFERENCE_CONDITIONS, type ReferenceCode } from '../gas/reference-conditions';
import { MAX_HORIZON_DAYS, isValidTimeZone, resolveLocalTimeUtcMs } from './hour-index';
import { DEFAULT_DEMAND_PERSISTENCE, MAX_DEMAND_PERSISTENCE, MAX_DRAWS } from './monte-carlo';

/**
 * The forecast request: one schema for the calc verb, the API and the form (types via z.infer).
 * Local times are wall-clock strings in `timezone`; flows are free gas at `reference`.
 */

const LOCAL_TIME_RE = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/;
const localTime = z.string().regex(LOCAL_TIME_RE, { error: 'expected a local wall-clock time yyyy-MM-ddTHH:mm' });
const gas = z.enum(GAS_CODES as [GasCode, ...GasCode[]], { error: `unknown gas; expected one of ${GAS_CODES.join(', ')}` });
const referenceCodes = Object.keys(REFERENCE_CONDITIONS) as [ReferenceCode, ...ReferenceCode[]];
const numberOf = (what: string) => z.number({ error: (iss) => (iss.input === undefined ? `${what} is required` : `${what} must be a number`) });
const nonNegative = (what: string) => numberOf(what).min(0, { error: `${what} must be ≥ 0` });
const positive = (what: string) => numberOf(what).gt(0, { error: `${what} must be > 0` });
const wholeCount = (what: string) =>
  numberOf(what)
    .int({ error: `${what} must be a whole number` })
    .min(0, { error: `${what} must be ≥ 0` })
    .max(1e6, { error: `${what} must be at most 1,000,000` });
/**
 * Upper bounds of physically meaningful inputs (beyond them the arithmetic overflows or gives absurd
 * figures): a flow line up to 1,000,000 L/min, a tank or delivery up to 1,000,000 kg (the largest
 * standard bulk tank holds about 86 t of liquid oxygen), a cylinder up to 5,000 L of water capacity and
 * 350 bar, counts up to 1,000,000. Common practice, not a standard.
 */
const MAX_FLOW = 1e6;
const MAX_KG = 1e6;
const MAX_COUNT = 1e6;
const atMost = (schema: z.ZodNumber, max: number, what: string) => schema.max(max, { error: `${what} must be at most ${max.toLocaleString('en-GB')}` });

export const demandLineSchema = z.object({
  flow_L_min: atMost(nonNegative('flow_L_min (L/min of free gas)'), MAX_FLOW, 'flow_L_min'),
  hours: z
    .array(
      z
        .number()
        .int({ error: 'hour must be a whole number' })
        .min(0, { error: 'local clock hour must be 0–23' })
        .max(23, { error: 'local clock hour must be 0–23' }),
    )
    .optional(),
  weekdays: z
    .array(
      z
        .number()
        .int({ error: 'weekday must be a whole number' })
        .min(1, { error: 'ISO weekday must be 1 (Monday) – 7 (Sunday)' })
        .max(7, { error: 'ISO weekday must be 1 (Monday) – 7 (Sunday)' }),
    )
    .optional(),
  from: localTime.optional(),
  until: localTime.optional(),
  label: z.string().max(200).optional(),
});

export const demandScenarioSchema = z.object({
  name: z.string().max(200).optional(),
  from: localTime.optional(),
  until: localTime.optional(),
  multiplier: atMost(nonNegative('multiplier'), 1000, 'multiplier').optional(),
  extra_lines: z.array(demandLineSchema).optional(),
});

/** Reorder level as days of stock (mean daily loss of the first 7 days) or % of capacity / order-up-to. */
const relativeReorder = {
  reorder_level_days: nonNegative('reorder_level_days').optional(),
  reorder_level_percent: nonNegative('reorder_level_percent').max(100, { error: 'reorder_level_percent must be ≤ 100' }).optional(),
};

export const bulkLiquidSourceSchema = z
  .object({
    type: z.literal('bulk_liquid'),
    gas,
    capacity_kg: atMost(positive('capacity_kg'), MAX_KG, 'capacity_kg'),
    contents_kg: atMost(nonNegative('contents_kg'), MAX_KG, 'contents_kg'),
    evaporation_percent_per_day: nonNegative('evaporation_percent_per_day').max(100, { error: 'evaporation_percent_per_day must be ≤ 100' }).default(0),
    reorder_level_kg: atMost(nonNegative('reorder_level_kg'), MAX_KG, 'reorder_level_kg').optional(),
    ...relativeReorder,
    order_up_to_kg: atMost(positive('order_up_to_kg'), MAX_KG, 'order_up_to_kg').optional(),
    lead_time_hours: nonNegative('lead_time_hours')
      .max(24 * 366, { error: 'lead_time_hours must be ≤ one year' })
      .default(0),
    reserve_kg: atMost(nonNegative('reserve_kg'), MAX_KG, 'reserve_kg').optional(),
  })
  .superRefine((s, ctx) => {
    // a premixed gas cannot be stored as one liquid: its components boil off at different rates
    if (isPremixedMixture(s.gas))
      ctx.addIssue({ code: 'custom', path: ['gas'], message: 'mixtures (50:50 N2O/O2, heliox) are not held as bulk liquid: use cylinders or a manifold' });
    if (s.contents_kg > s.capacity_kg)
      ctx.addIssue({ code: 'custom', path: ['contents_kg'], message: `contents ${s.contents_kg} kg are above the capacity ${s.capacity_kg} kg` });
    checkReorderFields(ctx, s.reorder_level_kg, s.reorder_level_days, s.reorder_level_percent, 'reorder_level_kg');
    const upTo = s.order_up_to_kg ?? s.capacity_kg;
    if (s.reorder_level_kg !== undefined && s.reorder_level_kg >= Math.min(upTo, s.capacity_kg)) {
      ctx.addIssue({ code: 'custom', path: ['reorder_level_kg'], message: 'the reorder level must be below the order-up-to level and the capacity' });
    }
  });

const cylinderFields = {
  gas,
  water_capacity_L: atMost(positive('water_capacity_L').min(0.01, { error: 'water_capacity_L must be at least 0.01 L' }), 5000, 'water_capacity_L'),
  fill_gauge_bar: atMost(positive('fill_gauge_bar'), 350, 'fill_gauge_bar'),
  fill_temperature_C: z.number({ error: 'fill_temperature_C must be a number' }).default(15),
  /** Temperature of the in-use cylinders when read; defaults to fill_temperature_C. */
  in_use_temperature_C: z.number().optional(),
  reorder_level_cylinders: atMost(nonNegative('reorder_level_cylinders'), MAX_COUNT, 'reorder_level_cylinders').optional(),
  ...relativeReorder,
  order_up_to_cylinders: atMost(positive('order_up_to_cylinders'), MAX_COUNT, 'order_up_to_cylinders').optional(),
  lead_time_hours: nonNegative('lead_time_hours')
    .max(24 * 366, { error: 'lead_time_hours must be ≤ one year' })
    .default(0),
  reserve_cylinders: atMost(nonNegative('reserve_cylinders'), MAX_COUNT, 'reserve_cylinders').optional(),
  /**
   * CO2 and N2O (liquefied): net gas of one full cylinder, kg (their gauge shows the vapour pressure,
   * not the contents, so a full cylinder is known by its filling mass, not by fill_gauge_bar).
   */
  fill_kg: positive('fill_kg').max(1000, { error: 'fill_kg must be ≤ 1000 kg' }).optional(),
};

function checkReorderFields(ctx: z.RefinementCtx, absolute: number | undefined, days: number | undefined, percent: number | undefined, absPath: string): void {
  const given = [absolute, days, percent].filter((v) => v !== undefined).length;
  if (given > 1) ctx.addIssue({ code: 'custom', path: [absPath], message: `give one of ${absPath}, reorder_level_days, reorder_level_percent` });
}

function checkCylinderReorder(
  ctx: z.RefinementCtx,
  s: { reorder_level_cylinders?: number; reorder_level_days?: number; reorder_level_percent?: number; order_up_to_cylinders?: number },
): void {
  checkReorderFields(ctx, s.reorder_level_cylinders, s.reorder_level_days, s.reorder_level_percent, 'reorder_level_cylinders');
  const hasLevel = s.reorder_level_cylinders !== undefined || s.reorder_level_days !== undefined || s.reorder_level_percent !== undefined;
  if (hasLevel && s.order_up_to_cylinders === undefined) {
    ctx.addIssue({ code: 'custom', path: ['order_up_to_cylinders'], message: 'a reorder rule needs order_up_to_cylinders' });
  }
  if (s.reorder_level_cylinders !== undefined && s.order_up_to_cylinders !== undefined && s.reorder_level_cylinders >= s.order_up_to_cylinders) {
    ctx.addIssue({ code: 'custom', path: ['reorder_level_cylinders'], message: 'the reorder level must be below order_up_to_cylinders' });
  }
}

export const cylinderSourceSchema = z
  .object({
    type: z.literal('cylinders'),
    ...cylinderFields,
    full: wholeCount('full'),
    /**
     * Gauge pressure at which a cylinder is changed (gas left behind), bar(g). Default: 10 % of
     * fill_gauge_bar (US EMS guidance keeps about 200 psi of a 2,000–2,200 psi fill; common practice).
     */
    residual_gauge_bar: atMost(nonNegative('residual_gauge_bar'), 350, 'residual_gauge_bar').optional(),
    in_use_gauge_bar: z
      .array(atMost(nonNegative('in-use gauge reading (bar)'), 350, 'in-use gauge reading (bar)'))
      .max(10_000)
      .default([]),
    /** CO2 and N2O: weighed net contents (gross − tare) of each part-used cylinder, kg. */
    in_use_net_kg: z.array(nonNegative('in-use net weight (kg)').max(1000, { error: 'in-use net weight must be ≤ 1000 kg' })).default([]),
  })
  .superRefine((s, ctx) => {
    checkCylinderReorder(ctx, s);
    if (s.residual_gauge_bar !== undefined && s.residual_gauge_bar >= s.fill_gauge_bar)
      ctx.addIssue({ code: 'custom', path: ['residual_gauge_bar'], message: 'must be below the fill pressure' });
  });

const bankGauge = atMost(nonNegative('gauge reading (bar)'), 350, 'gauge reading (bar)');
const bankReadings = z.union([bankGauge, z.array(bankGauge).min(1)]);

export const manifoldSourceSchema = z
  .object({
    type: z.literal('manifold'),
    ...cylinderFields,
    cylinders_per_bank: z.number().int({ error: 'cylinders_per_bank must be a whole number' }).min(1, { error: 'cylinders_per_bank must be ≥ 1' }).max(100),
    /** One reading per cylinder, or one reading for the whole bank. */
    duty_bank_gauge_bar: bankReadings,
    standby_bank_gauge_bar: bankReadings,
    /** Duty-bank gauge pressure at which the manifold changes over (gas left behind); 0 = drawn flat. */
    changeover_gauge_bar: atMost(nonNegative('changeover_gauge_bar'), 350, 'changeover_gauge_bar').default(0),
    spare_full: wholeCount('spare_full').default(0),
    bank_replacement_hours: atMost(nonNegative('bank_replacement_hours'), 24 * 366, 'bank_replacement_hours').default(0),
  })
  .superRefine((s, ctx) => {
    checkCylinderReorder(ctx, s);
    for (const key of ['duty_bank_gauge_bar', 'standby_bank_gauge_bar'] as const) {
      const v = s[key];
      if (Array.isArray(v) && v.length !== s.cylinders_per_bank) {
        ctx.addIssue({ code: 'custom', path: [key], message: `give one reading per cylinder (${s.cylinders_per_bank}) or one for the bank` });
      }
    }
    if (s.changeover_gauge_bar >= s.fill_gauge_bar)
      ctx.addIssue({ code: 'custom', path: ['changeover_gauge_bar'], message: 'must be below the fill pressure' });
  });

export const forecastSourceSchema = z.discriminatedUnion('type', [bulkLiquidSourceSchema, cylinderSourceSchema, manifoldSourceSchema], {
  error: 'source.type must be bulk_liquid, cylinders or manifold',
});

export const forecastDeliverySchema = z.object({
  at: localTime,
  kg: atMost(positive('kg'), MAX_KG, 'kg').optional(),
  cylinders: z
    .number()
    .int({ error: 'cylinders must be a whole number' })
    .gt(0, { error: 'cylinders must be > 0' })
    .max(MAX_COUNT, { error: 'cylinders must be at most 1,000,000' })
    .optional(),
});

export const forecastInputSchema = z
  .object({
    start: localTime,
    timezone: z
      .string({ error: 'timezone must be an IANA name' })
      .refine(isValidTimeZone, { error: 'unknown time zone (expected an IANA name such as Europe/London)' }),
    horizon_days: positive('horizon_days')
      .max(MAX_HORIZON_DAYS, { error: `horizon_days must be at most ${MAX_HORIZON_DAYS} (3 years)` })
      .default(90),
    reference: z.enum(referenceCodes, { error: `reference must be one of ${referenceCodes.join(', ')}` }).default('15C'),
    source: forecastSourceSchema,
    demand: z.array(demandLineSchema).default([]),
    scenarios: z.array(demandScenarioSchema).default([]),
    deliveries: z.array(forecastDeliverySchema).default([]),
    draws: z
      .number()
      .int({ error: 'draws must be a whole number' })
      .min(0, { error: 'draws must be ≥ 0' })
      .max(MAX_DRAWS, { error: `draws must be at most ${MAX_DRAWS}` })
      .default(0),
    demand_cv: nonNegative('demand_cv').max(5, { error: 'demand_cv must be ≤ 5' }).default(0.2),
    /** Day-to-day persistence φ of the Monte Carlo day multipliers (AR(1)); 0 = independent days. */
    demand_persistence: nonNegative('demand_persistence')
      .max(MAX_DEMAND_PERSISTENCE, { error: `demand_persistence must be ≤ ${MAX_DEMAND_PERSISTENCE}` })
      .default(DEFAULT_DEMAND_PERSISTENCE),
    seed: z.number().int({ error: 'seed must be a whole number' }).default(1),
  })
  .superRefine((v, ctx) => {
    if (!isValidTimeZone(v.timezone)) return;
    const startMs = resolveLocalTimeUtcMs(v.start, v.timezone);
    if (startMs === null) {
      ctx.addIssue({
        code: 'custom',
        path: ['start'],
        message: `not a valid local time in ${v.timezone} (a date that does not exist, or a time skipped by a clock change)`,
      });
      return;
    }
    v.deliveries.forEach((d, k) => {
      const at = resolveLocalTimeUtcMs(d.at, v.timezone);
      if (at === null) ctx.addIssue({ code: 'custom', path: ['deliveries', k, 'at'], message: `not a valid local time in ${v.timezone}` });
      else if (at < startMs)
        ctx.addIssue({ code: 'custom', path: ['deliveries', k, 'at'], message: 'delivery before the start (count it in the contents instead)' });
      const bulk = v.source.type === 'bulk_liquid';
      if (bulk && d.kg === undefined) ctx.addIssue({ code: 'custom', path: ['deliveries', k, 'kg'], message: 'a delivery to a bulk tank needs kg' });
      if (!bulk && d.cylinders === undefined)
        ctx.addIssue({ code: 'custom', path: ['deliveries', k, 'cylinders'], message: 'a delivery of cylinders needs cylinders' });
    });
    const lines: { l: z.infer<typeof demandLineSchema>; path: (string | number)[] }[] = v.demand.map((l, k) => ({ l, path: ['demand', k] }));
    v.scenarios.forEach((s, k) => {
      for (const key of ['from', 'until'] as const) {
        const t = s[key];
        if (t !== undefined && resolveLocalTimeUtcMs(t, v.timezone) === null)
          ctx.addIssue({ code: 'custom', path: ['scenarios', k, key], message: `not a valid local time in ${v.timezone}` });
      }
      s.extra_lines?.forEach((l, j) => lines.push({ l, path: ['scenarios', k, 'extra_lines', j] }));
    });
    for (const { l, path } of lines) {
      for (const key of ['from', 'until'] as const) {
        const t = l[key];
        if (t !== undefined && resolveLocalTimeUtcMs(t, v.timezone) === null)
          ctx.addIssue({ code: 'custom', path: [...path, key], message: `not a valid local time in ${v.timezone}` });
      }
    }
  });

export type ForecastInput = z.infer<typeof forecastInputSchema>;
export type ForecastSourceInput = z.infer<typeof forecastSourceSchema>;
export type BulkLiquidSourceInput = z.infer<typeof bulkLiquidSourceSchema>;
export type CylinderSourceInput = z.infer<typeof cylinderSourceSchema>;
export type ManifoldSourceInput = z.infer<typeof manifoldSourceSchema>;
