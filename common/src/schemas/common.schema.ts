import { z } from 'zod';

/** Query string of every list endpoint: server-side paging, sorting and a free-text filter. */
export const listQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sort: z.string().max(64).optional(),
  dir: z.enum(['asc', 'desc']).default('asc'),
  q: z.string().max(200).optional(),
});
export type ListQuery = z.infer<typeof listQuerySchema>;

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

export const idParamSchema = z.object({ id: z.coerce.number().int().positive('must be a positive whole number') });

/** IANA time-zone name, checked against the runtime's time-zone database. */
export const timeZoneSchema = z
  .string()
  .min(1, 'required')
  .refine((tz) => {
    try {
      new Intl.DateTimeFormat('en-GB', { timeZone: tz });
      return true;
    } catch {
      return false;
    }
  }, 'unknown time zone (use an IANA name such as Europe/London)');

export const currencySchema = z.string().regex(/^[A-Z]{3}$/, 'use a three-letter ISO 4217 code such as GBP or EUR');

export const emailSchema = z.string().trim().toLowerCase().email('enter a valid e-mail address').max(190);
