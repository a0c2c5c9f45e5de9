/**
 * Responses of the audit module: one row of the organisation's audit log. Secrets are scrubbed from
 * `before` and `after` on the way in.
 */
export interface AuditRow {
  id: string;
  at: string;
  userEmail: string | null;
  action: string;
  entity: string;
  entityId: string | null;
  before: unknown;
  after: unknown;
}
