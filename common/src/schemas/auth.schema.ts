import { z } from 'zod';
import { ROLES } from '../api/roles';

export const loginSchema = z.object({
  email: z.string().trim().toLowerCase().min(1, 'enter your e-mail address').max(190),
  password: z.string().min(1, 'enter your password').max(200),
});
export type LoginInput = z.infer<typeof loginSchema>;

/** Passwords: at least 10 characters (length beats composition rules). */
export const newPasswordSchema = z.string().min(10, 'use at least 10 characters').max(200, 'use at most 200 characters');

export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, 'enter your current password'),
    newPassword: newPasswordSchema,
  })
  .refine((v) => v.currentPassword !== v.newPassword, { path: ['newPassword'], message: 'choose a password different from the current one' });
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

export const roleSchema = z.enum(ROLES);

export interface MeSite {
  id: number;
  name: string;
  kind: string;
  timeZone: string;
  referenceCode: string;
  unitSystem: string;
  cylinderColours: string;
  storeTemperatureC: number;
  atmosphericBar: number;
  currency: string;
}

export interface Me {
  user: { id: number; email: string; name: string; roles: z.infer<typeof roleSchema>[] };
  organisation: { id: number; name: string };
  sites: MeSite[];
}
