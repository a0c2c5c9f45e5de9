import { z } from 'zod';
import { currencySchema, emailSchema, timeZoneSchema } from './common.schema';
import { newPasswordSchema, roleSchema } from './auth.schema';
import type { Role } from '../api/roles';
import type { NominalContents } from '../catalogue/cylinder-type';

export const REFERENCE_CODES = ['15C', '21C', '0C'] as const;
export const UNIT_SYSTEMS = ['metric', 'us'] as const;
export const COLOUR_CONVENTIONS = ['ISO32', 'CGA_C9'] as const;
export const SITE_KINDS = ['hospital', 'clinic', 'other'] as const;

export const siteSchema = z.object({
  name: z.string().trim().min(1, 'required').max(190),
  kind: z.enum(SITE_KINDS),
  address: z.string().trim().max(500).default(''),
  timeZone: timeZoneSchema,
  referenceCode: z.enum(REFERENCE_CODES),
  unitSystem: z.enum(UNIT_SYSTEMS),
  altitudeM: z.coerce.number().min(-500, 'below −500 m?').max(5000, 'above 5,000 m?'),
  /** Left empty: computed from altitude (standard atmosphere). */
  atmosphericBar: z.coerce.number().min(0.5).max(1.1).nullable().optional(),
  currency: currencySchema,
  cylinderColours: z.enum(COLOUR_CONVENTIONS),
  storeTemperatureC: z.coerce.number().min(-40, 'below −40 °C').max(50, 'above 50 °C'),
  beds: z.coerce.number().int().min(0).max(10000).default(0),
});
export type SiteInput = z.infer<typeof siteSchema>;

export const organisationSchema = z.object({ name: z.string().trim().min(1, 'required').max(190) });

export const userCreateSchema = z.object({
  email: emailSchema,
  name: z.string().trim().min(1, 'required').max(190),
  roles: z.array(roleSchema).min(1, 'give at least one role'),
  siteIds: z.array(z.number().int().positive()).default([]),
  password: newPasswordSchema,
});
export type UserCreateInput = z.infer<typeof userCreateSchema>;

export const userUpdateSchema = z.object({
  name: z.string().trim().min(1, 'required').max(190).optional(),
  roles: z.array(roleSchema).min(1, 'give at least one role').optional(),
  siteIds: z.array(z.number().int().positive()).optional(),
  active: z.boolean().optional(),
  password: newPasswordSchema.optional(),
});
export type UserUpdateInput = z.infer<typeof userUpdateSchema>;

export const GAS_CODES_CATALOGUE = ['O2', 'AIR', 'N2O', 'N2O_O2_50', 'CO2', 'HE', 'HE_O2_79', 'HE_O2_80', 'N2', 'AR'] as const;

export const cylinderTypeSchema = z
  .object({
    gasCode: z.enum(GAS_CODES_CATALOGUE),
    waterCapacityL: z.coerce.number().positive('must be above 0').max(150, 'above 150 L is not a cylinder'),
    fillPressureBar: z.coerce.number().positive('must be above 0').max(350, 'above 350 bar'),
    tareKg: z.coerce.number().positive().max(200).nullable().optional(),
    maxFillingRatioKgPerL: z.coerce.number().positive().max(1.5).nullable().optional(),
    /** Gauge pressure a cylinder is changed at, bar(g); empty = 10 % of the fill pressure (common practice). */
    residualGaugeBar: z.coerce.number().min(0, 'must be ≥ 0').max(350).nullable().optional(),
    material: z.string().trim().max(60).default(''),
    valveNotes: z.string().trim().max(300).default(''),
    active: z.boolean().default(true),
  })
  .superRefine((v, ctx) => {
    if ((v.gasCode === 'N2O' || v.gasCode === 'CO2') && (v.tareKg == null || v.tareKg <= 0)) {
      ctx.addIssue({ code: 'custom', path: ['tareKg'], message: 'liquefied gases are counted by weight: enter the tare' });
    }
    if (v.residualGaugeBar != null && v.residualGaugeBar >= v.fillPressureBar)
      ctx.addIssue({ code: 'custom', path: ['residualGaugeBar'], message: 'must be below the fill pressure' });
  });
export type CylinderTypeInput = z.infer<typeof cylinderTypeSchema>;

export const supplierPriceSchema = z
  .object({
    cylinderTypeId: z.number().int().positive().nullable().optional(),
    gasCode: z.enum(GAS_CODES_CATALOGUE).nullable().optional(),
    unit: z.enum(['cylinder', 'kg']),
    priceMinor: z
      .number({ error: 'enter the price' })
      .int('whole minor units (pence, cents)')
      .min(0, 'must be ≥ 0')
      .max(100_000_000, 'at most 100,000,000 minor units (1,000,000.00) a unit'),
  })
  .superRefine((v, ctx) => {
    if (v.unit === 'cylinder' && !v.cylinderTypeId) ctx.addIssue({ code: 'custom', path: ['cylinderTypeId'], message: 'choose the cylinder type' });
    if (v.unit === 'kg' && !v.gasCode) ctx.addIssue({ code: 'custom', path: ['gasCode'], message: 'choose the gas' });
  });

export const supplierSchema = z.object({
  name: z.string().trim().min(1, 'required').max(190),
  orderEmail: emailSchema,
  phone: z.string().trim().max(40).default(''),
  leadTimeHours: z.coerce
    .number()
    .int()
    .min(0)
    .max(24 * 60),
  rentalMinorPerCylinderDay: z.coerce
    .number()
    .int('whole minor units (pence, cents)')
    .min(0, 'must be ≥ 0')
    .max(1_000_000, 'at most 1,000,000 minor units (10,000.00) a cylinder-day')
    .default(0),
  minBulkDropKg: z.coerce.number().min(0).max(100_000).default(0),
  currency: currencySchema,
  active: z.boolean().default(true),
  prices: z.array(supplierPriceSchema).max(500).default([]),
});
export type SupplierInput = z.infer<typeof supplierSchema>;

/** The wards granted to a ward lead (the whole set: absent ids are revoked). */
export const userWardsSchema = z.object({
  wardIds: z.array(z.number({ error: 'choose wards from the list' }).int().positive()).max(1000, 'at most 1,000 wards'),
});
export type UserWardsInput = z.infer<typeof userWardsSchema>;

// ---------- responses: users (what the server sends; the browser reads the same types) ----------

/** A user of the organisation as the administration screens list it (never a password or its hash). */
export interface UserRow {
  id: number;
  email: string;
  name: string;
  active: boolean;
  roles: Role[];
  siteIds: number[];
  /** Locked by failed sign-ins until an administrator unlocks it or the lock runs out. */
  locked: boolean;
  createdAt: string;
}

// ---------- responses: organisation, sites and catalogue ----------

export interface OrganisationView {
  id: number;
  name: string;
}

export interface SiteView {
  id: number;
  name: string;
  kind: (typeof SITE_KINDS)[number];
  address: string;
  timeZone: string;
  referenceCode: (typeof REFERENCE_CODES)[number];
  unitSystem: (typeof UNIT_SYSTEMS)[number];
  altitudeM: number;
  atmosphericBar: number;
  currency: string;
  cylinderColours: (typeof COLOUR_CONVENTIONS)[number];
  storeTemperatureC: number;
  beds: number;
  updatedAt: string;
}

export interface GasView {
  code: string;
  name: string;
  state: 'compressed' | 'liquefied';
  iso32Colours: string[];
  cgaColours: string[];
}

export interface CylinderTypeView {
  id: number;
  name: string;
  gasCode: string;
  waterCapacityL: number;
  fillPressureBar: number;
  tareKg: number | null;
  maxFillingRatioKgPerL: number | null;
  /** Gauge pressure at which a cylinder of this type is changed (null: the stated default). */
  residualGaugeBar?: number | null;
  residual?: { gaugeBar: number; basis: string };
  material: string;
  valveNotes: string;
  active: boolean;
  /** Computed by the gas engine from the type (never typed in); null for a gas it does not model. */
  nominal: NominalContents | null;
}

export interface SupplierPriceView {
  id: number;
  cylinderTypeId: number | null;
  gasCode: string | null;
  unit: 'cylinder' | 'kg';
  priceMinor: number;
}

export interface SupplierView {
  id: number;
  name: string;
  orderEmail: string;
  phone: string;
  leadTimeHours: number;
  rentalMinorPerCylinderDay: number;
  minBulkDropKg: number;
  currency: string;
  active: boolean;
  prices: SupplierPriceView[];
}
