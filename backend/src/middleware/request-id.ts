import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { pinoHttp } from 'pino-http';
import { baseLogger } from '../logger';

/** The request id: kept from a proxy's X-Request-Id when it is a plain token, else a new UUID. */
function requestIdOf(req: IncomingMessage, res: ServerResponse): string {
  const incoming = req.headers['x-request-id'];
  const id = typeof incoming === 'string' && /^[\w.-]{1,64}$/.test(incoming) ? incoming : randomUUID();
  res.setHeader('x-request-id', id);
  return id;
}

/**
 * Gives every request an id (echoed in the response, used in error messages and the audit log) and
 * logs one line when it ends: server errors at error level, everything else at debug (a busy ward
 * round would otherwise fill the log). Only method, path (no query string: it may carry a token),
 * status and duration are written: never headers, cookies or bodies.
 */
export const requestId = pinoHttp({
  logger: baseLogger,
  genReqId: requestIdOf,
  customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : 'debug'),
  serializers: {
    req: (req: { id: string; method: string; url: string }) => ({ id: req.id, method: req.method, path: req.url.split('?')[0] }),
    res: (res: { statusCode: number }) => ({ status: res.statusCode }),
    err: () => undefined,
  },
  customSuccessMessage: (req, res, ms) => `${req.method} ${(req.url ?? '').split('?')[0]} ${res.statusCode} ${Math.round(ms)} ms`,
  customErrorMessage: (req, res) => `${req.method} ${(req.url ?? '').split('?')[0]} ${res.statusCode}`,
});
