import { z } from 'zod';

export const uuidParam = z.object({ id: z.uuid({ message: 'Not a valid id' }) });

export const email = z
  .string({ message: 'E-mail is required' })
  .trim()
  .toLowerCase()
  .pipe(z.email({ message: 'Enter a valid e-mail address' }).max(254, 'E-mail is too long'));

/** Passphrases: length matters more than character classes (NIST SP 800-63B §5.1.1.2). */
export const newPassword = z.string({ message: 'Password is required' }).min(12, 'Use at least 12 characters').max(200, 'Use at most 200 characters');

export type FieldErrors = { path: string; message: string }[];

/**
 * Machine-readable codes of error answers; clients branch on these, never on the wording.
 * `validation_failed` answers carry `fields` with the exact paths of the problems;
 * `signature_refused` is a wrong password at an electronic signature (the session stays valid);
 * `checklist_incomplete` is a sign-off refused because checklist lines have no answer (409).
 */
export const ERROR_CODES = [
  'validation_failed',
  'bad_request',
  'invalid_json',
  'unauthorized',
  'signature_refused',
  'forbidden',
  'csrf_invalid',
  'not_found',
  'conflict',
  'checklist_incomplete',
  'idempotency_in_progress',
  'idempotency_key_reused',
  'payload_too_large',
  'rate_limited',
  'database_unavailable',
  'unsupported_media_type',
  'internal',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

/** The JSON body every error response carries. */
export type ApiErrorBody = { error: ErrorCode; message: string; fields?: FieldErrors };

/** The header a client sends so that a retried write is carried out once (server/http/idempotency.ts). */
export const IDEMPOTENCY_HEADER = 'Idempotency-Key';
export const IDEMPOTENCY_KEY_PATTERN = /^[A-Za-z0-9._:-]{8,200}$/;
/** How long a key and its stored answer are kept. */
export const IDEMPOTENCY_TTL_HOURS = 24;
