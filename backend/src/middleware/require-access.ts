import type { Request, Response, NextFunction } from 'express';
import type { Access } from '../http/route';
import { forbidden, unauthorised } from '../errors/app-error';

/** Enforces a route's declared access: 401 when not signed in, 403 when no listed role is held. */
export function requireAccess(access: Access) {
  return (req: Request, _res: Response, next: NextFunction): void => {
    if (access === 'public') return next();
    if (!req.user) return next(unauthorised());
    if (access === 'authenticated') return next();
    if (!req.user.roles.some((r) => access.includes(r))) return next(forbidden());
    next();
  };
}
