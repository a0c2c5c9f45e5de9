import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError, errorMessage } from './api-client';

/**
 * Puts a server's field problems under the matching form fields. Returns the message for the banner:
 * the server's summary when some issue has no field on this form, or when there were no field issues.
 */
export function applyServerErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fieldNames: readonly string[]): string | null {
  if (!(error instanceof ApiError) || !error.details?.length) return errorMessage(error);
  let unplaced = false;
  for (const issue of error.details) {
    const root = issue.path.split('.')[0];
    if (fieldNames.includes(root)) {
      setError(issue.path as Path<T>, { type: 'server', message: issue.message });
    } else {
      unplaced = true;
    }
  }
  return unplaced ? error.message : null;
}
