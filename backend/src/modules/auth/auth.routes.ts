import type { Request, Response } from 'express';
import passport from 'passport';
import { rateLimit } from 'express-rate-limit';
import { changePasswordSchema, loginSchema } from '@common/schemas/auth.schema';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { csrfTokenFor } from '../../middleware/csrf';
import { MariaDbRateLimitStore } from '../../middleware/rate-limit-store';
import { env } from '../../config/env';
import { changePassword, describeMe } from './auth.service';
import { keepSessionSignedIn } from './passport';
import { recordAudit } from '../audit/audit.service';
import { db } from '../../db/db';
import { AppError } from '../../errors/app-error';

function loginLimiter() {
  return rateLimit({
    windowMs: 15 * 60 * 1000,
    limit: env().LOGIN_RATE_LIMIT_PER_15_MIN,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new MariaDbRateLimitStore('login'),
    handler: (_req, res) => {
      res.status(429).json({ error: { code: 'rate_limited', message: 'Too many sign-in attempts from this address: wait 15 minutes and try again' } });
    },
  });
}

/** The account a sign-in is for, written as verifyCredentials looks it up; '' when the body has none. */
function accountKey(req: Request): string {
  const body: unknown = req.body;
  if (!body || typeof body !== 'object' || Array.isArray(body) || !Object.hasOwn(body, 'email')) return '';
  const email = (body as { email: unknown }).email;
  return typeof email === 'string' ? email.trim().toLowerCase().slice(0, 190) : '';
}

/**
 * Failed sign-ins per account from any address (a guesser with many addresses), in the same shared store.
 * Unknown e-mails are counted alike. Successful sign-ins are not counted; a body without an e-mail is left
 * to validation.
 */
function accountLoginLimiter() {
  return rateLimit({
    windowMs: 15 * 60 * 1000,
    limit: env().LOGIN_RATE_LIMIT_PER_ACCOUNT_PER_15_MIN,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    keyGenerator: (req) => `account:${accountKey(req)}`,
    skip: (req) => accountKey(req) === '',
    store: new MariaDbRateLimitStore('login'),
    handler: (_req, res) => {
      res.status(429).json({ error: { code: 'rate_limited', message: 'Too many sign-in attempts for this account: wait 15 minutes and try again' } });
    },
  });
}

function authenticate(req: Request, res: Response): Promise<Express.User> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', { session: false }, (err: unknown, user: Express.User | false) => {
      if (err) return reject(err);
      if (!user) return reject(new AppError(401, 'invalid_credentials', 'E-mail or password is not right'));
      resolve(user);
    })(req, res, (e: unknown) => reject(e));
  });
}

function logIn(req: Request, user: Express.User): Promise<void> {
  // passport 0.7 regenerates the session here: the id is renewed at sign-in (no fixation).
  return new Promise((resolve, reject) => req.logIn(user, (err) => (err ? reject(err) : resolve())));
}

function logOut(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.logOut((err) => (err ? reject(err) : resolve())));
}

export function authRoutes(): RouteDef[] {
  return [
    {
      method: 'post',
      path: '/api/auth/login',
      access: 'public',
      csrf: false,
      before: [loginLimiter(), accountLoginLimiter()],
      handler: async (req, res) => {
        const body = validate(loginSchema, req.body, 'sign-in');
        req.body = body;
        const user = await authenticate(req, res);
        await logIn(req, user);
        await recordAudit(
          db().manager,
          { organisationId: user.organisationId, userId: user.id, userEmail: user.email, requestId: String(req.id) },
          { action: 'sign_in', entity: 'session' },
        );
        const me = await describeMe(user);
        return { ...me, csrfToken: csrfTokenFor(req) };
      },
    },
    {
      method: 'post',
      path: '/api/auth/logout',
      access: 'authenticated',
      handler: async (req, res) => {
        const actor = actorOf(req);
        await logOut(req);
        await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
        res.clearCookie('plenum.sid', { path: '/' });
        await recordAudit(
          db().manager,
          { organisationId: actor.user.organisationId, userId: actor.user.id, userEmail: actor.user.email, requestId: String(req.id) },
          { action: 'sign_out', entity: 'session' },
        );
        return { ok: true };
      },
    },
    {
      method: 'get',
      path: '/api/auth/me',
      access: 'authenticated',
      handler: (req) => describeMe(actorOf(req).user),
    },
    {
      method: 'get',
      path: '/api/auth/csrf',
      access: 'public',
      handler: (req) => ({ token: csrfTokenFor(req) }),
    },
    {
      method: 'post',
      path: '/api/auth/password',
      access: 'authenticated',
      handler: async (req) => {
        const body = validate(changePasswordSchema, req.body, 'password change');
        const actor = actorOf(req);
        // Ends the user's other sessions; this one carries on.
        await changePassword(actor.user, body.currentPassword, body.newPassword, actor.requestId);
        await keepSessionSignedIn(req, actor.user.id);
        return { ok: true };
      },
    },
  ];
}
