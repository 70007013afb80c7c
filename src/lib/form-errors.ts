import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from './api-client';

/** Puts the server's field errors on the form's fields; returns the message for the rest. */
export function applyServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, fields: readonly string[]): string | null {
  if (!(err instanceof ApiError)) return 'Could not reach the server. Check the connection and try again.';
  let unplaced = false;
  for (const f of err.fields) {
    if (fields.includes(f.path)) setError(f.path as Path<T>, { type: 'server', message: f.message });
    else unplaced = true;
  }
  return err.fields.length === 0 || unplaced ? err.message : null;
}
