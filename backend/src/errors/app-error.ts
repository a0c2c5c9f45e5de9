import type { FieldIssue } from '@common/api/errors';

/** The one error type routes and services throw; the error middleware turns it into `{error: {...}}`. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: FieldIssue[],
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const badRequest = (message: string, details?: FieldIssue[]) => new AppError(400, 'invalid_input', message, details);
export const unauthorised = (message = 'Sign in first') => new AppError(401, 'unauthorised', message);
export const forbidden = (message = 'Your role does not allow this') => new AppError(403, 'forbidden', message);
export const notFound = (what = 'Record') => new AppError(404, 'not_found', `${what} not found`);
export const conflict = (message: string, code = 'conflict') => new AppError(409, code, message);
export const unavailable = (message: string) => new AppError(503, 'service_unavailable', message);
