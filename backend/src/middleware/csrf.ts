import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, Response, NextFunction } from 'express';
import { CSRF_HEADER } from '@common/api/roles';
import { AppError } from '../errors/app-error';

/** The session's CSRF token (synchroniser-token pattern), created on first request. */
export function csrfTokenFor(req: Request): string {
  if (!req.session.csrfToken) req.session.csrfToken = randomBytes(32).toString('base64url');
  return req.session.csrfToken;
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Refuses a state-changing request whose x-csrf-token header does not match the session's token. */
export function requireCsrf(req: Request, _res: Response, next: NextFunction): void {
  if (SAFE.has(req.method)) return next();
  const sent = req.get(CSRF_HEADER) ?? '';
  const expected = req.session?.csrfToken ?? '';
  const ok = sent.length > 0 && expected.length > 0 && sent.length === expected.length && timingSafeEqual(Buffer.from(sent), Buffer.from(expected));
  if (!ok) return next(new AppError(403, 'csrf_failed', 'The security token is missing or out of date: reload the page and try again'));
  next();
}
