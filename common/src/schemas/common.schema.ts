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

/**
 * The list query of one list whose server sorts by exactly `sortKeys`: an unknown key (a prototype name
 * such as `__proto__` among them) is a 400 naming the keys, never a look-up that finds something else.
 */
export function listQuerySchemaWith<const K extends readonly [string, ...string[]]>(sortKeys: K) {
  return listQuerySchema.extend({ sort: z.enum(sortKeys, { error: `sort by one of ${sortKeys.join(', ')}` }).optional() });
}

/** The columns each server-sorted list sorts by (the front end's sortable column ids are the same). */
export const USER_SORT_KEYS = ['name', 'email', 'createdAt'] as const;
export const AUDIT_SORT_KEYS = ['at', 'action', 'entity', 'userEmail'] as const;
export const MAIL_SORT_KEYS = ['receivedAt', 'subject', 'to', 'from'] as const;
export const userListQuerySchema = listQuerySchemaWith(USER_SORT_KEYS);
export const auditListQuerySchema = listQuerySchemaWith(AUDIT_SORT_KEYS).extend({ entity: z.string().max(64).optional() });
export const mailListQuerySchema = listQuerySchemaWith(MAIL_SORT_KEYS);
export type UserListQuery = z.infer<typeof userListQuerySchema>;
export type AuditListQuery = z.infer<typeof auditListQuerySchema>;
export type MailListQuery = z.infer<typeof mailListQuerySchema>;

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
