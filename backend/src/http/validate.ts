import type { ZodType } from 'zod';
import { zodIssues } from '@common/api/errors';
import { badRequest } from '../errors/app-error';

/** Parses a request part with a shared zod schema; a failure is a 400 with field messages. */
export function validate<T>(schema: ZodType<T>, value: unknown, what = 'request'): T {
  const result = schema.safeParse(value ?? {});
  if (!result.success) {
    const details = zodIssues(result.error);
    throw badRequest(
      `Please correct the ${what}: ${details
        .map((d) => `${d.path}: ${d.message}`)
        .slice(0, 3)
        .join('; ')}`,
      details,
    );
  }
  return result.data;
}
