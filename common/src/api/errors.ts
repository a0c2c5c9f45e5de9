import type { ZodError } from 'zod';

/** One field problem: `path` is dotted (`source.capacity_kg`, `0.gas`), `message` is for people. */
export interface FieldIssue {
  path: string;
  message: string;
}

/** The error body every API route and the calc command return: `{error: {code, message, details?}}`. */
export interface ErrorBody {
  error: { code: string; message: string; details?: FieldIssue[] };
}

/**
 * Thrown by pure code (gas engine, forecast, capacity) when its input cannot be computed.
 * The calc command turns it into exit 2; the API into a 400.
 */
export class InvalidInputError extends Error {
  readonly code = 'invalid_input';
  constructor(
    message: string,
    readonly details: FieldIssue[] = [],
  ) {
    super(message);
    this.name = 'InvalidInputError';
  }
}

/** Turns zod issues into our field list. */
export function zodIssues(error: ZodError): FieldIssue[] {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join('.') || '(root)',
    message: issue.message,
  }));
}

/** Builds the InvalidInputError for a failed zod parse, with a summary naming the first problem. */
export function invalidFromZod(error: ZodError, what = 'input'): InvalidInputError {
  const details = zodIssues(error);
  const first = details[0];
  const summary = first ? `Invalid ${what}: ${first.path}: ${first.message}` : `Invalid ${what}`;
  return new InvalidInputError(summary, details);
}

/** Parses with a zod schema or throws InvalidInputError with field details. */
export function parseOrThrow<T>(
  schema: { safeParse(v: unknown): { success: true; data: T } | { success: false; error: ZodError } },
  value: unknown,
  what?: string,
): T {
  const result = schema.safeParse(value);
  if (!result.success) throw invalidFromZod(result.error, what);
  return result.data;
}
