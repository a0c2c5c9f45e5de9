import type { Request, Response, NextFunction } from 'express';
import { InvalidInputError, type ErrorBody } from '@common/api/errors';
import { AppError } from '../errors/app-error';
import { logger } from '../logger';
import { isDatabaseDown, isLockConflict } from '../db/db-errors';

/** A deadlock or lock wait left after the transaction's retries, or the connection pool's queue full. */
function isBusy(err: unknown): boolean {
  return isLockConflict(err) || /^Queue limit reached/.test((err as { message?: string })?.message ?? '');
}

/** The one error middleware: known errors keep their status and code; the rest become a logged 500. */
export function errorHandler(err: unknown, req: Request, res: Response, _next: NextFunction): void {
  let status = 500;
  let body: ErrorBody = { error: { code: 'internal_error', message: `Something went wrong on our side (request ${req.id}).` } };
  const e = err as { type?: string; status?: number; message?: string };

  if (err instanceof AppError) {
    status = err.status;
    body = { error: { code: err.code, message: err.message, ...(err.details ? { details: err.details } : {}) } };
  } else if (err instanceof InvalidInputError) {
    status = 400;
    body = { error: { code: err.code, message: err.message, details: err.details } };
  } else if (e?.type === 'entity.parse.failed') {
    status = 400;
    body = { error: { code: 'invalid_json', message: 'The request body is not valid JSON' } };
  } else if (e?.type === 'entity.too.large') {
    status = 413;
    body = { error: { code: 'too_large', message: 'The request body is too large' } };
  } else if (isBusy(err)) {
    // A deadlock after the transaction's own retries rolled the change back whole; a full queue ran nothing.
    status = 503;
    body = {
      error: {
        code: 'busy',
        message: 'Plenum is very busy just now (or another change to the same records was being saved at the same moment); nothing was changed. Try again.',
      },
    };
    logger.error(`[${req.id}] busy: ${e?.message}`);
  } else if (isDatabaseDown(err)) {
    status = 503;
    body = { error: { code: 'service_unavailable', message: 'The database is not reachable just now; nothing was changed. Try again in a moment.' } };
    logger.error(`[${req.id}] database unavailable: ${e?.message}`);
  } else {
    logger.error(`[${req.id}] ${req.method} ${req.path}: ${(err as Error)?.stack ?? String(err)}`);
  }
  if (status === 503) res.setHeader('Retry-After', '5');
  res.status(status).json(body);
}
