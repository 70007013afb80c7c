import type { FieldErrors } from '../../shared/schemas/common';

/** Domain errors; the one error handler maps them to HTTP answers. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: FieldErrors,
  ) {
    super(message);
  }
}
export const badRequest = (message: string, fields?: FieldErrors) => new AppError(400, 'bad_request', message, fields);
export const fieldError = (path: string, message: string) => badRequest(message, [{ path, message }]);
export const unauthorized = (message = 'Sign in first') => new AppError(401, 'unauthorized', message);
export const forbidden = (message = 'Your role does not allow this') => new AppError(403, 'forbidden', message);
export const notFound = (what = 'Record') => new AppError(404, 'not_found', `${what} not found`);
export const conflict = (message: string, fields?: FieldErrors) => new AppError(409, 'conflict', message, fields);
