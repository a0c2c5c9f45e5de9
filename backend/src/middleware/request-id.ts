import { randomUUID } from 'node:crypto';
import type { Request, Response, NextFunction } from 'express';

/** Gives every request an id (kept from a trusted proxy's X-Request-Id), echoed in the response. */
export function requestId(req: Request, res: Response, next: NextFunction): void {
  const incoming = req.get('x-request-id');
  req.id = incoming && /^[\w.-]{1,64}$/.test(incoming) ? incoming : randomUUID();
  res.setHeader('x-request-id', req.id);
  next();
}
