import type { FieldErrors, FieldValues, Resolver } from 'react-hook-form';
import type { z } from 'zod';

/**
 * A resolver for forms whose fields are not the request body itself (a local date-time typed at the
 * site, a list of gauges kept as rows): `toBody` builds the body, the shared zod schema checks it, and
 * `renamePath` puts each problem back under the field the person typed into.
 */
export function bodyResolver<F extends FieldValues, S extends z.ZodType>(
  schema: S,
  toBody: (values: F) => unknown,
  renamePath: (path: string) => string = (p) => p,
): Resolver<F, unknown, z.output<S>> {
  return async (values) => {
    const parsed = schema.safeParse(toBody(values));
    if (parsed.success) return { values: parsed.data, errors: {} };
    const errors: Record<string, unknown> = {};
    for (const issue of parsed.error.issues) {
      const path = renamePath(issue.path.map(String).join('.'));
      setIn(errors, path || 'root', { type: issue.code, message: messageOf(issue) });
    }
    return { values: {}, errors: errors as FieldErrors<F> };
  };
}

/**
 * A schema whose number type carries its own message ("flow must be a number") gives that message for
 * a range problem too; a person needs the range then.
 */
function messageOf(issue: z.core.$ZodIssue): string {
  if (/must be a number$/.test(issue.message)) {
    if (issue.code === 'too_big') return `must be at most ${String(issue.maximum)}`;
    if (issue.code === 'too_small') return `must be at least ${String(issue.minimum)}`;
    if (issue.code === 'invalid_type' && issue.expected === 'int') return 'enter a whole number';
  }
  return issue.message;
}

function setIn(target: Record<string, unknown>, path: string, error: { type: string; message: string }): void {
  const keys = path.split('.');
  let node: Record<string, unknown> = target;
  keys.forEach((key, i) => {
    if (i === keys.length - 1) {
      // the first problem of a field is the one to show
      if (node[key] === undefined) node[key] = error;
      return;
    }
    if (typeof node[key] !== 'object' || node[key] === null) node[key] = /^\d+$/.test(keys[i + 1]) ? [] : {};
    node = node[key] as Record<string, unknown>;
  });
}
