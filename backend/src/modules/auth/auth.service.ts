import bcrypt from 'bcryptjs';
import { In } from 'typeorm';
import { LOGIN_MAX_FAILURES, type Role } from '@common/api/roles';
import type { Me } from '@common/schemas/auth.schema';
import { db } from '../../db/db';
import { User } from '../../db/entities/user.entity';
import { Site } from '../../db/entities/site.entity';
import { Organisation } from '../../db/entities/organisation.entity';
import type { AuthUser } from '../../http/context';
import { AppError, badRequest, unauthorised } from '../../errors/app-error';
import { recordAudit } from '../audit/audit.service';
import { env } from '../../config/env';

export const BCRYPT_COST = 11;
let dummyHash: string | undefined;

/** Why a sign-in failed; the message never says whether the e-mail exists. */
export class SignInError extends AppError {}

/** The signed-in user and the session generation the session was signed in with. */
export type SessionUser = AuthUser & { sessionGeneration: number };

const INVALID = () => new SignInError(401, 'invalid_credentials', 'E-mail or password is not right');

function lockedError(until: Date, now: Date): SignInError {
  const minutes = Math.max(1, Math.ceil((until.getTime() - now.getTime()) / 60000));
  return new SignInError(
    423,
    'account_locked',
    `Too many failed sign-ins: this account is locked for ${minutes} more minute${minutes === 1 ? '' : 's'}. Try again after that, or ask an administrator to unlock it.`,
  );
}

/** Length of the n-th lock (n = 1, 2, …) since the last successful sign-in: the base, doubling, capped. */
export function lockMinutes(n: number, base = env().LOGIN_LOCK_BASE_MINUTES, max = env().LOGIN_LOCK_MAX_MINUTES): number {
  return Math.min(max, base * 2 ** Math.min(Math.max(n, 1) - 1, 30));
}

/** The counter of one sign-in name, as stored (app_user for accounts, sign_in_unknown for other e-mails). */
interface Counter {
  failed_logins: number;
  lock_count: number;
  locked_until: Date | null;
}

/**
 * Counts one failed sign-in against a counter row that the caller holds FOR UPDATE, so parallel guesses
 * are counted one after another and the lock is decided from the stored value.
 */
function afterFailure(c: Counter, now: Date): { next: Counter; lockedUntil: Date | null; alreadyLocked: boolean } {
  if (c.locked_until && new Date(c.locked_until) > now) return { next: c, lockedUntil: new Date(c.locked_until), alreadyLocked: true };
  const failures = Number(c.failed_logins) + 1;
  if (failures < LOGIN_MAX_FAILURES) return { next: { ...c, failed_logins: failures }, lockedUntil: null, alreadyLocked: false };
  const locks = Number(c.lock_count) + 1;
  const until = new Date(now.getTime() + Math.round(lockMinutes(locks) * 60000));
  return { next: { failed_logins: 0, lock_count: locks, locked_until: until }, lockedUntil: until, alreadyLocked: false };
}

/**
 * Checks an e-mail and password. Consecutive failures are counted in the database, atomically (row lock),
 * and LOGIN_MAX_FAILURES of them lock the name for a while: LOGIN_LOCK_BASE_MINUTES, doubling with each
 * further lock up to LOGIN_LOCK_MAX_MINUTES, ending by itself (an administrator can end it sooner). An
 * e-mail without an active account is counted and locked the same way in sign_in_unknown, and spends the
 * same bcrypt time, so neither the answers nor their timing say which accounts exist.
 */
export async function verifyCredentials(email: string, password: string): Promise<SessionUser> {
  const key = email.trim().toLowerCase();
  const user = await db()
    .getRepository(User)
    .findOne({ where: { email: key } });
  const account = user && user.active ? user : null;
  const now = new Date();
  const before: Counter | undefined = account
    ? { failed_logins: account.failedLogins, lock_count: account.lockCount, locked_until: account.lockedUntil }
    : ((await db().query('SELECT failed_logins, lock_count, locked_until FROM sign_in_unknown WHERE email_key = ?', [key])) as Counter[])[0];
  // A locked name is refused before the password is checked.
  if (before?.locked_until && new Date(before.locked_until) > now) throw lockedError(new Date(before.locked_until), now);

  let ok: boolean;
  if (account) ok = await bcrypt.compare(password, account.passwordHash);
  else {
    // Spend the same time as a real check, so timing does not reveal which e-mails exist.
    dummyHash ??= await bcrypt.hash('no-such-user-password', BCRYPT_COST);
    await bcrypt.compare(password, dummyHash);
    ok = false;
  }

  if (!account) {
    // Forget e-mails without an account a day after their last failure (best effort, outside the count).
    await db()
      .query('DELETE FROM sign_in_unknown WHERE updated_at < TIMESTAMPADD(DAY, -1, NOW(3)) AND (locked_until IS NULL OR locked_until < NOW(3)) LIMIT 100')
      .catch(() => undefined);
  }
  const outcome = await db().transaction(async (m) => {
    const at = new Date();
    let row: Counter | undefined;
    if (account) {
      row = ((await m.query('SELECT failed_logins, lock_count, locked_until FROM app_user WHERE id = ? FOR UPDATE', [account.id])) as Counter[])[0];
    } else {
      await m.query(
        'INSERT INTO sign_in_unknown (email_key, failed_logins, lock_count, locked_until, updated_at) VALUES (?, 0, 0, NULL, NOW(3)) ON DUPLICATE KEY UPDATE email_key = email_key',
        [key],
      );
      row = ((await m.query('SELECT failed_logins, lock_count, locked_until FROM sign_in_unknown WHERE email_key = ? FOR UPDATE', [key])) as Counter[])[0];
    }
    if (!row) return { status: 'invalid' as const };
    if (ok && account) {
      // Locked meanwhile by parallel guesses: the right password waits like any other.
      if (row.locked_until && new Date(row.locked_until) > at) return { status: 'locked' as const, until: new Date(row.locked_until), at };
      if (Number(row.failed_logins) > 0 || Number(row.lock_count) > 0 || row.locked_until)
        await m.query('UPDATE app_user SET failed_logins = 0, lock_count = 0, locked_until = NULL WHERE id = ?', [account.id]);
      return { status: 'ok' as const };
    }
    const f = afterFailure(row, at);
    if (f.alreadyLocked) return { status: 'locked' as const, until: f.lockedUntil!, at };
    if (account) {
      await m.query('UPDATE app_user SET failed_logins = ?, lock_count = ?, locked_until = ? WHERE id = ?', [
        f.next.failed_logins,
        f.next.lock_count,
        f.next.locked_until,
        account.id,
      ]);
      if (f.lockedUntil) {
        await recordAudit(
          m,
          { organisationId: account.organisationId, userId: account.id, userEmail: account.email, requestId: null },
          {
            action: 'lock',
            entity: 'user',
            entityId: String(account.id),
            after: { lockedUntil: f.lockedUntil.toISOString(), reason: `${LOGIN_MAX_FAILURES} failed sign-ins`, lockNumber: f.next.lock_count },
          },
        );
      }
    } else {
      await m.query('UPDATE sign_in_unknown SET failed_logins = ?, lock_count = ?, locked_until = ?, updated_at = NOW(3) WHERE email_key = ?', [
        f.next.failed_logins,
        f.next.lock_count,
        f.next.locked_until,
        key,
      ]);
    }
    return f.lockedUntil ? { status: 'locked' as const, until: f.lockedUntil, at } : { status: 'invalid' as const };
  });
  if (outcome.status === 'locked') throw lockedError(outcome.until, outcome.at);
  if (outcome.status !== 'ok' || !account) throw INVALID();
  const loaded = await loadAuthUser(account.id);
  if (!loaded) throw INVALID();
  return loaded;
}

/**
 * Loads the user with roles and granted sites (administrators see every site of their organisation).
 * With `generation` (from a session): null unless the user's session generation is still that one, so a
 * session signed in before the last password change or reset no longer signs anybody in.
 */
export async function loadAuthUser(id: number, generation?: number): Promise<SessionUser | null> {
  // One round trip: the user with roles and granted sites (administrators: every site of the organisation).
  const rows: {
    id: number;
    organisation_id: number;
    email: string;
    name: string;
    active: number;
    session_generation: number;
    roles: string | null;
    granted: string | null;
    all_sites: string | null;
  }[] = await db().query(
    `SELECT u.id, u.organisation_id, u.email, u.name, u.active, u.session_generation,
       (SELECT GROUP_CONCAT(r.role) FROM user_role r WHERE r.user_id = u.id) AS roles,
       (SELECT GROUP_CONCAT(us.site_id) FROM user_site us WHERE us.user_id = u.id) AS granted,
       (SELECT GROUP_CONCAT(s.id) FROM site s WHERE s.organisation_id = u.organisation_id) AS all_sites
     FROM app_user u WHERE u.id = ?`,
    [id],
  );
  const u = rows[0];
  if (!u || !Number(u.active)) return null;
  if (generation !== undefined && Number(u.session_generation) !== generation) return null;
  const roles = (u.roles ? u.roles.split(',') : []).sort() as Role[];
  const list = (roles.includes('administrator') ? u.all_sites : u.granted) ?? '';
  const siteIds = list
    ? list
        .split(',')
        .map(Number)
        .sort((a, b) => a - b)
    : [];
  return {
    id: Number(u.id),
    organisationId: Number(u.organisation_id),
    email: u.email,
    name: u.name,
    roles,
    siteIds,
    sessionGeneration: Number(u.session_generation),
  };
}

/** What GET /api/auth/me returns. */
export async function describeMe(user: AuthUser): Promise<Me> {
  const ds = db();
  const org = await ds.getRepository(Organisation).findOneByOrFail({ id: user.organisationId });
  const sites = user.siteIds.length
    ? await ds.getRepository(Site).find({ where: { id: In(user.siteIds), organisationId: user.organisationId }, order: { name: 'ASC' } })
    : [];
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

/**
 * Changes the caller's password after checking the current one, and ends the user's other sessions (bumps
 * the session generation). Returns the new generation, for the caller's own session to carry on with.
 */
export async function changePassword(user: AuthUser, currentPassword: string, newPassword: string, requestId: string): Promise<number> {
  const repo = db().getRepository(User);
  const row = await repo.findOneBy({ id: user.id });
  if (!row) throw unauthorised();
  if (!(await bcrypt.compare(currentPassword, row.passwordHash))) {
    throw badRequest('The current password is not right', [{ path: 'currentPassword', message: 'not right' }]);
  }
  const hash = await hashPassword(newPassword);
  return db().transaction(async (m) => {
    await m
      .getRepository(User)
      .update({ id: user.id }, { passwordHash: hash, passwordChangedAt: new Date(), sessionGeneration: () => 'session_generation + 1' });
    await recordAudit(
      m,
      { organisationId: user.organisationId, userId: user.id, userEmail: user.email, requestId },
      { action: 'update', entity: 'password', entityId: String(user.id), after: { changed: true } },
    );
    const [gen] = (await m.query('SELECT session_generation FROM app_user WHERE id = ?', [user.id])) as { session_generation: number }[];
    return Number(gen.session_generation);
  });
}
