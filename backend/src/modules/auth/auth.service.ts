import bcrypt from 'bcryptjs';
import { In } from 'typeorm';
import { LOGIN_LOCK_MINUTES, LOGIN_MAX_FAILURES, type Role } from '@common/api/roles';
import type { Me } from '@common/schemas/auth.schema';
import { db } from '../../db/db';
import { User, UserRole, UserSite } from '../../db/entities/user.entity';
import { Site } from '../../db/entities/site.entity';
import { Organisation } from '../../db/entities/organisation.entity';
import type { AuthUser } from '../../http/context';
import { AppError, badRequest, unauthorised } from '../../errors/app-error';
import { recordAudit } from '../audit/audit.service';

export const BCRYPT_COST = 11;
let dummyHash: string | undefined;

/** Why a sign-in failed; the message never says whether the e-mail exists. */
export class SignInError extends AppError {}

const INVALID = () => new SignInError(401, 'invalid_credentials', 'E-mail or password is not right');

function lockedError(until: Date, now: Date): SignInError {
  const minutes = Math.max(1, Math.ceil((until.getTime() - now.getTime()) / 60000));
  return new SignInError(423, 'account_locked', `Too many failed sign-ins: this account is locked for ${minutes} more minute${minutes === 1 ? '' : 's'}. An administrator can unlock it.`);
}

/**
 * Checks an e-mail and password. Counts consecutive failures and locks the account for
 * LOGIN_LOCK_MINUTES after LOGIN_MAX_FAILURES; a locked account is refused before the password is checked.
 * The count is kept in the database under a row lock (SELECT … FOR UPDATE), so parallel guesses are counted
 * one after another and the lock is decided from the stored value, never from a copy read earlier.
 */
export async function verifyCredentials(email: string, password: string): Promise<AuthUser> {
  const repo = db().getRepository(User);
  const user = await repo.findOne({ where: { email: email.trim().toLowerCase() } });
  if (!user || !user.active) {
    // Spend the same time as a real check, so timing does not reveal which e-mails exist.
    dummyHash ??= await bcrypt.hash('no-such-user-password', BCRYPT_COST);
    await bcrypt.compare(password, dummyHash);
    throw INVALID();
  }
  const now = new Date();
  if (user.lockedUntil && user.lockedUntil > now) throw lockedError(user.lockedUntil, now);
  const ok = await bcrypt.compare(password, user.passwordHash);
  const outcome = await db().transaction(async (m) => {
    const at = new Date();
    const [row] = (await m.query('SELECT failed_logins, locked_until FROM app_user WHERE id = ? FOR UPDATE', [user.id])) as { failed_logins: number; locked_until: Date | null }[];
    if (!row) return { status: 'invalid' as const };
    // Locked meanwhile by parallel guesses: every answer, the right password's too, waits for the lock.
    if (row.locked_until && new Date(row.locked_until) > at) return { status: 'locked' as const, until: new Date(row.locked_until), at };
    if (ok) {
      if (Number(row.failed_logins) > 0 || row.locked_until) await m.query('UPDATE app_user SET failed_logins = 0, locked_until = NULL WHERE id = ?', [user.id]);
      return { status: 'ok' as const };
    }
    const failures = Number(row.failed_logins) + 1;
    if (failures < LOGIN_MAX_FAILURES) {
      await m.query('UPDATE app_user SET failed_logins = ? WHERE id = ?', [failures, user.id]);
      return { status: 'invalid' as const };
    }
    const until = new Date(at.getTime() + LOGIN_LOCK_MINUTES * 60000);
    await m.query('UPDATE app_user SET failed_logins = 0, locked_until = ? WHERE id = ?', [until, user.id]);
    await recordAudit(m, { organisationId: user.organisationId, userId: user.id, userEmail: user.email, requestId: null }, {
      action: 'lock',
      entity: 'user',
      entityId: String(user.id),
      after: { lockedUntil: until.toISOString(), reason: `${LOGIN_MAX_FAILURES} failed sign-ins` },
    });
    return { status: 'locked' as const, until, at };
  });
  if (outcome.status === 'locked') throw lockedError(outcome.until, outcome.at);
  if (outcome.status !== 'ok') throw INVALID();
  const loaded = await loadAuthUser(user.id);
  if (!loaded) throw INVALID();
  return loaded;
}

/** Loads the user with roles and granted sites (administrators see every site of their organisation). */
export async function loadAuthUser(id: number): Promise<AuthUser | null> {
  // One round trip: the user with roles and granted sites (administrators: every site of the organisation).
  const rows: { id: number; organisation_id: number; email: string; name: string; active: number; roles: string | null; granted: string | null; all_sites: string | null }[] = await db().query(
    `SELECT u.id, u.organisation_id, u.email, u.name, u.active,
       (SELECT GROUP_CONCAT(r.role) FROM user_role r WHERE r.user_id = u.id) AS roles,
       (SELECT GROUP_CONCAT(us.site_id) FROM user_site us WHERE us.user_id = u.id) AS granted,
       (SELECT GROUP_CONCAT(s.id) FROM site s WHERE s.organisation_id = u.organisation_id) AS all_sites
     FROM app_user u WHERE u.id = ?`,
    [id],
  );
  const u = rows[0];
  if (!u || !Number(u.active)) return null;
  const roles = (u.roles ? u.roles.split(',') : []).sort() as Role[];
  const list = (roles.includes('administrator') ? u.all_sites : u.granted) ?? '';
  const siteIds = list ? list.split(',').map(Number).sort((a, b) => a - b) : [];
  return { id: Number(u.id), organisationId: Number(u.organisation_id), email: u.email, name: u.name, roles, siteIds };
}

/** What GET /api/auth/me returns. */
export async function describeMe(user: AuthUser): Promise<Me> {
  const ds = db();
  const org = await ds.getRepository(Organisation).findOneByOrFail({ id: user.organisationId });
  const sites = user.siteIds.length ? await ds.getRepository(Site).find({ where: { id: In(user.siteIds), organisationId: user.organisationId }, order: { name: 'ASC' } }) : [];
  return {
    user: { id: user.id, email: user.email, name: user.name, roles: user.roles },
    organisation: { id: org.id, name: org.name },
    sites: sites.map((s) => ({
      id: s.id,
      name: s.name,
      kind: s.kind,
      timeZone: s.timeZone,
      referenceCode: s.referenceCode,
      unitSystem: s.unitSystem,
      cylinderColours: s.cylinderColours,
      storeTemperatureC: s.storeTemperatureC,
      atmosphericBar: s.atmosphericBar,
      currency: s.currency,
    })),
  };
}

export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

/** Changes the caller's password after checking the current one. */
export async function changePassword(user: AuthUser, currentPassword: string, newPassword: string, requestId: string): Promise<void> {
  const repo = db().getRepository(User);
  const row = await repo.findOneBy({ id: user.id });
  if (!row) throw unauthorised();
  if (!(await bcrypt.compare(currentPassword, row.passwordHash))) {
    throw badRequest('The current password is not right', [{ path: 'currentPassword', message: 'not right' }]);
  }
  const hash = await hashPassword(newPassword);
  await db().transaction(async (m) => {
    await m.getRepository(User).update({ id: user.id }, { passwordHash: hash, passwordChangedAt: new Date() });
    await recordAudit(m, { organisationId: user.organisationId, userId: user.id, userEmail: user.email, requestId }, { action: 'update', entity: 'password', entityId: String(user.id), after: { changed: true } });
  });
}
