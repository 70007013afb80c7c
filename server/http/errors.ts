import type { ErrorCode, FieldErrors } from '../../shared/schemas/common';

/** Domain errors; the one error handler maps them to HTTP answers. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly fields?: FieldErrors,
  ) {
    super(message);
  }
}
/** A refusal that names fields is a validation failure the form can place; without fields it is a plain refusal. */
export const badRequest = (message: string, fields?: FieldErrors) => new AppError(400, fields?.length ? 'validation_failed' : 'bad_request', message, fields);
export const validationFailed = (message: string, fields: FieldErrors) => new AppError(400, 'validation_failed', message, fields);
export const fieldError = (path: string, message: string) => validationFailed(message, [{ path, message }]);
export const unauthorized = (message = 'Sign in first') => new AppError(401, 'unauthorized', message);
export const forbidden = (message = 'Your role does not allow this') => new AppError(403, 'forbidden', message);
export const csrfInvalid = (message: string) => new AppError(403, 'csrf_invalid', message);
export const notFound = (what = 'Record') => new AppError(404, 'not_found', `${what} not found`);
export const conflict = (message: string, fields?: FieldErrors) => new AppError(409, 'conflict', message, fields);
export const payloadTooLarge = (message: string, fields?: FieldErrors) => new AppError(413, 'payload_too_large', message, fields);
export const rateLimited = (message: string) => new AppError(429, 'rate_limited', message);
