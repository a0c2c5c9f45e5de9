/** The five roles of Plenum. A user may hold several. */
export const ROLES = ['facilities_manager', 'ward_lead', 'purchasing_officer', 'biomedical_engineer', 'administrator'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  facilities_manager: 'Facilities manager',
  ward_lead: 'Ward lead',
  purchasing_officer: 'Purchasing officer',
  biomedical_engineer: 'Biomedical engineer',
  administrator: 'Administrator',
};

/** Header that carries the CSRF token on every state-changing request. */
export const CSRF_HEADER = 'x-csrf-token';

/** Sign-in policy: consecutive failures before a temporary lock (its length is configured on the server). */
export const LOGIN_MAX_FAILURES = 5;
/**
 * Whether ward lead is a person's only role: then they see only the wards an administrator granted
 * them; any other role reads every ward of their sites.
 */
export function wardLeadOnly(roles: readonly Role[]): boolean {
  return roles.length > 0 && roles.every((r) => r === 'ward_lead');
}
