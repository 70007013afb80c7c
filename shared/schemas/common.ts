import { z } from 'zod';

export const uuidParam = z.object({ id: z.uuid({ message: 'Not a valid id' }) });

export const email = z
  .string({ message: 'E-mail is required' })
  .trim()
  .toLowerCase()
  .pipe(z.email({ message: 'Enter a valid e-mail address' }).max(254, 'E-mail is too long'));

/** Passphrases: length matters more than character classes (NIST SP 800-63B §5.1.1.2). */
export const newPassword = z
  .string({ message: 'Password is required' })
  .min(12, 'Use at least 12 characters')
  .max(200, 'Use at most 200 characters');

export type FieldErrors = { path: string; message: string }[];

/** The JSON body every error response carries. */
export type ApiErrorBody = { error: string; message: string; fields?: FieldErrors };
